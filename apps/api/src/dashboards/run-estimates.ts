// A finished run's numbers as the dashboards use them, computed once from its kept draws
// (the planning draw set) and its stored summaries, then cached per run (runs are
// immutable once finished). Cells are in the fit's order; workspace ids sit beside them.
import {
  RECENT_WEEKS,
  type CacInterval,
} from "@tributary/contracts";
import {
  averageCacCombinedRecent,
  averageCacRecent,
  cacLowSpend,
  mondayOfAbsoluteWeek,
  recentWeeklySpend,
  summariseDraws,
  thinDraws,
  type DrawSet,
} from "@tributary/stats";
import type { Queryable } from "../db/client";
import type { NamedDrawRows } from "../jobs/predictive-check";
import { loadRunPosterior, storedFitResult, type StoredFitResult } from "../runs/run-results";

/** Draws of the per-draw CAC behind the chance of profit, thinned, sent to the browser's slider. */
export const PROFIT_DRAWS_KEPT = 500;

/** A CAC's draws: summary, sorted finite-or-infinite draws (for shares below a value), and a thinned vector. */
export interface CacDraws {
  readonly interval: CacInterval;
  /** All draws, sorted ascending (Infinity sorts last). */
  readonly sorted: Float64Array;
  readonly draws: Float64Array;
}

export interface ChannelEstimate {
  readonly c: number;
  readonly channel: string;
  readonly hasSpend: boolean;
  /** Low-spend CAC0 = 1/β. */
  readonly lowSpend: CacDraws;
  /** Average CAC over the last RECENT_WEEKS fitted weeks; null without spend in that window. */
  readonly average: CacDraws | null;
  readonly currentWeeklySpend: number;
  readonly unpooled: CacInterval | null;
  /** CAC of the group estimate exp(−(μ + τB·zB + τM·zM)). */
  readonly group: CacInterval | null;
  readonly shrinkage: number | null;
  /** Median pooled CAC0 ÷ median no-pooling CAC0. */
  readonly medianRatio: number | null;
  readonly outlier: boolean;
  readonly outlierReason: string | null;
}

export interface CellEstimate {
  readonly g: number;
  readonly cellId: string;
  /** Names as the run was fitted (the brand level's order follows them). */
  readonly fitBrand: string;
  readonly fitMarket: string;
  readonly weeks: number;
  readonly fittedWeeks: number;
  readonly firstWeek: string;
  readonly lastWeek: string;
  readonly channels: readonly ChannelEstimate[];
  /** All channels together: total spend ÷ total contribution over the last RECENT_WEEKS fitted weeks. */
  readonly combined: CacDraws | null;
  readonly hasAnySpend: boolean;
}

export interface RunEstimates {
  readonly runId: string;
  readonly channels: readonly string[];
  readonly cells: readonly CellEstimate[];
  /** Portfolio channel effect exp(−μ_c) as a CAC, per channel. */
  readonly channelEffects: readonly CacInterval[];
  /** Brand effect exp(−(μ_c + τB·zB)) per fitted brand name and channel; null without a brand level. */
  readonly brandEffects: ReadonlyMap<string, readonly CacInterval[]> | null;
  readonly poolingFactors: StoredFitResult["poolingFactors"];
  readonly drawSet: DrawSet;
}

const finite = (x: number) => Number.isFinite(x);

/** A posterior interval of draws; null when a summary is not finite (e.g. a CAC that is infinite in many draws). */
export function intervalOf(values: Float64Array): CacInterval | null {
  const s = summariseDraws(values);
  if (![s.mean, s.q05, s.q25, s.q50, s.q75, s.q95].every(finite)) return null;
  return { mean: s.mean, q05: s.q05, q25: s.q25, q50: s.q50, q75: s.q75, q95: s.q95 };
}

function cacDraws(values: Float64Array): CacDraws | null {
  if (values.length === 0 || values.some((v) => Number.isNaN(v))) return null;
  const interval = intervalOf(values);
  if (!interval) return null;
  return { interval, sorted: Float64Array.from(values).sort(), draws: values };
}

/** Share of draws strictly below `value` (binary search over the sorted draws). */
export function shareBelow(draws: CacDraws, value: number): number {
  const sorted = draws.sorted;
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid]! < value) lo = mid + 1;
    else hi = mid;
  }
  return lo / sorted.length;
}

/** The thinned per-draw CAC for the browser's customer-value slider (null = infinite CAC). */
export function thinnedForBrowser(draws: CacDraws): (number | null)[] {
  return Array.from(thinDraws(draws.draws, PROFIT_DRAWS_KEPT), (v) => (Number.isFinite(v) ? v : null));
}

/** One named column of the concatenated draws, transformed per draw. */
function column(draws: NamedDrawRows, index: Map<string, number>, name: string): Float64Array | null {
  const j = index.get(name);
  if (j === undefined) return null;
  const width = draws.names.length;
  const D = draws.draws.length / width;
  const out = new Float64Array(D);
  for (let d = 0; d < D; d++) out[d] = draws.draws[d * width + j]!;
  return out;
}

const cacOfLog = (logBeta: Float64Array) => logBeta.map((v) => Math.exp(-v));

export async function computeRunEstimates(db: Queryable, runId: string): Promise<RunEstimates> {
  const [posterior, stored] = await Promise.all([loadRunPosterior(db, runId), storedFitResult(db, runId)]);
  const { drawSet: set, draws } = posterior;
  const index = new Map(draws.names.map((name, j) => [name, j] as const));
  const stats = new Map(stored.cells.map((cell) => [`${cell.cell}\u0000${cell.channel}`, cell] as const));

  const cells: CellEstimate[] = set.cells.map((cell, g) => {
    const channels: ChannelEstimate[] = set.channels.map((channel, c) => {
      const summary = stats.get(`${g}\u0000${channel}`);
      const lowSpend = cacDraws(cacLowSpend(set, g, c))!;
      const average = cacDraws(averageCacRecent(set, g, c, RECENT_WEEKS));
      const groupLog = column(draws, index, `logBetaGroup[${g},${channel}]`);
      const unpooled = summary?.cac0Unpooled ?? null;
      const shrinkage = summary?.shrinkage ?? null;
      return {
        c,
        channel,
        hasSpend: summary?.hasSpend ?? cell.spend[c]!.some((s) => s > 0),
        lowSpend,
        average,
        currentWeeklySpend: recentWeeklySpend(set, g, c, RECENT_WEEKS),
        unpooled: unpooled ? { mean: unpooled.mean, q05: unpooled.q05, q25: null, q50: unpooled.q50, q75: null, q95: unpooled.q95 } : null,
        group: groupLog ? intervalOf(cacOfLog(groupLog)) : null,
        // Stored as JSON: an undefined ratio (NaN) comes back as null.
        shrinkage: shrinkage !== null && Number.isFinite(shrinkage) ? shrinkage : null,
        medianRatio: unpooled && unpooled.q50 > 0 ? lowSpend.interval.q50 / unpooled.q50 : null,
        outlier: summary?.outlier ?? false,
        outlierReason: summary?.outlierReason ?? null,
      };
    });
    const hasAnySpend = channels.some((ch) => ch.hasSpend);
    return {
      g,
      cellId: posterior.cellIds[g]!,
      fitBrand: cell.brand,
      fitMarket: cell.market,
      weeks: cell.weeks,
      fittedWeeks: cell.trainWeeks,
      firstWeek: cell.firstWeek,
      lastWeek: mondayOfAbsoluteWeek(cell.firstAbsoluteWeek + cell.weeks - 1),
      channels,
      combined: hasAnySpend ? cacDraws(averageCacCombinedRecent(set, g, RECENT_WEEKS)) : null,
      hasAnySpend,
    };
  });

  const mu = set.channels.map((channel) => column(draws, index, `mu[${channel}]`));
  const channelEffects = mu.map((m, c) => {
    if (!m) throw new Error(`run ${runId}: the draws have no mu[${set.channels[c]}]`);
    return intervalOf(cacOfLog(m))!;
  });

  // Brands in order of first appearance in the fit's cells, as the model numbers them.
  const brandOrder: string[] = [];
  for (const cell of set.cells) if (!brandOrder.includes(cell.brand)) brandOrder.push(cell.brand);
  let brandEffects: Map<string, CacInterval[]> | null = null;
  if (index.has(`brandDeviation[0,${set.channels[0]}]`)) {
    brandEffects = new Map(
      brandOrder.map((brand, b) => [
        brand,
        set.channels.map((channel, c) => {
          const deviation = column(draws, index, `brandDeviation[${b},${channel}]`)!;
          const m = mu[c]!;
          return intervalOf(deviation.map((v, d) => Math.exp(-(m[d]! + v))))!;
        }),
      ]),
    );
  }

  return {
    runId,
    channels: [...set.channels],
    cells,
    channelEffects,
    brandEffects,
    poolingFactors: stored.poolingFactors,
    drawSet: set,
  };
}
