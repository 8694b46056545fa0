/** Quantiles of a ratio over draws; a draw whose ratio has no finite value counts as +∞. */
export interface RatioInterval {
  readonly q05: number;
  readonly q25: number;
  readonly q50: number;
  readonly q75: number;
  readonly q95: number;
  /** Share of draws whose ratio is unbounded (their extra customers are ≤ 0 for a cost, ≥ 0 for a saving). */
  readonly unboundedShare: number;
}

/**
 * Cost of each extra customer of a change against a reference plan, decided by the sign
 * of the extra spend and the 90 % interval of the extra customers:
 * - "cost": more spend and surely (90 %) more customers: extra spend / extra customers;
 * - "saving-per-customer-lost": less spend and surely fewer customers: spend saved per customer lost;
 * - "more-customers-for-less": no more spend, surely more customers (no price to pay);
 * - "fewer-customers-for-more": no less spend, surely fewer customers;
 * - "undefined": the interval of the extra customers includes 0, so the ratio is unbounded
 *   (any amount, or a change that loses customers) and no number is given.
 */
export type CostPerExtraCustomer =
  | { readonly kind: "cost"; readonly interval: RatioInterval; readonly text: string }
  | { readonly kind: "saving-per-customer-lost"; readonly interval: RatioInterval; readonly text: string }
  | { readonly kind: "more-customers-for-less"; readonly text: string }
  | { readonly kind: "fewer-customers-for-more"; readonly text: string }
  | { readonly kind: "undefined"; readonly text: string };

/** Type-7 quantile that stays exact next to +∞ values (no ∞ · 0). */
function quantileWithInfinity(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const frac = h - lo;
  const a = sorted[lo]!;
  if (frac === 0) return a;
  const b = sorted[Math.min(lo + 1, sorted.length - 1)]!;
  return b === Infinity ? Infinity : a + frac * (b - a);
}

function ratioInterval(extraSpend: number, extraCustomers: Float64Array, sign: 1 | -1): RatioInterval {
  const n = extraCustomers.length;
  const ratio = new Float64Array(n);
  let unbounded = 0;
  for (let d = 0; d < n; d++) {
    const x = extraCustomers[d]! * sign;
    if (x > 0) ratio[d] = (extraSpend * sign) / x;
    else {
      ratio[d] = Infinity;
      unbounded++;
    }
  }
  ratio.sort();
  return {
    q05: quantileWithInfinity(ratio, 0.05),
    q25: quantileWithInfinity(ratio, 0.25),
    q50: quantileWithInfinity(ratio, 0.5),
    q75: quantileWithInfinity(ratio, 0.75),
    q95: quantileWithInfinity(ratio, 0.95),
    unboundedShare: unbounded / n,
  };
}

/** Cost per extra customer from the extra spend (a number) and the extra customers per draw. */
export function costPerExtraCustomer(extraSpend: number, extraCustomers: Float64Array): CostPerExtraCustomer {
  if (!Number.isFinite(extraSpend)) throw new RangeError(`extra spend must be a number, got ${extraSpend}`);
  if (extraCustomers.length === 0) throw new RangeError("cost per extra customer needs at least one draw");
  const sorted = Float64Array.from(extraCustomers).sort();
  const lo = quantileWithInfinity(sorted, 0.05);
  const hi = quantileWithInfinity(sorted, 0.95);
  if (!(lo > 0) && !(hi < 0)) {
    return {
      kind: "undefined",
      text: "The 90 % interval of the extra customers includes 0, so the cost per extra customer is unbounded: the change could cost any amount per customer, or lose customers.",
    };
  }
  if (lo > 0) {
    if (extraSpend > 0) return { kind: "cost", interval: ratioInterval(extraSpend, extraCustomers, 1), text: "Extra spend per extra customer (median and intervals over the posterior draws)." };
    return { kind: "more-customers-for-less", text: "The change brings more customers (90 % interval above 0) for no extra spend." };
  }
  if (extraSpend < 0) return { kind: "saving-per-customer-lost", interval: ratioInterval(extraSpend, extraCustomers, -1), text: "Spend saved per customer lost (median and intervals over the posterior draws)." };
  return { kind: "fewer-customers-for-more", text: "The change loses customers (90 % interval below 0) without saving spend." };
}
