import { adstockGeometricUnchecked } from "../model/adstock";
import { cellChannelAt, checkCellChannel, type DrawSet } from "./draw-set";
import { contributionSeries } from "./media-contribution";

/** Low-spend cost per new customer, CAC0 = 1/β, per draw. */
export function cacLowSpend(set: DrawSet, g: number, c: number): Float64Array {
  checkCellChannel(set, g, c);
  const out = new Float64Array(set.drawCount);
  for (let d = 0; d < set.drawCount; d++) out[d] = 1 / set.beta[cellChannelAt(set, d, g, c)]!;
  return out;
}

/**
 * Average CAC over weeks [fromWeek, toWeek] (0-based, inclusive) of the cell's data, per
 * draw: Σ spend / Σ contribution, where the contribution carries over spend from before
 * the window. Infinite when the window has spend but no contribution; NaN without spend.
 */
export function averageCac(set: DrawSet, g: number, c: number, fromWeek: number, toWeek: number): Float64Array {
  checkCellChannel(set, g, c);
  const cell = set.cells[g]!;
  if (!Number.isInteger(fromWeek) || !Number.isInteger(toWeek) || fromWeek < 0 || toWeek >= cell.weeks || toWeek < fromWeek) {
    throw new RangeError(`average CAC window must be weeks within 0..${cell.weeks - 1}, got ${fromWeek}..${toWeek}`);
  }
  const spend = cell.spend[c]!.subarray(0, toWeek + 1);
  let spent = 0;
  for (let t = fromWeek; t <= toWeek; t++) spent += spend[t]!;
  const contribution = new Float64Array(spend.length);
  const buffer = new Float64Array(spend.length);
  const out = new Float64Array(set.drawCount);
  for (let d = 0; d < set.drawCount; d++) {
    contributionSeries(set, d, g, c, spend, contribution, buffer);
    let gained = 0;
    for (let t = fromWeek; t <= toWeek; t++) gained += contribution[t]!;
    out[d] = spent > 0 ? spent / gained : NaN;
  }
  return out;
}

/** Average CAC over the last `weeks` weeks of the fitted data (13 by default), per draw. */
export function averageCacRecent(set: DrawSet, g: number, c: number, weeks = 13): Float64Array {
  const train = set.cells[g]?.trainWeeks ?? 0;
  return averageCac(set, g, c, Math.max(0, train - weeks), train - 1);
}

/**
 * Marginal CAC at a constant weekly spend s (steady state), per draw: 1 / (β·r′(s)),
 * which is exp(s/θ)/β for the exponential form.
 */
export function marginalCac(set: DrawSet, g: number, c: number, weeklySpend: number): Float64Array {
  checkCellChannel(set, g, c);
  if (!(Number.isFinite(weeklySpend) && weeklySpend >= 0)) throw new RangeError(`weekly spend must be ≥ 0, got ${weeklySpend}`);
  const out = new Float64Array(set.drawCount);
  for (let d = 0; d < set.drawCount; d++) {
    const at = cellChannelAt(set, d, g, c);
    const beta = set.beta[at]!;
    const theta = set.theta[at]!;
    if (set.saturation === "exponential") out[d] = Math.exp(weeklySpend / theta) / beta;
    else {
      const k = set.hillShape[at]!;
      const ratio = weeklySpend / theta;
      const u = Math.pow(ratio, k);
      const slope = weeklySpend > 0 ? (k * Math.pow(ratio, k - 1)) / ((1 + u) * (1 + u)) : k === 1 ? 1 : k > 1 ? 0 : Infinity;
      out[d] = 1 / (beta * slope);
    }
  }
  return out;
}

/** Adstock of a spend series under a draw's α (exposed for reports that show carry-over). */
export function adstockForDraw(set: DrawSet, d: number, g: number, c: number, spend: Float64Array): Float64Array {
  checkCellChannel(set, g, c);
  const out = new Float64Array(spend.length);
  adstockGeometricUnchecked(spend, spend.length, set.alpha[cellChannelAt(set, d, g, c)]!, set.maxLag, out, undefined);
  return out;
}
