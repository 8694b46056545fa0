import type { CostPerExtraCustomer } from "@tributary/stats";
import { formatMoney, formatNumber } from "../../../lib/format";

type Cost = Pick<CostPerExtraCustomer, "kind" | "text"> & { interval?: { q05: number | null; q50: number | null; q95: number | null } | null };

const money = (value: number | null, currency: string) => (value === null || !Number.isFinite(value) ? "no upper limit" : formatMoney(value, currency));

/**
 * The cost per extra customer of a change, in words where no number makes sense: a change
 * whose extra customers may be zero or negative has no cost per extra customer.
 */
export function extraCustomerCostText(cost: Cost, currency: string): { headline: string; detail: string } {
  const interval = "interval" in cost && cost.interval ? cost.interval : null;
  switch (cost.kind) {
    case "cost":
      return {
        headline: `${money(interval?.q50 ?? null, currency)} per extra customer`,
        detail: `90 % interval ${money(interval?.q05 ?? null, currency)} to ${money(interval?.q95 ?? null, currency)}`,
      };
    case "saving-per-customer-lost":
      return {
        headline: `Saves ${money(interval?.q50 ?? null, currency)} per customer lost`,
        detail: `90 % interval ${money(interval?.q05 ?? null, currency)} to ${money(interval?.q95 ?? null, currency)}`,
      };
    case "more-customers-for-less":
      return { headline: "More customers for no extra spend", detail: "The extra customers are above 0 in the 90 % interval and the spend does not rise." };
    case "fewer-customers-for-more":
      return { headline: "Fewer customers for no saving", detail: "The change loses customers (90 % interval below 0) without saving spend." };
    case "undefined":
      return {
        headline: "Not defined",
        detail: "The 90 % interval of the extra customers includes 0: the change may bring no extra customers at all, so no cost per extra customer can be given.",
      };
  }
}
