import { channelSheetSchema, type ChannelSheet } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { dashboardsQueryKey } from "../../../lib/dashboard-query";

const sheetPath = (cellId: string, channel: string) => `/api/dashboards/channel-sheet/${encodeURIComponent(cellId)}/${encodeURIComponent(channel)}`;

/** One cell × channel of the current published run, with the draws of its cost per customer. */
export function getChannelSheet(cellId: string, channel: string): Promise<ChannelSheet> {
  return api.get(sheetPath(cellId, channel), channelSheetSchema);
}

export const channelSheetQueryOptions = (cellId: string, channel: string) =>
  queryOptions({ queryKey: [...dashboardsQueryKey, "channel-sheet", cellId, channel] as const, queryFn: () => getChannelSheet(cellId, channel) });

export function useChannelSheet(selection: { cellId: string; channel: string } | null) {
  return useQuery({
    ...channelSheetQueryOptions(selection?.cellId ?? "", selection?.channel ?? ""),
    enabled: selection !== null,
  });
}

export type ChannelSheetTable = "response-curve" | "carry-over" | "contribution" | "profit-draws";
export const channelSheetCsvHref = (cellId: string, channel: string, table: ChannelSheetTable) =>
  `${sheetPath(cellId, channel)}/export.csv?table=${table}`;
