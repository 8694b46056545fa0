/** Posterior summary of one quantity over draws: mean, sd and the 50 % and 90 % central intervals. */
export interface DrawSummary {
  readonly mean: number;
  readonly sd: number;
  readonly q05: number;
  readonly q25: number;
  readonly q50: number;
  readonly q75: number;
  readonly q95: number;
}

/** Quantile of sorted values, linear interpolation between order statistics (R's type 7, Hyndman & Fan 1996). */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

/** Summarises draws (NaN values make every field NaN; an empty input is an error). */
export function summariseDraws(values: ArrayLike<number>): DrawSummary {
  const n = values.length;
  if (n === 0) throw new RangeError("summariseDraws: no draws");
  const sorted = Float64Array.from(values).sort();
  // Welford's running mean and variance
  let mean = 0;
  let m2 = 0;
  for (let i = 0; i < n; i++) {
    const x = sorted[i]!;
    const d = x - mean;
    mean += d / (i + 1);
    m2 += d * (x - mean);
  }
  return {
    mean,
    sd: n > 1 ? Math.sqrt(m2 / (n - 1)) : 0,
    q05: quantileSorted(sorted, 0.05),
    q25: quantileSorted(sorted, 0.25),
    q50: quantileSorted(sorted, 0.5),
    q75: quantileSorted(sorted, 0.75),
    q95: quantileSorted(sorted, 0.95),
  };
}
