// The planning draws of a run with the workspace ids of its cells, restricted to the
// cells a viewer may see, and their wire form for the planner's worker.
import { and, eq, inArray } from "drizzle-orm";
import { DRAW_SET_FORMAT, encodeFloat64, modelCaution, type DrawSetWire } from "@tributary/contracts";
import type { DrawSet } from "@tributary/stats";
import type { MarketScope } from "../access/route-table";
import type { Queryable } from "../db/client";
import { cells, runResults, runs, workspaceSettings } from "../db/schema";
import { Conflict, Invalid, NotFound } from "../http/errors";
import { entityNames, type EntityNames } from "../queries/entity-names";
import { loadRunDrawSet } from "../runs/run-results";
import { currentRunId } from "../runs/run-queries";

/** Workspace ids of a run's cell (by its index in the run's draw set). */
export interface RunCellIds {
  readonly cellId: string;
  readonly brandId: string;
  readonly marketId: string;
}

export interface PlanningDraws {
  readonly runId: string;
  readonly publishedAt: Date | null;
  readonly set: DrawSet;
  /** Ids of every cell of `set`, by cell index. */
  readonly cells: readonly RunCellIds[];
}

/** Draw sets are rebuilt from the database (a second or so); a finished run never changes, so a few are kept. */
const KEPT_RUNS = 3;
const cache = new WeakMap<object, Map<string, Promise<PlanningDraws>>>();

async function load(db: Queryable, runId: string): Promise<PlanningDraws> {
  const [run] = await db.select({ publishedAt: runs.publishedAt }).from(runs).where(eq(runs.id, runId));
  if (!run) throw new NotFound("No such run");
  const set = await loadRunDrawSet(db, runId);
  const [stored] = await db
    .select({ summaries: runResults.summaries })
    .from(runResults)
    .where(and(eq(runResults.runId, runId), eq(runResults.kind, "fit")));
  const cellIds = ((stored?.summaries as { cellIds?: string[] } | undefined)?.cellIds ?? []) as string[];
  if (cellIds.length !== set.cells.length) throw new Conflict("This run's stored cells do not match its draws");
  const rows = await db.select({ cellId: cells.id, brandId: cells.brandId, marketId: cells.marketId }).from(cells).where(inArray(cells.id, cellIds));
  const byId = new Map(rows.map((row) => [row.cellId, row] as const));
  const ids = cellIds.map((id) => {
    const row = byId.get(id);
    if (!row) throw new Conflict(`This run's cell ${id} no longer exists`);
    return row;
  });
  return { runId, publishedAt: run.publishedAt, set, cells: ids };
}

/**
 * The run's planning draws (kept in memory for the last few runs asked for), its cells
 * named by the brands' and markets' current names: plans and the planner name cells by
 * name, and an admin may rename a brand or market after the draws were loaded.
 */
export async function planningDraws(db: Queryable, runId: string): Promise<PlanningDraws> {
  const [draws, names] = await Promise.all([keptPlanningDraws(db, runId), entityNames(db)]);
  return withCurrentNames(draws, names);
}

/** The draws with each cell's brand and market named as they are now (the same object when nothing was renamed). */
export function withCurrentNames(draws: PlanningDraws, names: EntityNames): PlanningDraws {
  let renamed = false;
  const named = draws.set.cells.map((cell, g) => {
    const ids = draws.cells[g]!;
    const brand = names.brands.get(ids.brandId) ?? cell.brand;
    const market = names.markets.get(ids.marketId) ?? cell.market;
    if (brand === cell.brand && market === cell.market) return cell;
    renamed = true;
    return { ...cell, brand, market };
  });
  return renamed ? { ...draws, set: { ...draws.set, cells: named } } : draws;
}

function keptPlanningDraws(db: Queryable, runId: string): Promise<PlanningDraws> {
  let perDb = cache.get(db);
  if (!perDb) {
    perDb = new Map();
    cache.set(db, perDb);
  }
  const hit = perDb.get(runId);
  if (hit) {
    perDb.delete(runId);
    perDb.set(runId, hit);
    return hit;
  }
  const loading = load(db, runId);
  perDb.set(runId, loading);
  loading.catch(() => perDb.delete(runId));
  while (perDb.size > KEPT_RUNS) perDb.delete(perDb.keys().next().value!);
  return loading;
}

/** The current (latest published) run's planning draws, or 404 before any publication. */
export async function currentPlanningDraws(db: Queryable): Promise<PlanningDraws> {
  const runId = await currentRunId(db);
  if (!runId) throw new NotFound("No fit has been published yet");
  return planningDraws(db, runId);
}

/**
 * Indices (in run order) of the cells asked for, or of every cell in scope when none are
 * named. A cell that is not in the run, or not in the viewer's markets, is refused with
 * the same answer, so another market's cells cannot be discovered.
 */
export function cellIndicesInScope(draws: PlanningDraws, scope: MarketScope, cellIds: readonly string[] | null): number[] {
  const allowed = new Set(scope.marketIds);
  const visible = draws.cells.flatMap((cell, g) => (allowed.has(cell.marketId) ? [g] : []));
  if (cellIds === null) return visible;
  const position = new Map(draws.cells.map((cell, g) => [cell.cellId, g] as const));
  const chosen = new Set<number>();
  for (const id of cellIds) {
    const g = position.get(id);
    if (g === undefined || !allowed.has(draws.cells[g]!.marketId)) throw new NotFound(`No cell ${id} in the current run among your markets`);
    chosen.add(g);
  }
  return [...chosen].sort((a, b) => a - b);
}

/** The draw set of some of its cells (in the order given): every array laid out again over those cells only. */
export function drawSetOfCells(set: DrawSet, indices: readonly number[]): DrawSet {
  const G = set.cells.length;
  const n = indices.length;
  const C = set.channels.length;
  const J = set.seasonalityOrder;
  const K = set.controls.length;
  const D = set.drawCount;
  for (const g of indices) if (!Number.isInteger(g) || g < 0 || g >= G) throw new RangeError(`cell index ${g} is outside 0..${G - 1}`);
  const pick = (source: Float64Array, width: number): Float64Array => {
    const out = new Float64Array(D * n * width);
    for (let d = 0; d < D; d++) {
      for (let i = 0; i < n; i++) {
        const from = (d * G + indices[i]!) * width;
        out.set(source.subarray(from, from + width), (d * n + i) * width);
      }
    }
    return out;
  };
  return {
    ...set,
    cells: indices.map((g) => set.cells[g]!),
    beta: pick(set.beta, C),
    theta: pick(set.theta, C),
    alpha: pick(set.alpha, C),
    hillShape: pick(set.hillShape, C),
    baselineLevel: pick(set.baselineLevel, 1),
    beta1: pick(set.beta1, 1),
    gamma: pick(set.gamma, J),
    delta: pick(set.delta, J),
    controlCoef: pick(set.controlCoef, K),
    sigma: pick(set.sigma, 1),
    nu: pick(set.nu, 1),
  };
}

/** The wire form of the run's draws for the given cells (indices into the run's draw set). */
export async function drawSetWire(db: Queryable, draws: PlanningDraws, indices: readonly number[]): Promise<DrawSetWire> {
  const sub = drawSetOfCells(draws.set, indices);
  const [settings] = await db.select({ currency: workspaceSettings.currency }).from(workspaceSettings).limit(1);
  return {
    format: DRAW_SET_FORMAT,
    runId: draws.runId,
    publishedAt: draws.publishedAt?.toISOString() ?? "",
    currency: settings?.currency ?? "",
    model: sub.model,
    saturation: sub.saturation,
    likelihood: sub.likelihood,
    maxLag: sub.maxLag,
    seasonalityOrder: sub.seasonalityOrder,
    channels: [...sub.channels],
    controls: [...sub.controls],
    cells: sub.cells.map((cell, i) => {
      const ids = draws.cells[indices[i]!]!;
      return {
        cellId: ids.cellId,
        brandId: ids.brandId,
        marketId: ids.marketId,
        brand: cell.brand,
        market: cell.market,
        firstWeek: cell.firstWeek,
        firstAbsoluteWeek: cell.firstAbsoluteWeek,
        weeks: cell.weeks,
        trainWeeks: cell.trainWeeks,
        outcome: encodeFloat64(cell.outcome),
        spend: cell.spend.map((s) => encodeFloat64(s)),
        seasonalMean: encodeFloat64(cell.seasonalMean),
        controlsStandardised: cell.controlsStandardised.map((s) => encodeFloat64(s)),
      };
    }),
    drawCount: sub.drawCount,
    arrays: {
      beta: encodeFloat64(sub.beta),
      theta: encodeFloat64(sub.theta),
      alpha: encodeFloat64(sub.alpha),
      hillShape: encodeFloat64(sub.hillShape),
      baselineLevel: encodeFloat64(sub.baselineLevel),
      beta1: encodeFloat64(sub.beta1),
      gamma: encodeFloat64(sub.gamma),
      delta: encodeFloat64(sub.delta),
      controlCoef: encodeFloat64(sub.controlCoef),
      sigma: encodeFloat64(sub.sigma),
      nu: encodeFloat64(sub.nu),
    },
    caution: modelCaution,
  };
}

/** `?cells=a,b` or `?cells=a&cells=b` as a list, or null when absent. */
export function cellIdsOfQuery(raw: unknown): string[] | null {
  if (raw === undefined) return null;
  const list = (Array.isArray(raw) ? raw : [raw]).flatMap((v) => (typeof v === "string" ? v.split(",") : []));
  const ids = list.map((v) => v.trim()).filter((v) => v !== "");
  if (ids.length === 0) throw new Invalid("Name at least one cell in ?cells=, or leave it out for every cell you may see");
  return ids;
}
