// The chance that a cell × channel is profitable, computed in the browser from the
// posterior draws of its cost per new customer (model.md, "Decision quantities").

/**
 * The draws sorted ascending, ready for many look-ups (a slider). A null draw has no
 * finite CAC (the channel brought no customers in that draw): it is never below any
 * customer value, so it counts as +∞. NaN draws (no spend) say nothing and are left out.
 */
export function sortedCacDraws(draws: ArrayLike<number | null>): Float64Array {
  const kept: number[] = [];
  for (let i = 0; i < draws.length; i++) {
    const value = draws[i];
    if (value === null || value === undefined) kept.push(Infinity);
    else if (!Number.isNaN(value)) kept.push(value);
  }
  return Float64Array.from(kept).sort();
}

/** Number of sorted values strictly below `limit` (binary search). */
function countBelow(sorted: Float64Array, limit: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid]! < limit) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * P(profitable) at a customer value: the share of draws whose CAC is below what a new
 * customer is worth. Null without draws or without a positive customer value.
 */
export function chanceOfProfitSorted(sorted: Float64Array, customerValue: number): number | null {
  if (sorted.length === 0 || !(Number.isFinite(customerValue) && customerValue > 0)) return null;
  return countBelow(sorted, customerValue) / sorted.length;
}

/** P(profitable) from unsorted draws (one look-up). */
export function chanceOfProfit(draws: ArrayLike<number | null>, customerValue: number): number | null {
  return chanceOfProfitSorted(sortedCacDraws(draws), customerValue);
}

/** The chance of profit at each customer value of a grid, for a curve. */
export function chanceOfProfitCurve(sorted: Float64Array, customerValues: readonly number[]): { customerValue: number; chance: number | null }[] {
  return customerValues.map((customerValue) => ({ customerValue, chance: chanceOfProfitSorted(sorted, customerValue) }));
}
