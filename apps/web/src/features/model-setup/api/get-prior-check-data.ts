import { datasetSeriesSchema, datasetVersionDetailSchema, type DatasetSeries, type DatasetVersionDetail } from "@tributary/contracts";
import type { PortfolioData } from "@tributary/stats";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

export type PriorCheckData = { dataset: DatasetVersionDetail; data: PortfolioData };

/** The cells of a dataset version as the model reads them: weekly outcome, spend per channel, controls. */
export function toPortfolioData(dataset: DatasetVersionDetail, series: DatasetSeries[]): PortfolioData {
  return {
    channels: dataset.channels,
    controls: dataset.controls,
    cells: series.map((cell) => ({
      brand: cell.cell.brand,
      market: cell.cell.market,
      firstWeek: cell.weeks[0] ?? cell.cell.firstWeek,
      outcome: Float64Array.from(cell.outcome),
      spend: cell.spend.map((values) => Float64Array.from(values)),
      controls: cell.controlValues.map((values) => Float64Array.from(values)),
    })),
  };
}

/**
 * GET /api/datasets/:datasetId and GET /api/datasets/:datasetId/series?cell=… for every
 * cell: the whole dataset version in the browser, for the prior check.
 */
export async function getPriorCheckData(datasetId: string): Promise<PriorCheckData> {
  const id = encodeURIComponent(datasetId);
  const dataset = await api.get(`/api/datasets/${id}`, datasetVersionDetailSchema);
  const series = await Promise.all(
    dataset.cells.map((cell) => api.get(`/api/datasets/${id}/series?cell=${encodeURIComponent(cell.cellId)}`, datasetSeriesSchema)),
  );
  return { dataset, data: toPortfolioData(dataset, series) };
}

export const priorCheckDataQueryOptions = (datasetId: string) =>
  queryOptions({
    // Under the datasets key, so refreshing the dataset list refreshes this too.
    queryKey: ["datasets", datasetId, "prior-check-data"] as const,
    queryFn: () => getPriorCheckData(datasetId),
    staleTime: Infinity,
  });

export function usePriorCheckData(datasetId: string | null) {
  return useQuery({ ...priorCheckDataQueryOptions(datasetId ?? ""), enabled: datasetId !== null && datasetId !== "" });
}
