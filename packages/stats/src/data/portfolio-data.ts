/**
 * A portfolio's weekly series, as the model takes them: one entry per brand × market
 * cell, all cells sharing one channel list and one control list. Weeks inside a cell
 * are consecutive; cells may start on different Mondays and have different lengths.
 */
export interface CellSeries {
  readonly brand: string;
  readonly market: string;
  /** ISO date (YYYY-MM-DD) of the Monday of the cell's first week. */
  readonly firstWeek: string;
  /** Outcome per week (e.g. new customers), length T. */
  readonly outcome: Float64Array;
  /** Spend per channel per week: spend[c][t], each of length T, in the reporting currency. */
  readonly spend: readonly Float64Array[];
  /** Control columns per week: controls[k][t]; empty when there are none. */
  readonly controls: readonly Float64Array[];
}

export interface PortfolioData {
  readonly channels: readonly string[];
  readonly controls: readonly string[];
  readonly cells: readonly CellSeries[];
}
