import { quantileSorted } from "./draw-summary";

export interface DrawHistogram {
  /** bins + 1 increasing edges, evenly spaced on the log scale. */
  readonly edges: Float64Array;
  readonly counts: Int32Array;
  /** Draws below the first edge and above the last (the tails beyond the trimmed range). */
  readonly below: number;
  readonly above: number;
  /** Finite positive draws counted (others are left out). */
  readonly total: number;
}

/**
 * Histogram of positive draws (e.g. a CAC) on `bins` log-spaced bins between the
 * `trim` and 1 − `trim` quantiles, so a long tail does not squash the picture; the
 * trimmed tails are counted in `below` and `above`. Non-finite or non-positive draws are left out.
 */
export function logHistogram(values: ArrayLike<number>, bins = 30, trim = 0.005): DrawHistogram {
  if (!Number.isInteger(bins) || bins < 1) throw new RangeError(`bins must be a positive integer, got ${bins}`);
  if (!(trim >= 0 && trim < 0.5)) throw new RangeError(`trim must be in [0, 0.5), got ${trim}`);
  const kept: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v) && v > 0) kept.push(v);
  }
  const sorted = Float64Array.from(kept).sort();
  const counts = new Int32Array(bins);
  if (sorted.length === 0) return { edges: new Float64Array(bins + 1), counts, below: 0, above: 0, total: 0 };
  let lo = Math.log(quantileSorted(sorted, trim));
  let hi = Math.log(quantileSorted(sorted, 1 - trim));
  if (!(hi > lo)) {
    // All draws (nearly) equal: a narrow window around them.
    lo -= 0.01;
    hi += 0.01;
  }
  const width = (hi - lo) / bins;
  const edges = new Float64Array(bins + 1);
  for (let k = 0; k <= bins; k++) edges[k] = Math.exp(lo + k * width);
  let below = 0;
  let above = 0;
  for (const v of sorted) {
    if (v < edges[0]!) below++;
    else if (v > edges[bins]!) above++;
    else counts[Math.min(bins - 1, Math.floor((Math.log(v) - lo) / width))]!++;
  }
  return { edges, counts, below, above, total: sorted.length };
}

/** At most `keep` draws, evenly spaced over all of them (so every chain of a draw set, stored one after another, is represented). */
export function thinDraws(values: Float64Array, keep: number): Float64Array {
  if (!Number.isInteger(keep) || keep < 1) throw new RangeError(`keep must be a positive integer, got ${keep}`);
  if (values.length <= keep) return Float64Array.from(values);
  const out = new Float64Array(keep);
  for (let i = 0; i < keep; i++) out[i] = values[Math.floor((i * values.length) / keep)]!;
  return out;
}
