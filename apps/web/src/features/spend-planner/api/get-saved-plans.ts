import { planSummarySchema, type PlanKind, type PlanStatus, type PlanSummary } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

export type SavedPlansFilter = { kind?: PlanKind; status?: PlanStatus; market?: string };

const planListSchema = z.array(planSummarySchema);

/** GET /api/plans: the saved plans the viewer may see (every market of a plan's cells must be theirs). */
export function getSavedPlans(filter: SavedPlansFilter = {}): Promise<PlanSummary[]> {
  const query = new URLSearchParams();
  if (filter.kind) query.set("kind", filter.kind);
  if (filter.status) query.set("status", filter.status);
  if (filter.market) query.set("market", filter.market);
  const search = query.toString();
  return api.get(`/api/plans${search ? `?${search}` : ""}`, planListSchema);
}

/** Every plan query sits under this key, so a change to any plan refreshes every list. */
export const plansQueryKey = ["plans"] as const;

export const savedPlansQueryOptions = (filter: SavedPlansFilter = {}) =>
  queryOptions({ queryKey: [...plansQueryKey, "list", filter] as const, queryFn: () => getSavedPlans(filter) });

/**
 * Saved plans (spend scenarios and budget splits), optionally narrowed by kind, status
 * or market. Other screens (e.g. the Market desk) list saved plans through this hook.
 */
export function useSavedPlans(filter: SavedPlansFilter = {}) {
  return useQuery(savedPlansQueryOptions(filter));
}
