import { averageCacRecent, cacLowSpend, marginalCac } from "./cac";
import type { DrawSet } from "./draw-set";

/** Which CAC is compared with the customer value. */
export type ProfitabilityBasis =
  | { readonly kind: "average-recent"; readonly weeks?: number }
  | { readonly kind: "low-spend" }
  | { readonly kind: "marginal"; readonly weeklySpend: number };

export interface ProfitabilityResult {
  /** Share of draws whose CAC is below the customer value. */
  readonly probability: number;
  /** Plain-words statement of which CAC was used. */
  readonly basis: string;
  readonly note: string;
}

/**
 * P(profitable): the share of posterior draws whose CAC is below the value of a new
 * customer. By default the CAC is the average over the last 13 fitted weeks.
 */
export function probabilityProfitable(
  set: DrawSet,
  g: number,
  c: number,
  customerValue: number,
  basis: ProfitabilityBasis = { kind: "average-recent", weeks: 13 },
): ProfitabilityResult {
  if (!(Number.isFinite(customerValue) && customerValue > 0)) throw new RangeError(`customer value must be a positive number, got ${customerValue}`);
  let cac: Float64Array;
  let label: string;
  if (basis.kind === "average-recent") {
    const weeks = basis.weeks ?? 13;
    if (!Number.isInteger(weeks) || weeks < 1) throw new RangeError(`weeks must be a positive integer, got ${weeks}`);
    cac = averageCacRecent(set, g, c, weeks);
    label = `average CAC over the last ${weeks} fitted weeks`;
  } else if (basis.kind === "low-spend") {
    cac = cacLowSpend(set, g, c);
    label = "low-spend CAC (1/β)";
  } else {
    cac = marginalCac(set, g, c, basis.weeklySpend);
    label = `marginal CAC at a weekly spend of ${basis.weeklySpend}`;
  }
  let below = 0;
  let counted = 0;
  for (let d = 0; d < cac.length; d++) {
    const v = cac[d]!;
    if (Number.isNaN(v)) continue;
    counted++;
    if (v < customerValue) below++;
  }
  if (counted === 0) throw new RangeError(`${label} is undefined: the channel has no spend in that window`);
  return {
    probability: below / counted,
    basis: label,
    note: "Model-based estimate; confirm profitability with a controlled experiment (a lift test) before moving budget.",
  };
}
