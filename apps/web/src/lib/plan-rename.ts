import { planRenameInput, planSchema, type Plan, type PlanRenameInput } from "@tributary/contracts";
import { api } from "./api-client";

export type RenamePlanVariables = { planId: string } & PlanRenameInput;

/** PATCH /api/plans/:planId: a new name (or note) for a saved plan at any status; its numbers and approval stay. */
export function renamePlan({ planId, ...change }: RenamePlanVariables): Promise<Plan> {
  return api.patch(`/api/plans/${encodeURIComponent(planId)}`, planSchema, planRenameInput.parse(change));
}

/** The name as the server will store it, or why it cannot be used (the server checks the same). */
export function checkPlanName(name: string): { name: string } | { problem: string } {
  const parsed = planRenameInput.safeParse({ name });
  if (parsed.success) return { name: parsed.data.name ?? name };
  return { problem: parsed.error.issues[0]?.message ?? "Check the name" };
}
