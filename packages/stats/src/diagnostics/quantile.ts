/** Sample quantile of sorted values, R's type 7 (linear interpolation; Hyndman & Fan 1996). */
export function quantileSorted(sorted: ArrayLike<number>, probability: number): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  if (!(probability >= 0 && probability <= 1)) throw new Error(`probability must be in [0, 1], got ${String(probability)}`);
  const index = (n - 1) * probability;
  const lo = Math.floor(index);
  const hi = Math.ceil(index);
  const low = sorted[lo]!;
  const h = index - lo;
  if (h === 0 || sorted[hi] === low) return low;
  return (1 - h) * low + h * sorted[hi]!;
}

export function sortedCopy(values: ArrayLike<number>): Float64Array {
  return Float64Array.from(values).sort();
}

export function quantile(values: ArrayLike<number>, probability: number): number {
  return quantileSorted(sortedCopy(values), probability);
}
