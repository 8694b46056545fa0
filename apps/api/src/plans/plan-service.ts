// Saving plans and moving budget splits through approval. Every number stored is
// computed here on the run's draws; a budget split's allocation sent by the browser is
// checked against the server's own split of the same inputs (see checkSentAllocation).
import { and, eq, inArray, isNotNull } from "drizzle-orm";
import type { z } from "zod";
import type {
  BudgetSplitDetail,
  CurrentUser,
  PlanDecisionInput,
  PlanRenameInput,
  ScenarioDetail,
  budgetSplitPlanInput,
  scenarioPlanInput,
} from "@tributary/contracts";
import type { Request } from "express";
import type { Logger } from "pino";
import type { MarketScope } from "../access/route-table";
import type { AppConfig } from "../config";
import type { Database, Queryable } from "../db/client";
import { auditLog, markets, plans, users, workspaceSettings } from "../db/schema";
import { safeErrorForLog } from "../http/error-handler";
import { Conflict, Forbidden, Invalid, NotFound } from "../http/errors";
import type { Mailer } from "../mail/mailer";
import { appBaseUrl, planDecidedMessage, planSubmittedMessage, type PlanMailFacts } from "../mail/messages";
import { currentRunId } from "../runs/run-queries";
import { budgetSplitView, checkSentAllocation, computeBudgetSplit, scenarioHeadline } from "./plan-computations";
import { bodyOf, permissions, planRow, type PlanBody, type PlanRow } from "./plan-records";
import { drawSetOfCells, planningDraws, type PlanningDraws } from "./planning-draws";

export type ScenarioInput = z.output<typeof scenarioPlanInput>;
export type BudgetSplitInput = z.output<typeof budgetSplitPlanInput>;

/** The plan's cells as indices of the run, in the order given; refuses cells not in the run or outside the user's markets. */
export function planCellIndices(draws: PlanningDraws, scope: MarketScope, cellIds: readonly string[]): number[] {
  const position = new Map(draws.cells.map((cell, g) => [cell.cellId, g] as const));
  const allowed = new Set(scope.marketIds);
  return cellIds.map((id, k) => {
    const g = position.get(id);
    if (g === undefined) throw new Invalid(`Cell ${id} is not in the fit the plan was computed with`, [{ path: `cellIds.${k}`, message: "Not a cell of this fit" }]);
    if (!allowed.has(draws.cells[g]!.marketId)) throw new Forbidden("You can save plans only for cells in your own markets");
    return g;
  });
}

/** The draws of the run the plan is saved against: it must be the current run. */
async function drawsForSave(db: Queryable, runId: string): Promise<PlanningDraws> {
  const current = await currentRunId(db);
  if (current === null) throw new Conflict("No fit has been published yet; there is nothing to plan with");
  if (runId !== current) throw new Conflict("A newer fit has been published since this plan was computed; compute it again on the current fit and save it");
  return planningDraws(db, runId);
}

function marketsOf(draws: PlanningDraws, indices: readonly number[]): string[] {
  return [...new Set(indices.map((g) => draws.cells[g]!.marketId))].sort();
}

interface Computed {
  readonly marketIds: string[];
  readonly body: PlanBody;
}

async function computeScenario(db: Queryable, scope: MarketScope, input: ScenarioInput, keep: Pick<PlanBody, "submitted"> = { submitted: null }): Promise<Computed> {
  const draws = await drawsForSave(db, input.runId);
  const indices = planCellIndices(draws, scope, input.cellIds);
  const set = drawSetOfCells(draws.set, indices);
  const scenario: ScenarioDetail = {
    horizon: input.horizon,
    recentWeeks: input.recentWeeks,
    seed: input.seed,
    operations: input.operations,
    headline: scenarioHeadline(set, input.cellIds, input),
  };
  return { marketIds: marketsOf(draws, indices), body: { version: 1, note: input.note ?? null, cellIds: [...input.cellIds], submitted: keep.submitted, scenario } };
}

async function computeSplit(db: Queryable, scope: MarketScope, input: BudgetSplitInput): Promise<Computed> {
  const draws = await drawsForSave(db, input.runId);
  const indices = planCellIndices(draws, scope, input.cellIds);
  const set = drawSetOfCells(draws.set, indices);
  const result = budgetSplitView(computeBudgetSplit(set, input), input.cellIds, set.drawCount);
  checkSentAllocation(input.allocation, result);
  const budgetSplit: BudgetSplitDetail = {
    totalBudget: input.totalBudget,
    horizon: input.horizon,
    recentWeeks: input.recentWeeks,
    bounds: input.bounds,
    objective: input.objective,
    risk: input.risk,
    result,
  };
  return { marketIds: marketsOf(draws, indices), body: { version: 1, note: input.note ?? null, cellIds: [...input.cellIds], submitted: null, budgetSplit } };
}

export async function createScenarioPlan(db: Database, user: CurrentUser, scope: MarketScope, input: ScenarioInput): Promise<PlanRow> {
  const computed = await computeScenario(db, scope, input);
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(plans)
      .values({ kind: "scenario", name: input.name, runId: input.runId, marketIds: computed.marketIds, body: computed.body, createdBy: user.id })
      .returning();
    await tx.insert(auditLog).values({ userId: user.id, action: "plan_created", target: `plan:${row!.id}`, details: { kind: "scenario", name: input.name } });
    return row!;
  });
}

export async function createBudgetSplitPlan(db: Database, user: CurrentUser, scope: MarketScope, input: BudgetSplitInput): Promise<PlanRow> {
  const computed = await computeSplit(db, scope, input);
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(plans)
      .values({ kind: "budget_split", name: input.name, runId: input.runId, marketIds: computed.marketIds, body: computed.body, createdBy: user.id })
      .returning();
    await tx.insert(auditLog).values({
      userId: user.id,
      action: "plan_created",
      target: `plan:${row!.id}`,
      details: { kind: "budget_split", name: input.name, totalBudget: input.totalBudget, horizon: input.horizon },
    });
    return row!;
  });
}

/** Replaces a draft (or rejected) plan's inputs; a rejected plan becomes a draft again. */
export async function updatePlan(db: Database, user: CurrentUser, scope: MarketScope, row: PlanRow, raw: unknown, parse: { scenario: (raw: unknown) => ScenarioInput; split: (raw: unknown) => BudgetSplitInput }): Promise<PlanRow> {
  if (!permissions(row, user).edit) throw editRefusal(row, user);
  const input = row.kind === "scenario" ? parse.scenario(raw) : parse.split(raw);
  const computed = row.kind === "scenario" ? await computeScenario(db, scope, input as ScenarioInput) : await computeSplit(db, scope, input as BudgetSplitInput);
  return db.transaction(async (tx) => {
    const [updated] = await tx
      .update(plans)
      .set({
        name: input.name,
        runId: input.runId,
        marketIds: computed.marketIds,
        body: computed.body,
        status: "draft",
        decidedAt: null,
        decidedBy: null,
        decisionComment: null,
        updatedAt: new Date(),
      })
      .where(and(eq(plans.id, row.id), eq(plans.status, row.status)))
      .returning();
    if (!updated) throw new Conflict("The plan changed while you were editing it; reload it and try again");
    await tx.insert(auditLog).values({ userId: user.id, action: "plan_updated", target: `plan:${row.id}`, details: { kind: row.kind, previousStatus: row.status } });
    return updated;
  });
}

function editRefusal(row: PlanRow, user: CurrentUser): Error {
  if (row.status === "submitted") return new Conflict("The plan waits for approval; withdraw it before changing it");
  if (row.status === "approved") return new Conflict("An approved plan cannot be changed; save a new one");
  if (row.kind === "budget_split" && user.role === "market_manager") return new Forbidden("Market managers cannot change budget splits");
  return new Forbidden("Only the plan's author or an admin can change it");
}

/** The audit log's actions for a plan's name and note (what `PATCH /api/plans/:planId` changes). */
export const planRenameActions = { name: "plan_renamed", note: "plan_note_changed" } as const;

/**
 * A new name and/or note, at any status: the numbers and the approval stay as they are.
 * One audit entry per changed value (who, old → new name); a change that changes nothing writes nothing.
 */
export async function renamePlan(db: Database, user: CurrentUser, row: PlanRow, change: PlanRenameInput): Promise<PlanRow> {
  if (!permissions(row, user).rename) throw new Forbidden("Only the plan's author or an admin can rename it or change its note");
  return db.transaction(async (tx) => {
    // Read again inside the transaction, so old → new in the audit log is what was replaced.
    const [current] = await tx.select().from(plans).where(eq(plans.id, row.id)).for("update");
    if (!current) throw new NotFound("No such plan");
    const body = bodyOf(current);
    const name = change.name ?? current.name;
    const note = change.note === undefined ? body.note : change.note === "" ? null : change.note;
    if (name === current.name && note === body.note) return current;
    const [updated] = await tx
      .update(plans)
      .set({ name, body: { ...body, note }, updatedAt: new Date() })
      .where(eq(plans.id, row.id))
      .returning();
    if (name !== current.name) {
      await tx.insert(auditLog).values({ userId: user.id, action: planRenameActions.name, target: `plan:${row.id}`, details: { kind: current.kind, from: current.name, to: name } });
    }
    if (note !== body.note) {
      await tx.insert(auditLog).values({ userId: user.id, action: planRenameActions.note, target: `plan:${row.id}`, details: { kind: current.kind, name, hadNote: body.note !== null, hasNote: note !== null } });
    }
    return updated!;
  });
}

export async function deletePlan(db: Database, user: CurrentUser, row: PlanRow): Promise<void> {
  if (!permissions(row, user).delete) {
    if (row.createdBy !== user.id) throw new Forbidden("Only the plan's author or an admin can delete it");
    throw new Conflict(row.status === "submitted" ? "The plan waits for approval; withdraw it before deleting it" : "An approved plan is kept; only an admin can delete it");
  }
  await db.transaction(async (tx) => {
    await tx.delete(plans).where(eq(plans.id, row.id));
    await tx.insert(auditLog).values({ userId: user.id, action: "plan_deleted", target: `plan:${row.id}`, details: { kind: row.kind, name: row.name, status: row.status } });
  });
}

/** Facts about a plan for its e-mails, in a user's words. */
async function mailFacts(db: Queryable, row: PlanRow, baseUrl: string): Promise<PlanMailFacts> {
  const split = bodyOf(row).budgetSplit!;
  const [author] = row.createdBy ? await db.select({ name: users.name }).from(users).where(eq(users.id, row.createdBy)) : [];
  const names = row.marketIds.length > 0 ? await db.select({ name: markets.name }).from(markets).where(inArray(markets.id, row.marketIds)) : [];
  const [settings] = await db.select({ currency: workspaceSettings.currency }).from(workspaceSettings).limit(1);
  return {
    planName: row.name,
    authorName: author?.name ?? "Someone",
    totalBudget: split.totalBudget,
    horizon: split.horizon,
    currency: settings?.currency ?? "",
    marketNames: names.map((m) => m.name).sort(),
    planUrl: `${baseUrl}/budget-split?plan=${encodeURIComponent(row.id)}`,
  };
}

export interface MailContext {
  readonly mailer: Mailer;
  readonly config: Pick<AppConfig, "publicUrl">;
  readonly req: Request;
  readonly log?: Logger;
}

/** Sends after the change is stored; a delivery failure is logged (the message stays in the outbox) and does not undo the change. */
async function sendAll(ctx: MailContext, messages: Parameters<Mailer["send"]>[0][]): Promise<void> {
  for (const message of messages) {
    try {
      await ctx.mailer.send(message);
    } catch (error) {
      (ctx.log ?? ctx.req.log)?.error({ err: safeErrorForLog(error), kind: message.kind }, "e-mail delivery failed");
    }
  }
}

export async function submitPlan(db: Database, user: CurrentUser, row: PlanRow, mail: MailContext): Promise<PlanRow> {
  if (row.kind !== "budget_split") throw new Invalid("Only budget splits go through approval");
  if (!permissions(row, user).submit) {
    if (row.status !== "draft") throw new Conflict(`Only a draft can be submitted; this plan is ${row.status}`);
    throw new Forbidden("Only the plan's author or an admin can submit it");
  }
  if ((await currentRunId(db)) !== row.runId) throw new Conflict("A newer fit has been published since this split was computed; compute it again on the current fit before submitting");
  const updated = await db.transaction(async (tx) => {
    const body: PlanBody = { ...bodyOf(row), submitted: { by: user.id, at: new Date().toISOString() } };
    const [done] = await tx
      .update(plans)
      .set({ status: "submitted", body, updatedAt: new Date() })
      .where(and(eq(plans.id, row.id), eq(plans.status, "draft")))
      .returning();
    if (!done) throw new Conflict("The plan changed meanwhile; reload it");
    await tx.insert(auditLog).values({ userId: user.id, action: "plan_submitted", target: `plan:${row.id}`, details: { name: row.name } });
    return done;
  });
  const leads = await db
    .select({ id: users.id, email: users.email, name: users.name })
    .from(users)
    .where(and(eq(users.role, "portfolio_lead"), eq(users.disabled, false), isNotNull(users.passwordHash)));
  const facts = await mailFacts(db, updated, appBaseUrl(mail.config, mail.req));
  await sendAll(
    mail,
    leads.filter((lead) => lead.id !== row.createdBy).map((lead) => planSubmittedMessage(lead, facts)),
  );
  return updated;
}

export async function withdrawPlan(db: Database, user: CurrentUser, row: PlanRow): Promise<PlanRow> {
  if (!permissions(row, user).withdraw) {
    if (row.status !== "submitted") throw new Conflict(`Only a submitted plan can be withdrawn; this plan is ${row.status}`);
    throw new Forbidden("Only the plan's author or an admin can withdraw it");
  }
  return db.transaction(async (tx) => {
    const [done] = await tx
      .update(plans)
      .set({ status: "draft", body: { ...bodyOf(row), submitted: null }, updatedAt: new Date() })
      .where(and(eq(plans.id, row.id), eq(plans.status, "submitted")))
      .returning();
    if (!done) throw new Conflict("The plan changed meanwhile; reload it");
    await tx.insert(auditLog).values({ userId: user.id, action: "plan_withdrawn", target: `plan:${row.id}`, details: { name: row.name } });
    return done;
  });
}

export async function decidePlan(db: Database, user: CurrentUser, row: PlanRow, input: PlanDecisionInput, mail: MailContext): Promise<PlanRow> {
  if (row.kind !== "budget_split") throw new Invalid("Only budget splits go through approval");
  if (row.status !== "submitted") throw new Conflict(`Only a submitted plan can be approved or rejected; this plan is ${row.status}`);
  if (row.createdBy === user.id) throw new Forbidden("You cannot decide on your own plan; another portfolio lead or an admin decides");
  const approved = input.decision === "approve";
  const comment = input.comment && input.comment.length > 0 ? input.comment : null;
  const updated = await db.transaction(async (tx) => {
    const [done] = await tx
      .update(plans)
      .set({ status: approved ? "approved" : "rejected", decidedAt: new Date(), decidedBy: user.id, decisionComment: comment, updatedAt: new Date() })
      .where(and(eq(plans.id, row.id), eq(plans.status, "submitted")))
      .returning();
    if (!done) throw new Conflict("The plan changed meanwhile; reload it");
    await tx.insert(auditLog).values({
      userId: user.id,
      action: approved ? "plan_approved" : "plan_rejected",
      target: `plan:${row.id}`,
      details: { name: row.name, comment, authorId: row.createdBy },
    });
    return done;
  });
  if (row.createdBy) {
    const [author] = await db
      .select({ id: users.id, email: users.email, name: users.name, disabled: users.disabled })
      .from(users)
      .where(eq(users.id, row.createdBy));
    if (author && !author.disabled) {
      const facts = await mailFacts(db, updated, appBaseUrl(mail.config, mail.req));
      await sendAll(mail, [planDecidedMessage(author, facts, { approved, by: user.name, comment })]);
    }
  }
  return updated;
}

export { planRow };
