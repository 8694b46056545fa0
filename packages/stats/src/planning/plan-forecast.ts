import { summariseDraws, type DrawSummary } from "../decisions/draw-summary";
import { baselineAt, contributionSeries } from "../decisions/media-contribution";
import { drawNoise } from "../decisions/predictive";
import type { DrawSet } from "../decisions/draw-set";
import { mondayOfAbsoluteWeek } from "../model/absolute-week";
import { createRandomSource } from "../rng/create-random-source";
import { planIndex, validateSpendPlan, type SpendPlan } from "./spend-plan";

export interface PlanForecastOptions {
  /**
   * Seed of the predictive noise (default 1). Cell g of the run always draws its noise
   * from stream g of this seed, so two plans forecast with the same seed share their
   * noise (common random numbers) and their difference is free of it.
   */
  readonly seed?: number;
}

export interface PlanWeekForecast {
  /** 0-based plan week. */
  readonly planWeek: number;
  /** ISO Monday of the week. */
  readonly week: string;
  /** Planned spend over all channels. */
  readonly spend: number;
  /** Outcome with posterior predictive noise (mean, sd, 50 % and 90 % intervals). */
  readonly outcome: DrawSummary;
  /** Expected outcome from media (sum of channel contributions), carry-over included. */
  readonly media: DrawSummary;
}

export interface CellPlanForecast {
  readonly cellIndex: number;
  readonly brand: string;
  readonly market: string;
  readonly weeks: readonly PlanWeekForecast[];
  /** Outcome over the plan's weeks, with predictive noise. */
  readonly total: DrawSummary;
  readonly totalSpend: number;
  /** Per draw: outcome over the plan's weeks with noise, and its expectation given the draw. */
  readonly totalDraws: Float64Array;
  readonly expectedTotalDraws: Float64Array;
  /** Per draw × plan week (row-major by draw): expected outcome, and outcome with noise. */
  readonly expected: Float64Array;
  readonly replicated: Float64Array;
}

export interface SelectionWeekForecast {
  readonly planWeek: number;
  readonly spend: number;
  readonly outcome: DrawSummary;
}

export interface PlanForecast {
  readonly horizon: number;
  readonly seed: number;
  readonly cells: readonly CellPlanForecast[];
  /** All planned cells together; week h sums each cell's plan week h (cells' calendars may differ). */
  readonly selection: {
    readonly weeks: readonly SelectionWeekForecast[];
    readonly total: DrawSummary;
    readonly totalSpend: number;
    readonly totalDraws: Float64Array;
    readonly expectedTotalDraws: Float64Array;
  };
  readonly note: string;
}

export const PLAN_CAUTION =
  "Estimates are model-based and depend on the data and the priors; they are not guarantees. Confirm the effect of a budget change with a controlled experiment (a lift test) before moving large budgets.";

/**
 * Forecast of a spend plan, per cell and for the selection: the baseline continued with
 * its trend and seasonality (controls at their mean), each channel's contribution with
 * adstock carried over from the cell's last data weeks, and posterior predictive noise
 * (Normal or Student-t as fitted), for every posterior draw.
 */
export function forecastPlan(set: DrawSet, plan: SpendPlan, options: PlanForecastOptions = {}): PlanForecast {
  validateSpendPlan(set, plan);
  const seed = options.seed ?? 1;
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) throw new RangeError(`the forecast seed must be a whole number from 0 to 4294967295, got ${seed}`);
  const D = set.drawCount;
  const H = plan.horizon;
  const C = plan.channels.length;
  const selectionDraws = new Float64Array(D * H);
  const selectionTotal = new Float64Array(D);
  const selectionExpected = new Float64Array(D);
  const selectionSpend = new Float64Array(H);
  const cells = plan.cells.map((planCell, i): CellPlanForecast => {
    const g = planCell.cellIndex;
    const cell = set.cells[g]!;
    const T = cell.weeks;
    // The last L − 1 weeks of real spend, then the plan: the truncated adstock of a plan
    // week looks back no further, so the carry-over is exact without the older history.
    const from = Math.max(0, T - (set.maxLag - 1));
    const length = T - from + H;
    const series = cell.spend.map((history, c) => {
      const s = new Float64Array(length);
      s.set(history.subarray(from, T));
      for (let h = 0; h < H; h++) s[T - from + h] = plan.spend[planIndex(plan, i, c, h)]!;
      return s;
    });
    const p = { mean: new Float64Array(D * H), replicated: new Float64Array(D * H), media: new Float64Array(D * H) };
    const contribution = new Float64Array(length);
    const buffer = new Float64Array(length);
    // Same order of noise draws as the run's posterior predictive (draw by draw, week by week).
    const rng = createRandomSource(seed, g);
    const G = set.cells.length;
    for (let d = 0; d < D; d++) {
      for (let h = 0; h < H; h++) p.mean[d * H + h] = baselineAt(set, d, g, T + h);
      for (let c = 0; c < C; c++) {
        contributionSeries(set, d, g, c, series[c]!, contribution, buffer);
        for (let h = 0; h < H; h++) {
          const v = contribution[T - from + h]!;
          p.media[d * H + h] = p.media[d * H + h]! + v;
          p.mean[d * H + h] = p.mean[d * H + h]! + v;
        }
      }
      const sigma = set.sigma[d * G + g]!;
      const nu = set.nu[d * G + g]!;
      for (let h = 0; h < H; h++) p.replicated[d * H + h] = p.mean[d * H + h]! + drawNoise(rng, sigma, nu);
    }
    const totalDraws = new Float64Array(D);
    const expectedTotalDraws = new Float64Array(D);
    for (let d = 0; d < D; d++) {
      let total = 0;
      let expected = 0;
      for (let h = 0; h < H; h++) {
        const y = p.replicated[d * H + h]!;
        total += y;
        expected += p.mean[d * H + h]!;
        selectionDraws[d * H + h] = selectionDraws[d * H + h]! + y;
      }
      totalDraws[d] = total;
      expectedTotalDraws[d] = expected;
      selectionTotal[d] = selectionTotal[d]! + total;
      selectionExpected[d] = selectionExpected[d]! + expected;
    }
    const column = new Float64Array(D);
    const media = new Float64Array(D);
    let totalSpend = 0;
    const weeks = Array.from({ length: H }, (_, h): PlanWeekForecast => {
      let spend = 0;
      for (let c = 0; c < C; c++) spend += plan.spend[planIndex(plan, i, c, h)]!;
      totalSpend += spend;
      selectionSpend[h] = selectionSpend[h]! + spend;
      for (let d = 0; d < D; d++) {
        column[d] = p.replicated[d * H + h]!;
        media[d] = p.media[d * H + h]!;
      }
      return {
        planWeek: h,
        week: mondayOfAbsoluteWeek(cell.firstAbsoluteWeek + T + h),
        spend,
        outcome: summariseDraws(column),
        media: summariseDraws(media),
      };
    });
    return {
      cellIndex: g,
      brand: cell.brand,
      market: cell.market,
      weeks,
      total: summariseDraws(totalDraws),
      totalSpend,
      totalDraws,
      expectedTotalDraws,
      expected: p.mean,
      replicated: p.replicated,
    };
  });
  const column = new Float64Array(D);
  const weeks = Array.from({ length: H }, (_, h): SelectionWeekForecast => {
    for (let d = 0; d < D; d++) column[d] = selectionDraws[d * H + h]!;
    return { planWeek: h, spend: selectionSpend[h]!, outcome: summariseDraws(column) };
  });
  let totalSpend = 0;
  for (let h = 0; h < H; h++) totalSpend += selectionSpend[h]!;
  return {
    horizon: H,
    seed,
    cells,
    selection: { weeks, total: summariseDraws(selectionTotal), totalSpend, totalDraws: selectionTotal, expectedTotalDraws: selectionExpected },
    note: `Forecast over ${D} posterior draws with predictive noise; baseline trend and seasonality continued, controls at their mean, carry-over from the last weeks of real spend. ${PLAN_CAUTION}`,
  };
}
