/** Median of the values (NaN for none). Sorts a copy. */
export function median(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return Number.NaN;
  const sorted = Float64Array.from(values).sort();
  const mid = n >> 1;
  return n % 2 === 1 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

/**
 * Robust scale of the values around their median, in standard-deviation units for normal
 * data: MAD / 0.6745 (Iglewicz & Hoaglin 1993, modified z-score), or, when the MAD is 0,
 * 1.253314 × mean absolute deviation (common practice); 0 when every value is the median.
 */
export function robustScale(values: ArrayLike<number>, center: number): number {
  const n = values.length;
  if (n === 0) return 0;
  const deviations = new Float64Array(n);
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const d = Math.abs((values[i] as number) - center);
    deviations[i] = d;
    sum += d;
  }
  const mad = median(deviations);
  if (mad > 0) return mad / 0.6745;
  return (1.253314 * sum) / n;
}
