import { datasetVersionDetailSchema, type DatasetVersionDetail } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { datasetsQueryOptions } from "./get-datasets";

/** One dataset version with its mapping, cells and the report it was saved with. */
export function getDataset(datasetId: string): Promise<DatasetVersionDetail> {
  return api.get(`/api/datasets/${encodeURIComponent(datasetId)}`, datasetVersionDetailSchema);
}

export const datasetQueryOptions = (datasetId: string) =>
  queryOptions({ queryKey: [...datasetsQueryOptions().queryKey, datasetId] as const, queryFn: () => getDataset(datasetId) });

export function useDataset(datasetId: string | null) {
  return useQuery({ ...datasetQueryOptions(datasetId ?? ""), enabled: datasetId !== null });
}
