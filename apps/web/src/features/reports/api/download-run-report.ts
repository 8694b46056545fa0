import { runReportQuery } from "@tributary/contracts";
import { useMutation } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

export type RunReportSubject = { brand: string } | { market: string };

/** GET /api/reports/run.pdf?brand=… or ?market=…: the current fit's PDF report for one brand or one market. */
export async function downloadRunReport(subject: RunReportSubject): Promise<{ blob: Blob; fileName: string }> {
  const query = runReportQuery.parse(subject);
  const search = query.brand !== undefined ? `brand=${encodeURIComponent(query.brand)}` : `market=${encodeURIComponent(query.market!)}`;
  const { blob, fileName } = await api.getFile(`/api/reports/run.pdf?${search}`);
  return { blob, fileName: fileName ?? "tributary-report.pdf" };
}

export function useDownloadRunReport() {
  return useMutation({ mutationFn: downloadRunReport });
}
