// Plans as stored and as sent: the JSON body kept in plans.body, visibility by market
// scope (a plan is visible iff every market of its cells is in the viewer's markets),
// and the view with what the viewer may do with it.
import { and, arrayContained, asc, desc, eq, inArray, sql, type SQL } from "drizzle-orm";
import {
  budgetSplitAuthorRoles,
  modelCaution,
  planDeciderRoles,
  type BudgetSplitDetail,
  type CurrentUser,
  type Plan,
  type PlanKind,
  type PlanStatus,
  type PlanSummary,
  type ScenarioDetail,
} from "@tributary/contracts";
import type { MarketScope } from "../access/route-table";
import type { Queryable } from "../db/client";
import { brands, cells, markets, plans, users } from "../db/schema";
import { NotFound } from "../http/errors";
import { currentRunId } from "../runs/run-queries";

/** What plans.body holds. */
export interface PlanBody {
  readonly version: 1;
  readonly note: string | null;
  /** The plan's cells, in the order its numbers were computed in. */
  readonly cellIds: readonly string[];
  readonly submitted: { readonly by: string | null; readonly at: string } | null;
  readonly scenario?: ScenarioDetail;
  readonly budgetSplit?: BudgetSplitDetail;
}

export type PlanRow = typeof plans.$inferSelect;

export function bodyOf(row: PlanRow): PlanBody {
  return row.body as PlanBody;
}

/** Plans whose markets are all in the scope. */
export function visibleTo(scope: MarketScope): SQL {
  return scope.marketIds.length > 0 ? arrayContained(plans.marketIds, [...scope.marketIds]) : sql`false`;
}

/** The markets of a plan, for the route table's resolver (null when there is no such plan). */
export async function planMarkets(db: Queryable, planId: string): Promise<string[] | null> {
  const [row] = await db.select({ marketIds: plans.marketIds }).from(plans).where(eq(plans.id, planId));
  return row ? row.marketIds : null;
}

export async function planRow(db: Queryable, planId: string): Promise<PlanRow> {
  const [row] = await db.select().from(plans).where(eq(plans.id, planId));
  if (!row) throw new NotFound("No such plan");
  return row;
}

/** Cell, brand and market ids and names of the given cells. */
export async function cellFacts(db: Queryable, cellIds: readonly string[]) {
  if (cellIds.length === 0) return new Map<string, { cellId: string; brandId: string; marketId: string; brand: string; market: string }>();
  const rows = await db
    .select({ cellId: cells.id, brandId: cells.brandId, marketId: cells.marketId, brand: brands.name, market: markets.name })
    .from(cells)
    .innerJoin(brands, eq(brands.id, cells.brandId))
    .innerJoin(markets, eq(markets.id, cells.marketId))
    .where(inArray(cells.id, [...cellIds]));
  return new Map(rows.map((row) => [row.cellId, row] as const));
}

async function userNames(db: Queryable, ids: readonly (string | null)[]): Promise<Map<string, string>> {
  const wanted = [...new Set(ids.filter((id): id is string => id !== null))];
  if (wanted.length === 0) return new Map();
  const rows = await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, wanted));
  return new Map(rows.map((row) => [row.id, row.name] as const));
}

async function marketNames(db: Queryable, ids: readonly string[]): Promise<Map<string, string>> {
  if (ids.length === 0) return new Map();
  const rows = await db.select({ id: markets.id, name: markets.name }).from(markets).where(inArray(markets.id, [...new Set(ids)]));
  return new Map(rows.map((row) => [row.id, row.name] as const));
}

const ref = (names: Map<string, string>, id: string | null) => (id !== null && names.has(id) ? { id, name: names.get(id)! } : null);

/** What a user may do with a plan. Market scope is checked before (the plan is visible). */
export function permissions(row: Pick<PlanRow, "kind" | "status" | "createdBy">, user: CurrentUser) {
  const own = row.createdBy === user.id;
  const admin = user.role === "admin";
  const mayAuthor = row.kind === "scenario" || (budgetSplitAuthorRoles as readonly string[]).includes(user.role);
  const open = row.status === "draft" || row.status === "rejected";
  return {
    edit: (own || admin) && mayAuthor && open,
    /** A new name or note changes no number, so it is open at any status (the audit log keeps old → new). */
    rename: own || admin,
    delete: admin || (own && open),
    submit: row.kind === "budget_split" && row.status === "draft" && (own || admin) && mayAuthor,
    withdraw: row.kind === "budget_split" && row.status === "submitted" && (own || admin),
    decide: row.kind === "budget_split" && row.status === "submitted" && (planDeciderRoles as readonly string[]).includes(user.role) && !own,
  };
}

export async function planView(db: Queryable, row: PlanRow, user: CurrentUser): Promise<Plan> {
  const body = bodyOf(row);
  const [facts, names, marketsById, current] = await Promise.all([
    cellFacts(db, body.cellIds),
    userNames(db, [row.createdBy, row.decidedBy, body.submitted?.by ?? null]),
    marketNames(db, row.marketIds),
    currentRunId(db),
  ]);
  const base = {
    id: row.id,
    name: row.name,
    note: body.note,
    status: row.status as PlanStatus,
    runId: row.runId,
    runIsCurrent: current === row.runId,
    markets: row.marketIds.map((id) => ({ id, name: marketsById.get(id) ?? id })),
    cells: body.cellIds.flatMap((id) => {
      const cell = facts.get(id);
      return cell ? [cell] : [];
    }),
    createdBy: ref(names, row.createdBy),
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
    submitted: body.submitted ? { by: ref(names, body.submitted.by), at: body.submitted.at } : null,
    decision: row.decidedAt ? { by: ref(names, row.decidedBy), at: row.decidedAt.toISOString(), comment: row.decisionComment } : null,
    can: permissions(row, user),
    caution: modelCaution,
  };
  if (row.kind === "scenario") return { kind: "scenario", ...base, scenario: body.scenario! };
  return { kind: "budget_split", ...base, budgetSplit: body.budgetSplit! };
}

export async function listPlanSummaries(
  db: Queryable,
  scope: MarketScope,
  filter: { kind?: PlanKind; status?: PlanStatus; market?: string },
): Promise<PlanSummary[]> {
  const rows = await db
    .select()
    .from(plans)
    .where(
      and(
        visibleTo(scope),
        filter.kind ? eq(plans.kind, filter.kind) : undefined,
        filter.status ? eq(plans.status, filter.status) : undefined,
        filter.market ? sql`${filter.market} = any(${plans.marketIds})` : undefined,
      ),
    )
    .orderBy(desc(plans.updatedAt), asc(plans.id));
  const [names, marketsById, current] = await Promise.all([
    userNames(db, rows.map((row) => row.createdBy)),
    marketNames(db, rows.flatMap((row) => row.marketIds)),
    currentRunId(db),
  ]);
  return rows.map((row) => {
    const body = bodyOf(row);
    const scenario = body.scenario;
    const split = body.budgetSplit;
    return {
      id: row.id,
      kind: row.kind as PlanKind,
      name: row.name,
      status: row.status as PlanStatus,
      runId: row.runId,
      runIsCurrent: current === row.runId,
      markets: row.marketIds.map((id) => ({ id, name: marketsById.get(id) ?? id })),
      cellCount: body.cellIds.length,
      horizon: scenario?.horizon ?? split?.horizon ?? 0,
      spend: scenario ? scenario.headline.scenarioSpend : (split?.totalBudget ?? 0),
      extraCustomers: scenario ? scenario.headline.extraCustomers : split!.result.customers.difference,
      createdBy: ref(names, row.createdBy),
      createdAt: row.createdAt.toISOString(),
      updatedAt: row.updatedAt.toISOString(),
      decidedAt: row.decidedAt?.toISOString() ?? null,
    };
  });
}
