import type { RandomSource } from "../rng/random-source";
import type { DrawSet } from "./draw-set";
import { quantileSorted } from "./draw-summary";
import { predictCell, weekColumn } from "./predictive";

export interface PredictiveBands {
  readonly brand: string;
  readonly market: string;
  /** Per week of the cell (training and holdout): observed outcome and replicated-outcome quantiles. */
  readonly observed: Float64Array;
  readonly q05: Float64Array;
  readonly q25: Float64Array;
  readonly q50: Float64Array;
  readonly q75: Float64Array;
  readonly q95: Float64Array;
  /** Weeks fitted (the rest are holdout). */
  readonly trainWeeks: number;
  /** Share of fitted weeks whose observation lies in the 90 % band (about 0.9 when the model fits). */
  readonly coverage90: number;
}

/** Posterior predictive check: bands of replicated outcomes per cell-week. */
export function posteriorPredictiveBands(set: DrawSet, rng: RandomSource): PredictiveBands[] {
  const D = set.drawCount;
  return set.cells.map((cell, g) => {
    const T = cell.weeks;
    const p = predictCell(set, g, cell.spend, 0, T, rng);
    const bands = { q05: new Float64Array(T), q25: new Float64Array(T), q50: new Float64Array(T), q75: new Float64Array(T), q95: new Float64Array(T) };
    let inside = 0;
    for (let t = 0; t < T; t++) {
      const sorted = weekColumn(p.replicated, D, T, t).sort();
      bands.q05[t] = quantileSorted(sorted, 0.05);
      bands.q25[t] = quantileSorted(sorted, 0.25);
      bands.q50[t] = quantileSorted(sorted, 0.5);
      bands.q75[t] = quantileSorted(sorted, 0.75);
      bands.q95[t] = quantileSorted(sorted, 0.95);
      const y = cell.outcome[t]!;
      if (t < cell.trainWeeks && y >= bands.q05[t]! && y <= bands.q95[t]!) inside++;
    }
    return { brand: cell.brand, market: cell.market, observed: Float64Array.from(cell.outcome), ...bands, trainWeeks: cell.trainWeeks, coverage90: inside / cell.trainWeeks };
  });
}
