/** The five quantiles a prior check reports: 90 % and 50 % central intervals and the median. */
export interface PriorQuantiles {
  readonly q05: number;
  readonly q25: number;
  readonly q50: number;
  readonly q75: number;
  readonly q95: number;
}

export interface PriorCheckSettings {
  /** Number of joint draws from the priors (default 200). */
  readonly draws?: number;
  /** Seed of the generator (default 1); the same seed gives the same result. */
  readonly seed?: number;
  /** "pooled" (default): log β = μ + τ·z per level; "unpooled": log β[g,c] drawn from the prior of μ_c per cell. */
  readonly structure?: "pooled" | "unpooled";
  /** Scale of the HalfNormal prior of every τ (default 0.5, the reference model); 0 holds the τ's at zero. */
  readonly tauPriorScale?: number;
}

/** What the priors alone say about one channel's low-spend cost per new customer, over every cell that spends on it. */
export interface ChannelPriorCheck {
  readonly channel: string;
  /** The analyst's plausible range behind the prior of μ_c (a 90 % interval). */
  readonly cacRange: readonly [number, number];
  /** Quantiles of CAC0[g,c] = 1/β[g,c] over draws and cells with spend on the channel. */
  readonly cac0: PriorQuantiles;
  /** Cells with spend on the channel (0: the channel is nowhere in the data; cac0 is then over all cells). */
  readonly cellsWithSpend: number;
}

/** Weekly bands of the prior predictive outcome of one cell, one entry per week. */
export interface PriorPredictiveBands {
  readonly q05: number[];
  readonly q25: number[];
  readonly q50: number[];
  readonly q75: number[];
  readonly q95: number[];
}

export interface CellPriorCheck {
  readonly brand: string;
  readonly market: string;
  /** ISO Monday of the cell's first week. */
  readonly firstWeek: string;
  readonly weeks: number;
  /** Weeks in the fit (the rest are held out). */
  readonly trainWeeks: number;
  readonly observed: number[];
  readonly bands: PriorPredictiveBands;
  /** Quantiles of the replicated weekly outcome over all weeks and draws. */
  readonly outcome: PriorQuantiles;
  readonly observedMin: number;
  readonly observedMax: number;
  /** Share of replicated weeks with an outcome below zero, which no real week can have. */
  readonly belowZeroShare: number;
  /** Quantiles over draws of Σ media contributions / Σ observed outcome over the fitted weeks. */
  readonly mediaShare: PriorQuantiles;
  /** Per channel with spend in this cell: quantiles of CAC0 over draws. */
  readonly cac0: readonly { readonly channel: string; readonly quantiles: PriorQuantiles }[];
}

export interface PriorCheckResult {
  readonly draws: number;
  readonly seed: number;
  readonly structure: "pooled" | "unpooled";
  readonly channels: readonly ChannelPriorCheck[];
  readonly cells: readonly CellPriorCheck[];
}
