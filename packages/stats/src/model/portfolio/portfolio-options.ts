import type { SaturationKind } from "../saturation";

/**
 * A lift test: a controlled experiment on one channel in one cell. Its measured
 * incremental outcome enters the likelihood as
 *   measured ~ Normal(model-implied incremental outcome, standardError),
 * where the model-implied value is Σ over the test weeks of β·r(a) with the observed
 * spend minus the same with the channel's spend set to zero in the test weeks (the
 * adstock carries spend from before the window in both, and carry-over inside it).
 */
export interface LiftTest {
  readonly brand: string;
  readonly market: string;
  readonly channel: string;
  /** ISO Monday of the first test week (inclusive). */
  readonly firstWeek: string;
  /** ISO Monday of the last test week (inclusive). */
  readonly lastWeek: string;
  /** Spend on the channel during the test, as reported by the experiment (must be > 0; kept for reports). */
  readonly spend: number;
  /** Measured incremental outcome over the test weeks. */
  readonly incrementalOutcome: number;
  /** Standard error of the measured incremental outcome (> 0). */
  readonly standardError: number;
}

/** Which levels of the crossed pooling are on; the cell level is always on. */
export type PoolingLevels = "crossed" | "brand" | "market" | "cell-only";

export type LikelihoodKind = "normal" | "student-t";

/** Guide of the cell level's sampling: per cell × channel (row-major) a mean and sd of log β. */
export interface CellEffectGuide {
  readonly mean: readonly number[];
  readonly sd: readonly number[];
}

/**
 * Plain-data options of the portfolio model; every field is optional and defaults to the
 * reference model of model.md. Extensions and how they enter the density:
 * - Control columns (data.controls): each is centred and divided by its standard deviation
 *   over the cell's fitted weeks (1 if constant), and enters the mean as κ[g,k]·x̃ with
 *   κ[g,k] ~ Normal(0, s_g): one coefficient per cell and control, on the outcome's own scale
 *   per standard deviation of the control, like the baseline coefficients.
 * - Holdout: the last k weeks of every cell are left out of the likelihood; every data
 *   constant and centring (ȳ, s, x̄, trend centre, seasonal and media means) uses the fitted
 *   weeks only, so the fit is exactly the reference model on the shortened cells; spend in
 *   the holdout weeks still feeds their forecast (and lift tests placed there).
 * - Student-t likelihood: y ~ Student-t(ν, mean, σ_g) with one ν ~ Gamma(2, 0.1) for the portfolio.
 * - Lift tests: see LiftTest.
 */
export interface PortfolioModelOptions {
  /** Maximum adstock lag L (default 8). */
  readonly maxLag?: number;
  readonly saturation?: SaturationKind;
  readonly likelihood?: LikelihoodKind;
  /** Number of Fourier pairs J (default 2). */
  readonly seasonalityOrder?: number;
  /** Plausible low-spend CAC per channel name, read as a 90 % interval (default [5, 2000]). */
  readonly cacRange?: Readonly<Record<string, readonly [number, number]>>;
  readonly pooling?: PoolingLevels;
  /** The last k weeks of every cell are left out of the likelihood and forecast (default 0). */
  readonly holdoutWeeks?: number;
  readonly liftTests?: readonly LiftTest[];
  /**
   * Sampler geometry only (the posterior is the same either way): how the cell level
   * log β[g,c] ~ Normal(group, τG) is moved. "least-squares" (default) guides each cell
   * effect by a per-cell least-squares estimate of log β and its standard error, at the
   * adstock and saturation (α, λ per channel) that fit the portfolio best;
   * "none" samples it non-centred, exactly as written in model.md; or give the guide
   * (mean and sd of log β per cell × channel, row-major; sd Infinity = non-centred).
   */
  readonly cellEffectGuide?: "least-squares" | "none" | CellEffectGuide;
  /**
   * Per cell, the centre ȳ_g and scale s_g of the baseline priors (β0 ~ Normal(ȳ, s),
   * β1 ~ Normal(0, s), γ, δ ~ Normal(0, s/2), σ ~ HalfNormal(s), controls ~ Normal(0, s)).
   * Default, as in model.md: the mean and standard deviation of the cell's fitted outcomes.
   * Fixed values make the prior independent of the outcomes (simulation-based calibration).
   */
  readonly baselinePriorScale?: { readonly centre: readonly number[]; readonly scale: readonly number[] };
}

export interface ResolvedPortfolioOptions {
  readonly maxLag: number;
  readonly saturation: SaturationKind;
  readonly likelihood: LikelihoodKind;
  readonly seasonalityOrder: number;
  /** Per channel, in the data's channel order. */
  readonly cacRange: readonly (readonly [number, number])[];
  readonly pooling: PoolingLevels;
  readonly holdoutWeeks: number;
  readonly liftTests: readonly LiftTest[];
  readonly cellEffectGuide: "least-squares" | "none" | CellEffectGuide;
  readonly baselinePriorScale: { readonly centre: readonly number[]; readonly scale: readonly number[] } | undefined;
}

export const DEFAULT_CAC_RANGE: readonly [number, number] = [5, 2000];

/** Checks the options against the channel list and fills in the defaults; throws a RangeError naming the problem. */
export function resolvePortfolioOptions(channels: readonly string[], options: PortfolioModelOptions = {}): ResolvedPortfolioOptions {
  const maxLag = options.maxLag ?? 8;
  if (!Number.isInteger(maxLag) || maxLag < 1 || maxLag > 52) throw new RangeError(`maxLag must be an integer from 1 to 52, got ${maxLag}`);
  const saturation = options.saturation ?? "exponential";
  if (saturation !== "exponential" && saturation !== "hill") throw new RangeError(`saturation must be "exponential" or "hill", got "${String(saturation)}"`);
  const likelihood = options.likelihood ?? "normal";
  if (likelihood !== "normal" && likelihood !== "student-t") throw new RangeError(`likelihood must be "normal" or "student-t", got "${String(likelihood)}"`);
  const seasonalityOrder = options.seasonalityOrder ?? 2;
  if (!Number.isInteger(seasonalityOrder) || seasonalityOrder < 0 || seasonalityOrder > 10) {
    throw new RangeError(`seasonalityOrder must be an integer from 0 to 10, got ${seasonalityOrder}`);
  }
  const pooling = options.pooling ?? "crossed";
  if (!["crossed", "brand", "market", "cell-only"].includes(pooling)) {
    throw new RangeError(`pooling must be "crossed", "brand", "market" or "cell-only", got "${String(pooling)}"`);
  }
  const holdoutWeeks = options.holdoutWeeks ?? 0;
  if (!Number.isInteger(holdoutWeeks) || holdoutWeeks < 0) throw new RangeError(`holdoutWeeks must be a non-negative integer, got ${holdoutWeeks}`);
  const ranges = options.cacRange ?? {};
  for (const name of Object.keys(ranges)) {
    if (!channels.includes(name)) throw new RangeError(`cacRange names channel "${name}", which is not in the data`);
  }
  const cacRange = channels.map((channel) => {
    const range = ranges[channel] ?? DEFAULT_CAC_RANGE;
    const [lo, hi] = range;
    if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo > 0 && hi > lo)) {
      throw new RangeError(`cacRange for "${channel}" must be [lo, hi] with 0 < lo < hi, got [${lo}, ${hi}]`);
    }
    return [lo, hi] as const;
  });
  const cellEffectGuide = options.cellEffectGuide ?? "least-squares";
  if (typeof cellEffectGuide === "object") {
    const { mean, sd } = cellEffectGuide;
    if (!Array.isArray(mean) || !Array.isArray(sd) || mean.length !== sd.length) throw new RangeError("cellEffectGuide needs mean and sd arrays of equal length");
    if (mean.some((m) => !Number.isFinite(m)) || sd.some((v) => !(v > 0))) throw new RangeError("cellEffectGuide: means must be finite and sds positive (Infinity allowed)");
  } else if (cellEffectGuide !== "least-squares" && cellEffectGuide !== "none") {
    throw new RangeError(`cellEffectGuide must be "least-squares", "none" or { mean, sd }, got "${String(cellEffectGuide)}"`);
  }
  const baselinePriorScale = options.baselinePriorScale;
  if (baselinePriorScale !== undefined) {
    const { centre, scale } = baselinePriorScale;
    if (!Array.isArray(centre) || !Array.isArray(scale) || centre.length !== scale.length) throw new RangeError("baselinePriorScale needs centre and scale arrays, one value per cell");
    if (centre.some((v) => !Number.isFinite(v)) || scale.some((v) => !(Number.isFinite(v) && v > 0))) throw new RangeError("baselinePriorScale: centres must be finite and scales positive");
  }
  return { maxLag, saturation, likelihood, seasonalityOrder, cacRange, pooling, holdoutWeeks, liftTests: options.liftTests ?? [], cellEffectGuide, baselinePriorScale };
}

/** Mean and sd of the prior of μ_c = log β from the CAC range [lo, hi] read as a 90 % interval. */
export function channelEffectPrior(range: readonly [number, number]): { readonly mean: number; readonly sd: number } {
  const [lo, hi] = range;
  return { mean: -Math.log(Math.sqrt(lo * hi)), sd: (Math.log(hi) - Math.log(lo)) / 3.29 };
}
