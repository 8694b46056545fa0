import type { RandomSource } from "../rng/random-source";
import { drawGamma } from "../simulate/random-draws";
import type { DrawSet } from "./draw-set";
import { baselineAt, contributionSeries } from "./media-contribution";

/** One draw of the likelihood's noise: Normal(0, σ), or σ·t_ν for the Student-t option. */
export function drawNoise(rng: RandomSource, sigma: number, nu: number): number {
  const z = rng.normal();
  if (!Number.isFinite(nu)) return sigma * z;
  return (sigma * z) / Math.sqrt((2 * drawGamma(rng, nu / 2)) / nu);
}

export interface CellPrediction {
  /** Weeks predicted: fromWeek .. fromWeek + length − 1 (0-based weeks of the cell). */
  readonly fromWeek: number;
  readonly length: number;
  /** Mean outcome per draw × week (row-major by draw). */
  readonly mean: Float64Array;
  /** Replicated outcome (mean + noise) per draw × week. */
  readonly replicated: Float64Array;
  /** Baseline without media per draw × week. */
  readonly baseline: Float64Array;
  /** Contribution per channel: [c] → per draw × week. */
  readonly contribution: readonly Float64Array[];
}

/**
 * Posterior predictive of a cell over weeks [fromWeek, fromWeek + length) given spend
 * per channel for weeks 0 .. fromWeek + length − 1 (history then plan), so that
 * contributions carry over from the recent weeks.
 */
export function predictCell(
  set: DrawSet,
  g: number,
  spend: readonly Float64Array[],
  fromWeek: number,
  length: number,
  rng: RandomSource,
): CellPrediction {
  const C = set.channels.length;
  const G = set.cells.length;
  const D = set.drawCount;
  const horizon = fromWeek + length;
  if (spend.length !== C) throw new RangeError(`spend is needed for each of the ${C} channels`);
  for (const s of spend) if (s.length < horizon) throw new RangeError(`spend series must cover weeks 0..${horizon - 1}`);
  const mean = new Float64Array(D * length);
  const replicated = new Float64Array(D * length);
  const baseline = new Float64Array(D * length);
  const contribution = Array.from({ length: C }, () => new Float64Array(D * length));
  const series = new Float64Array(horizon);
  const buffer = new Float64Array(horizon);
  for (let d = 0; d < D; d++) {
    for (let h = 0; h < length; h++) {
      const b = baselineAt(set, d, g, fromWeek + h);
      baseline[d * length + h] = b;
      mean[d * length + h] = b;
    }
    for (let c = 0; c < C; c++) {
      contributionSeries(set, d, g, c, spend[c]!.subarray(0, horizon), series, buffer);
      const out = contribution[c]!;
      for (let h = 0; h < length; h++) {
        const v = series[fromWeek + h]!;
        out[d * length + h] = v;
        mean[d * length + h] = mean[d * length + h]! + v;
      }
    }
    const sigma = set.sigma[d * G + g]!;
    const nu = set.nu[d * G + g]!;
    for (let h = 0; h < length; h++) replicated[d * length + h] = mean[d * length + h]! + drawNoise(rng, sigma, nu);
  }
  return { fromWeek, length, mean, replicated, baseline, contribution };
}

/** Column h of a draw × week matrix. */
export function weekColumn(matrix: Float64Array, drawCount: number, length: number, h: number): Float64Array {
  const out = new Float64Array(drawCount);
  for (let d = 0; d < drawCount; d++) out[d] = matrix[d * length + h]!;
  return out;
}
