import type { RandomSource } from "../rng/random-source";
import type { DrawSet } from "./draw-set";
import { predictCell, weekColumn } from "./predictive";

/**
 * CRPS of a forecast given by samples x for the observation y, by the sample estimator
 * E|X − y| − ½·E|X − X′| (Gneiting & Raftery 2007, JASA 102, eq. 21); E|X − X′| over all
 * ordered pairs, computed from the sorted sample in O(m log m).
 */
export function crpsSample(samples: ArrayLike<number>, y: number): number {
  const m = samples.length;
  if (m === 0) throw new RangeError("crpsSample: no samples");
  const sorted = Float64Array.from(samples).sort();
  let absError = 0;
  let pairs = 0;
  for (let i = 0; i < m; i++) {
    absError += Math.abs(sorted[i]! - y);
    pairs += sorted[i]! * (2 * (i + 1) - m - 1);
  }
  return absError / m - pairs / (m * m);
}

export interface CellHoldoutAccuracy {
  readonly brand: string;
  readonly market: string;
  readonly weeks: number;
  /** Mean CRPS over the holdout weeks, in outcome units. */
  readonly crps: number;
  /** Mean absolute percentage error of the predictive mean, in percent (weeks with y = 0 skipped). */
  readonly mape: number;
  /** Share of holdout weeks inside the 90 % predictive interval. */
  readonly coverage90: number;
}

export interface HoldoutAccuracy {
  readonly cells: readonly CellHoldoutAccuracy[];
  /** Averages over every holdout week of every cell. */
  readonly crps: number;
  readonly mape: number;
  readonly coverage90: number;
}

/** Forecast accuracy on the weeks left out of the fit (observed spend and controls used). */
export function holdoutAccuracy(set: DrawSet, rng: RandomSource): HoldoutAccuracy {
  const D = set.drawCount;
  const cells: CellHoldoutAccuracy[] = [];
  let crpsSum = 0;
  let apeSum = 0;
  let apeCount = 0;
  let inside = 0;
  let weeksTotal = 0;
  set.cells.forEach((cell, g) => {
    const k = cell.weeks - cell.trainWeeks;
    if (k === 0) return;
    const p = predictCell(set, g, cell.spend, cell.trainWeeks, k, rng);
    let cellCrps = 0;
    let cellApe = 0;
    let cellApeCount = 0;
    let cellInside = 0;
    for (let h = 0; h < k; h++) {
      const y = cell.outcome[cell.trainWeeks + h]!;
      const draws = weekColumn(p.replicated, D, k, h);
      cellCrps += crpsSample(draws, y);
      let mean = 0;
      for (let d = 0; d < D; d++) mean += draws[d]!;
      mean /= D;
      if (y !== 0) {
        cellApe += Math.abs((y - mean) / y);
        cellApeCount++;
      }
      const sorted = draws.sort();
      const lo = sorted[Math.floor(0.05 * (D - 1))]!;
      const hi = sorted[Math.ceil(0.95 * (D - 1))]!;
      if (y >= lo && y <= hi) cellInside++;
    }
    cells.push({
      brand: cell.brand,
      market: cell.market,
      weeks: k,
      crps: cellCrps / k,
      mape: cellApeCount > 0 ? (100 * cellApe) / cellApeCount : NaN,
      coverage90: cellInside / k,
    });
    crpsSum += cellCrps;
    apeSum += cellApe;
    apeCount += cellApeCount;
    inside += cellInside;
    weeksTotal += k;
  });
  if (weeksTotal === 0) throw new RangeError("this run has no holdout weeks; fit with holdoutWeeks > 0 to measure forecast accuracy");
  return { cells, crps: crpsSum / weeksTotal, mape: apeCount > 0 ? (100 * apeSum) / apeCount : NaN, coverage90: inside / weeksTotal };
}
