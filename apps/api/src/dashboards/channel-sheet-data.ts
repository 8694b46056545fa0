// The Channel sheet's computed part for one cell × channel of a run: posterior
// histograms of the low-spend, marginal and average CAC, the response curve with bands,
// the carry-over profile and the weekly contribution against the baseline. Computed on
// first request and cached with the run's estimates.
import { RECENT_WEEKS, type CacBasis, type ChannelSheet } from "@tributary/contracts";
import {
  carryOverWeights,
  logHistogram,
  marginalCac,
  mondayOfAbsoluteWeek,
  responseCurve,
  summariseDraws,
  weeklyContribution,
  type DrawHistogram,
  type DrawSummary,
} from "@tributary/stats";
import { intervalOf, thinnedForBrowser, type RunEstimates } from "./run-estimates";

/** Points of the response curve (plus the current spend). */
const CURVE_POINTS = 41;
const HISTOGRAM_BINS = 30;

export type ChannelSheetData = Pick<
  ChannelSheet,
  "hasSpend" | "recentWeeks" | "currentWeeklySpend" | "lowSpendCac" | "marginalCac" | "averageCac" | "responseCurve" | "carryOver" | "contribution"
> & { readonly profitDraws: (number | null)[] };

export const lowSpendBasis: CacBasis = { kind: "low_spend", weeks: null, label: "low-spend CAC (1/β: the cost of the first customers a small spend brings)" };
export const averageBasis: CacBasis = {
  kind: "average_recent",
  weeks: RECENT_WEEKS,
  label: `average CAC over the last ${RECENT_WEEKS} fitted weeks (spend ÷ the customers it brought, carry-over included)`,
};
export const combinedBasis: CacBasis = {
  kind: "average_recent",
  weeks: RECENT_WEEKS,
  label: `all channels together: total spend ÷ total media contribution over the last ${RECENT_WEEKS} fitted weeks`,
};
export function marginalBasis(weeklySpend: number): CacBasis {
  return { kind: "marginal", weeks: RECENT_WEEKS, label: `marginal CAC at the current weekly spend (${Math.round(weeklySpend)}, the mean of the last ${RECENT_WEEKS} fitted weeks)` };
}

function histogramView(h: DrawHistogram) {
  return { scale: "log" as const, edges: Array.from(h.edges), counts: Array.from(h.counts), below: h.below, above: h.above, total: h.total };
}

function bands(s: DrawSummary) {
  return { q05: s.q05, q25: s.q25, q50: s.q50, q75: s.q75, q95: s.q95 };
}

/** Evenly spaced weekly spends from 0 to `max`, with the current spend among them. */
export function curveSpends(current: number, maxObserved: number, typicalScale: number): number[] {
  const top = Math.max(2 * current, 1.25 * maxObserved) || 3 * typicalScale || 1;
  const points = Array.from({ length: CURVE_POINTS }, (_, k) => (top * k) / (CURVE_POINTS - 1));
  if (!points.includes(current)) points.push(current);
  return points.sort((a, b) => a - b);
}

export function computeChannelSheetData(estimates: RunEstimates, g: number, c: number): ChannelSheetData {
  const set = estimates.drawSet;
  const cell = set.cells[g]!;
  const estimate = estimates.cells[g]!.channels[c]!;
  const spend = cell.spend[c]!;
  const current = estimate.currentWeeklySpend;
  let maxObserved = 0;
  for (const s of spend) maxObserved = Math.max(maxObserved, s);

  const marginal = marginalCac(set, g, c, current);
  const marginalInterval = intervalOf(marginal);
  if (!marginalInterval) throw new Error(`run ${estimates.runId}: the marginal CAC of cell ${g}, channel ${c} is not finite`);

  const thetaMedian = summariseDraws(Float64Array.from({ length: set.drawCount }, (_, d) => set.theta[(d * set.cells.length + g) * set.channels.length + c]!)).q50;
  const curve = responseCurve(set, g, c, curveSpends(current, maxObserved, thetaMedian));

  const L = set.maxLag;
  const weights = carryOverWeights(set, g, c);
  const alpha = Float64Array.from({ length: set.drawCount }, (_, d) => set.alpha[(d * set.cells.length + g) * set.channels.length + c]!);
  const lags = Array.from({ length: L }, (_, l) => {
    const column = Float64Array.from({ length: set.drawCount }, (_, d) => weights[d * L + l]!);
    return { lag: l, ...bands(summariseDraws(column)) };
  });

  const weekly = weeklyContribution(set, g, c);
  const series = (values: Float64Array) => Array.from(values);
  const bandSeries = (b: typeof weekly.contribution) => ({ q05: series(b.q05), q25: series(b.q25), q50: series(b.q50), q75: series(b.q75), q95: series(b.q95) });

  return {
    hasSpend: estimate.hasSpend,
    recentWeeks: RECENT_WEEKS,
    currentWeeklySpend: current,
    lowSpendCac: { basis: lowSpendBasis, summary: estimate.lowSpend.interval, histogram: histogramView(logHistogram(estimate.lowSpend.draws, HISTOGRAM_BINS)) },
    marginalCac: { basis: marginalBasis(current), summary: marginalInterval, histogram: histogramView(logHistogram(marginal, HISTOGRAM_BINS)) },
    averageCac: estimate.average
      ? { basis: averageBasis, summary: estimate.average.interval, histogram: histogramView(logHistogram(estimate.average.draws, HISTOGRAM_BINS)) }
      : null,
    responseCurve: {
      points: curve.map((p) => ({ weeklySpend: p.weeklySpend, response: bands(p.response), marginalCac: { q05: p.marginalCac.q05, q50: p.marginalCac.q50, q95: p.marginalCac.q95 } })),
      currentWeeklySpend: current,
      maxObservedWeeklySpend: maxObserved,
    },
    carryOver: { maxLag: L, alpha: bands(summariseDraws(alpha)), lags },
    contribution: {
      weeks: Array.from({ length: cell.weeks }, (_, t) => mondayOfAbsoluteWeek(cell.firstAbsoluteWeek + t)),
      spend: Array.from(spend),
      observed: Array.from(cell.outcome),
      fitted: Array.from({ length: cell.weeks }, (_, t) => t < cell.trainWeeks),
      contribution: bandSeries(weekly.contribution),
      baseline: bandSeries(weekly.baseline),
    },
    profitDraws: estimate.average ? thinnedForBrowser(estimate.average) : [],
  };
}
