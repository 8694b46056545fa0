export { priorCheck, DEFAULT_PRIOR_CHECK_DRAWS } from "./prior-check";
export type { PriorCheckModelOptions } from "./prior-check";
export type {
  PriorQuantiles,
  PriorCheckSettings,
  ChannelPriorCheck,
  PriorPredictiveBands,
  CellPriorCheck,
  PriorCheckResult,
} from "./prior-check-types";
