import type { PriorQuantiles } from "./prior-check-types";

/**
 * Puts the k-th smallest of values[lo..hi] at position k, smaller ones before it and larger
 * ones after (Hoare's FIND, CACM 4(7), 1961, with a median-of-three pivot). In place, O(n) on average.
 */
function selectInPlace(values: Float64Array, k: number, lo: number, hi: number): void {
  while (hi > lo) {
    const mid = (lo + hi) >>> 1;
    // median of three as the pivot, moved to values[mid]
    if (values[mid]! < values[lo]!) swap(values, mid, lo);
    if (values[hi]! < values[lo]!) swap(values, hi, lo);
    if (values[hi]! < values[mid]!) swap(values, hi, mid);
    const pivot = values[mid]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (values[i]! < pivot) i++;
      while (values[j]! > pivot) j--;
      if (i <= j) {
        swap(values, i, j);
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return;
  }
}

function swap(values: Float64Array, a: number, b: number): void {
  const t = values[a]!;
  values[a] = values[b]!;
  values[b] = t;
}

const probabilities = [0.05, 0.25, 0.5, 0.75, 0.95] as const;

/**
 * The 5 %, 25 %, 50 %, 75 % and 95 % sample quantiles (R's type 7, as `quantileSorted`)
 * of values[0..n), found by selection instead of a full sort. Reorders the values; NaNs
 * must not be present.
 */
export function selectQuantiles(values: Float64Array, n = values.length): PriorQuantiles {
  const out = [0, 0, 0, 0, 0];
  if (n === 0) return { q05: Number.NaN, q25: Number.NaN, q50: Number.NaN, q75: Number.NaN, q95: Number.NaN };
  let from = 0;
  probabilities.forEach((p, i) => {
    const index = (n - 1) * p;
    const k = Math.floor(index);
    // Each selection leaves everything from k on at or above values[k], so the next one starts there.
    selectInPlace(values, k, from, n - 1);
    from = k;
    const low = values[k]!;
    const h = index - k;
    if (h === 0 || k + 1 >= n) {
      out[i] = low;
      return;
    }
    let next = Infinity;
    for (let j = k + 1; j < n; j++) if (values[j]! < next) next = values[j]!;
    out[i] = (1 - h) * low + h * next;
  });
  return { q05: out[0]!, q25: out[1]!, q50: out[2]!, q75: out[3]!, q95: out[4]! };
}
