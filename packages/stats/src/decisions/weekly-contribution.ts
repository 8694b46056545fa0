import { checkCellChannel, type DrawSet } from "./draw-set";
import { quantileSorted } from "./draw-summary";
import { baselineAt, contributionSeries } from "./media-contribution";

/** Per-week quantiles of a quantity over draws: 90 % and 50 % central intervals and the median. */
export interface WeeklyBands {
  readonly q05: Float64Array;
  readonly q25: Float64Array;
  readonly q50: Float64Array;
  readonly q75: Float64Array;
  readonly q95: Float64Array;
}

export interface WeeklyContribution {
  /** Contribution β·r(a[t]) of the channel in each week of the cell (all weeks, holdout included). */
  readonly contribution: WeeklyBands;
  /** The cell's baseline without media in each week. */
  readonly baseline: WeeklyBands;
}

/** Quantile bands of every column of a row-major draws × weeks matrix. */
export function columnBands(matrix: Float64Array, drawCount: number, weeks: number): WeeklyBands {
  const bands = { q05: new Float64Array(weeks), q25: new Float64Array(weeks), q50: new Float64Array(weeks), q75: new Float64Array(weeks), q95: new Float64Array(weeks) };
  const column = new Float64Array(drawCount);
  for (let t = 0; t < weeks; t++) {
    for (let d = 0; d < drawCount; d++) column[d] = matrix[d * weeks + t]!;
    column.sort();
    bands.q05[t] = quantileSorted(column, 0.05);
    bands.q25[t] = quantileSorted(column, 0.25);
    bands.q50[t] = quantileSorted(column, 0.5);
    bands.q75[t] = quantileSorted(column, 0.75);
    bands.q95[t] = quantileSorted(column, 0.95);
  }
  return bands;
}

/** Weekly contribution of one channel beside the baseline without media, over the cell's weeks, as bands over draws. */
export function weeklyContribution(set: DrawSet, g: number, c: number): WeeklyContribution {
  checkCellChannel(set, g, c);
  const cell = set.cells[g]!;
  const T = cell.weeks;
  const D = set.drawCount;
  const contribution = new Float64Array(D * T);
  const baseline = new Float64Array(D * T);
  const buffer = new Float64Array(T);
  for (let d = 0; d < D; d++) {
    contributionSeries(set, d, g, c, cell.spend[c]!, contribution.subarray(d * T, (d + 1) * T), buffer);
    for (let t = 0; t < T; t++) baseline[d * T + t] = baselineAt(set, d, g, t);
  }
  return { contribution: columnBands(contribution, D, T), baseline: columnBands(baseline, D, T) };
}
