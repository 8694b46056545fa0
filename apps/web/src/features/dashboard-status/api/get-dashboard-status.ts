import { dashboardStatusSchema, type DashboardStatus } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { dashboardsQueryKey } from "../../../lib/dashboard-query";

/** Whether a run is published, and how far the first fit has come. */
export function getDashboardStatus(): Promise<DashboardStatus> {
  return api.get("/api/dashboards/status", dashboardStatusSchema);
}

export const dashboardStatusQueryOptions = () =>
  queryOptions({ queryKey: [...dashboardsQueryKey, "status"] as const, queryFn: getDashboardStatus, staleTime: 0 });

/** Polls every few seconds while the first fit runs, so the screen can move on when it is published. */
export function useDashboardStatus() {
  return useQuery({
    ...dashboardStatusQueryOptions(),
    refetchInterval: (query) => (query.state.data?.firstFit && !query.state.data.current ? 4_000 : false),
  });
}
