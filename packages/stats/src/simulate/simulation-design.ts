/**
 * Input and output of `simulatePortfolio`: weekly data generated from the portfolio
 * model with known parameters, for the demo portfolio, parameter-recovery tests and
 * benchmarks.
 */
export interface SimulatedCellDesign {
  readonly brand: string;
  readonly market: string;
  /** ISO date of the Monday of the first week. */
  readonly firstWeek: string;
  readonly weeks: number;
  /** Typical weekly spend per channel (same order as `channels`); 0 = channel not used. */
  readonly typicalSpend: readonly number[];
  /** Mean weekly outcome with no advertising. */
  readonly baseline: number;
}

export interface SimulationDesign {
  readonly channels: readonly string[];
  readonly cells: readonly SimulatedCellDesign[];
  /** Maximum adstock lag L (default 8). */
  readonly maxLag?: number;
  /** Seasonality order J (default 2). */
  readonly seasonalityOrder?: number;
}

/** True values of the model's parameters (names as in the model specification). */
export interface ChannelTruth {
  readonly channel: string;
  readonly mu: number;
  readonly tauBrand: number;
  readonly tauMarket: number;
  readonly tauCell: number;
  readonly alpha: number;
  readonly lambda: number;
}

export interface CellTruth {
  readonly brand: string;
  readonly market: string;
  readonly beta0: number;
  readonly beta1: number;
  readonly gamma: readonly number[];
  readonly delta: readonly number[];
  readonly sigma: number;
  /** Per channel: customers per currency unit at low spend. */
  readonly beta: readonly number[];
  /** Per channel: 1 / beta, the low-spend cost per new customer. */
  readonly cac0: readonly number[];
}

export interface PortfolioTruth {
  readonly channels: readonly ChannelTruth[];
  readonly cells: readonly CellTruth[];
}
