// A finished run's stored numbers: the estimates (filtered to the viewer's markets in
// one place), the report, and the draws kept for planning.
import { and, asc, eq, inArray } from "drizzle-orm";
import {
  modelCaution,
  type CellChannelResultView,
  type FitDiagnosticsView,
  type HoldoutAccuracy,
  type ModelSettings,
  type ParameterDiagnostic,
  type ParameterTrace,
  type PredictiveCheckCell,
  type Run,
  type RunReport,
  type RunResults,
} from "@tributary/contracts";
import type { DrawSet } from "@tributary/stats";
import type { FitSummaries } from "../jobs/fit-job";
import type { MarketScope } from "../access/route-table";
import type { Queryable } from "../db/client";
import { cells, runDraws, runResults, runs, workspaceSettings } from "../db/schema";
import { Conflict, NotFound } from "../http/errors";
import { concatenateDraws, runDrawSet, type NamedDrawRows } from "../jobs/predictive-check";
import { parameterLabeller } from "../jobs/run-report-data";
import { entityNames } from "../queries/entity-names";
import { fitOptionsOf, loadFitInput } from "./fit-input";
import { modelSettingsRecord } from "./model-settings-queries";
import { runForScope } from "./run-queries";
import { resultKinds } from "./run-service";

async function storedResult<T>(db: Queryable, runId: string, kind: string): Promise<T> {
  const [row] = await db.select({ summaries: runResults.summaries }).from(runResults).where(and(eq(runResults.runId, runId), eq(runResults.kind, kind)));
  if (!row) throw new Conflict("This run has no stored results");
  return row.summaries as T;
}

function requireSucceeded(run: Run): void {
  if (run.status !== "succeeded") throw new Conflict(`The run has no results: it is ${run.status}`);
}

/** The fit's result as stored, with the workspace cell id of each of its cell indices. */
export type StoredFitResult = FitSummaries & { readonly cellIds: readonly string[] };

/** The fit's stored result (summaries, shrinkage, pooling factors) with its cell ids. */
export function storedFitResult(db: Queryable, runId: string): Promise<StoredFitResult> {
  return storedResult<StoredFitResult>(db, runId, resultKinds.fit);
}

/**
 * Workspace ids (cell, brand, market) of the fit's cells, by cell index, with the brand's
 * and market's names as they are now (the stored results carry the names at fit time).
 */
async function cellRefs(db: Queryable, cellIds: readonly string[]) {
  const [rows, names] = await Promise.all([
    cellIds.length > 0 ? db.select({ id: cells.id, brandId: cells.brandId, marketId: cells.marketId }).from(cells).where(inArray(cells.id, [...cellIds])) : [],
    entityNames(db),
  ]);
  const byId = new Map(rows.map((row) => [row.id, { ...row, brand: names.brands.get(row.brandId), market: names.markets.get(row.marketId) }] as const));
  return cellIds.map((id) => byId.get(id));
}

/**
 * The run's estimates as `viewer` may see them: cells outside the scope's markets are
 * left out here, so no route can send them by mistake.
 */
export async function runResultsFor(db: Queryable, run: Run, scope: MarketScope): Promise<RunResults> {
  requireSucceeded(run);
  const result = await storedResult<StoredFitResult>(db, run.id, resultKinds.fit);
  const refs = await cellRefs(db, result.cellIds);
  const allowed = new Set(scope.marketIds);
  const cells: CellChannelResultView[] = [];
  for (const cell of result.cells) {
    const ref = refs[cell.cell];
    if (!ref || !allowed.has(ref.marketId)) continue;
    cells.push({
      cellId: ref.id,
      brandId: ref.brandId,
      marketId: ref.marketId,
      brand: ref.brand ?? cell.brand,
      market: ref.market ?? cell.market,
      channel: cell.channel,
      hasSpend: cell.hasSpend,
      cac0: cell.cac0,
      cac0Unpooled: cell.cac0Unpooled,
      shrinkage: cell.shrinkage,
      outlier: cell.outlier,
      outlierReason: cell.outlierReason,
    });
  }
  const [settings] = await db.select({ currency: workspaceSettings.currency }).from(workspaceSettings).limit(1);
  return {
    run: runForScope(run, scope),
    currency: settings?.currency ?? "",
    channels: result.channels.map((c) => ({ ...c })),
    cells,
    poolingFactors: result.poolingFactors.map((p) => ({ ...p })),
    caution: modelCaution,
  };
}

interface StoredReport {
  readonly parameters: ParameterDiagnostic[];
  readonly traces: ParameterTrace[];
  readonly predictiveCheck: PredictiveCheckCell[];
  readonly holdout: HoldoutAccuracy | null;
}

/** Diagnostics, trace and rank data, predictive check and holdout accuracy (every market: analysts and admins only). */
export async function runReportOf(db: Queryable, run: Run): Promise<RunReport> {
  requireSucceeded(run);
  const [result, report] = await Promise.all([
    storedResult<StoredFitResult>(db, run.id, resultKinds.fit),
    storedResult<StoredReport>(db, run.id, resultKinds.report),
  ]);
  // Labels and cells under the brands' and markets' current names (the report stored those at fit time).
  const refs = await cellRefs(db, result.cellIds);
  const byCellId = new Map(refs.flatMap((ref) => (ref ? [[ref.id, ref] as const] : [])));
  const renamed = <T extends { cellId: string; brand: string; market: string }>(cell: T): T => {
    const ref = byCellId.get(cell.cellId);
    return { ...cell, brand: ref?.brand ?? cell.brand, market: ref?.market ?? cell.market };
  };
  const fitCells = result.cells;
  const cellCount = refs.length;
  const namesAtFit = Array.from({ length: cellCount }, (_, g) => fitCells.find((c) => c.cell === g));
  const label = parameterLabeller({
    cells: refs.map((ref, g) => ({ brand: ref?.brand ?? namesAtFit[g]?.brand ?? `cell ${g}`, market: ref?.market ?? namesAtFit[g]?.market ?? "" })),
  });
  return {
    run,
    // Stored as JSON: numbers that are not defined (NaN) come back as null, as the view allows.
    diagnostics: result.diagnostics as unknown as FitDiagnosticsView,
    parameters: report.parameters.map((p) => ({ ...p, label: label(p.name) })),
    traces: report.traces.map((trace) => ({ ...trace, label: label(trace.name) })),
    predictiveCheck: report.predictiveCheck.map(renamed),
    holdout: report.holdout ? { ...report.holdout, cells: report.holdout.cells.map(renamed) } : null,
    timing: result.timing,
  };
}

/** The thinned draws of a run, one entry per chain (row-major draws × names). */
export async function loadRunDraws(db: Queryable, runId: string, kind = "pooled"): Promise<NamedDrawRows[]> {
  const rows = await db
    .select({ names: runDraws.parameterNames, drawCount: runDraws.drawCount, draws: runDraws.draws })
    .from(runDraws)
    .where(and(eq(runDraws.runId, runId), eq(runDraws.kind, kind)))
    .orderBy(asc(runDraws.chain));
  return rows.map((row) => {
    // Copied into an aligned buffer: the bytes may sit at any offset of the driver's buffer.
    const bytes = new Uint8Array(row.draws);
    const draws = new Float64Array(bytes.buffer, bytes.byteOffset, bytes.byteLength / 8);
    if (draws.length !== row.drawCount * row.names.length) throw new Error(`run ${runId}: stored draws do not match their names`);
    return { names: row.names, draws: Float64Array.from(draws) };
  });
}

/** The run's draw set for planning (decision quantities per draw), rebuilt from its data, settings and kept draws. */
export async function loadRunDrawSet(db: Queryable, runId: string): Promise<DrawSet> {
  return (await loadRunPosterior(db, runId)).drawSet;
}

/** A run's kept draws: the planning draw set and the draws under their parameter names (all chains, one after another). */
export interface RunPosterior {
  readonly drawSet: DrawSet;
  readonly draws: NamedDrawRows;
  /** Workspace cell ids by the fit's cell index (the draw set's cell order). */
  readonly cellIds: readonly string[];
}

export async function loadRunPosterior(db: Queryable, runId: string): Promise<RunPosterior> {
  const [run] = await db.select().from(runs).where(eq(runs.id, runId));
  if (!run) throw new NotFound("No such run");
  if (run.status !== "succeeded") throw new Conflict(`The run has no draws: it is ${run.status}`);
  const record = await modelSettingsRecord(db, run.modelSettingsId);
  const input = await loadFitInput(db, run.datasetVersionId);
  const settings: ModelSettings = record.settings;
  // The draws name cells by their position in the fit; put the cells back in that order (names may have changed since).
  const { cellIds } = await storedResult<StoredFitResult>(db, runId, resultKinds.fit);
  const position = new Map(input.cells.map((cell, g) => [cell.cellId, g] as const));
  const cellsInFitOrder = cellIds.map((id) => {
    const g = position.get(id);
    if (g === undefined) throw new Error(`run ${runId}: cell ${id} is not in its dataset version`);
    return input.data.cells[g]!;
  });
  // Lift tests do not enter the draw set; today's list may differ from the run's, so none is passed.
  const chains = await loadRunDraws(db, runId);
  const drawSet = runDrawSet({ ...input.data, cells: cellsInFitOrder }, fitOptionsOf(settings, run.seed, []), chains);
  return { drawSet, draws: concatenateDraws(chains), cellIds };
}
