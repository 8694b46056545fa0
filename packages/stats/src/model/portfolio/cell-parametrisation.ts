import { adstockGeometricUnchecked } from "../adstock";
import type { PortfolioConstants } from "./portfolio-constants";

/**
 * The data guide of the cell effects (see ParameterLayout): per cell × channel a rough
 * estimate m̂ of log β and its standard error ŝ from the cell's own least-squares fit at
 * per-channel adstock and saturation (α, λ), and how m̂ moves with α and λ, so that the
 * guide can follow the sampler's α and λ. Used only to shape the sampler's coordinates;
 * the posterior does not depend on it.
 */
export interface CellEffectGuideFit {
  /** log β̂ per cell × channel at (alpha, lambda); 0 where sd is Infinity. */
  readonly mean: Float64Array;
  /**
   * The guide's sd of log β: √(ŝ² + GUIDE_VARIANCE_FLOOR) with ŝ = se(β̂)/β̂; Infinity for
   * channels without spend, t < 1 and fits that fail.
   */
  readonly sd: Float64Array;
  /** Per channel, the α and λ the estimates are taken at. */
  readonly alpha: Float64Array;
  readonly lambda: Float64Array;
  /** ∂ mean[g,c′] / ∂ logit α_c at index (g·C + c′)·C + c (0 where sd is Infinity). */
  readonly meanSlopeAlpha: Float64Array;
  /** ∂ mean[g,c′] / ∂ log λ_c at index (g·C + c′)·C + c (0 where sd is Infinity). */
  readonly meanSlopeLambda: Float64Array;
}

/**
 * The guide at the α and λ per channel that fit the portfolio best (`guideSaturation`),
 * with the slopes of each estimate in logit α and log λ by central differences.
 */
export function fitCellEffectGuide(constants: PortfolioConstants): CellEffectGuideFit {
  const C = constants.channelCount;
  const G = constants.cellCount;
  const fits = new CellMediaFits(constants);
  const { alpha, lambda } = guideSaturation(constants, fits);
  const at = cellEffectEstimates(constants, alpha, lambda, fits);
  const meanSlopeAlpha = new Float64Array(G * C * C);
  const meanSlopeLambda = new Float64Array(G * C * C);
  const h = 1e-4;
  const logit = (a: number): number => Math.log(a / (1 - a));
  const logistic = (x: number): number => 1 / (1 + Math.exp(-x));
  for (let c = 0; c < C; c++) {
    for (const which of ["alpha", "lambda"] as const) {
      const up = { alpha: alpha.slice(), lambda: lambda.slice() };
      const down = { alpha: alpha.slice(), lambda: lambda.slice() };
      if (which === "alpha") {
        up.alpha[c] = logistic(logit(alpha[c]!) + h);
        down.alpha[c] = logistic(logit(alpha[c]!) - h);
      } else {
        up.lambda[c] = lambda[c]! * Math.exp(h);
        down.lambda[c] = lambda[c]! * Math.exp(-h);
      }
      const plus = cellEffectEstimates(constants, up.alpha, up.lambda, fits);
      const minus = cellEffectEstimates(constants, down.alpha, down.lambda, fits);
      const slope = which === "alpha" ? meanSlopeAlpha : meanSlopeLambda;
      for (let i = 0; i < G * C; i++) {
        if (at.sd[i] === Infinity || plus.sd[i] === Infinity || minus.sd[i] === Infinity) continue;
        const s = (plus.mean[i]! - minus.mean[i]!) / (2 * h);
        if (Number.isFinite(s)) slope[i * C + c] = s;
      }
    }
  }
  const sd = at.sd.map((s) => Math.sqrt(s * s + GUIDE_VARIANCE_FLOOR));
  return { mean: at.mean, sd, alpha, lambda, meanSlopeAlpha, meanSlopeLambda };
}

/**
 * Variance added to every least-squares ŝ² before it guides the sampler (sd at least
 * √0.1 ≈ 0.32 on log β). ŝ holds the baseline, α and λ fixed, so a long cell's guide can be
 * far narrower than where its log β moves (on the example portfolio, strong cells' posterior
 * sd was about twice ŝ). The recorded divergent trajectories (bench/model-divergences.ts) ran
 * along the τ's of the pooling levels; widening only the strong cells' guides (ŝ < 0.1)
 * removed most of them, widening by a factor did not, so the floor is additive. Measured with bench/model-divergence-sweep.ts over 12 fits of the example portfolio
 * (data seeds 1, 2, 4 × sampler seeds 1–4): 76 divergent transitions with no floor, 22 with
 * 0.07, 7–12 with 0.1 (bench/results/model-divergence-sweep-*.json); the demo portfolio went
 * from 4 to 0 (seed 1) and stays at 0 over seeds 1–4. The price is a smaller step on
 * portfolios of long, strong cells (the benchmark portfolio: about 1.8× the
 * gradients). Sampler geometry only: the posterior does not depend on it.
 */
export const GUIDE_VARIANCE_FLOOR = 0.1;

/**
 * Each cell effect log β[g,c] estimated by a per-cell least-squares fit of the outcome on
 * the baseline regressors and each channel's saturated adstock at the given α and λ per
 * channel: log β̂ and se(β̂)/β̂. Channels without spend, fits with t < 1 and rank-deficient
 * fits get sd = Infinity (mean 0).
 */
export function cellEffectEstimates(
  constants: PortfolioConstants,
  alpha: ArrayLike<number>,
  lambda: ArrayLike<number>,
  fits: CellMediaFits = new CellMediaFits(constants),
): { mean: Float64Array; sd: Float64Array } {
  const C = constants.channelCount;
  const mean = new Float64Array(constants.cellCount * C);
  const sd = new Float64Array(constants.cellCount * C).fill(Infinity);
  for (let g = 0; g < constants.cellCount; g++) {
    if (!fits.usable(g)) continue;
    const active = fits.activeChannels(g);
    active.forEach((c, idx) => fits.setColumn(g, idx, alpha[c]!, lambda[c]!));
    if (!fits.solve(g, -1, true)) continue;
    active.forEach((c, idx) => {
      const t = fits.tStatistic[idx]!;
      if (t >= 1) {
        mean[g * C + c] = Math.log(fits.coefficient[idx]!);
        sd[g * C + c] = 1 / t;
      }
    });
  }
  return { mean, sd };
}

/**
 * Per channel the α and λ at which the cells' least-squares fits explain the outcomes
 * best, with the priors of model.md: the maximum over α_c, λ_c of
 *   Σ_g −(T_g/2)·log RSS_g(α, λ) + log Beta(α_c | 2, 2) + log LogNormal(λ_c | log 2, 0.75),
 * i.e. the profile likelihood with each cell's own baseline, coefficients and noise level.
 * Found channel by channel (two sweeps) by a coarse grid, then a pattern search on
 * logit α and log λ. Only the sampler's guide uses it: a poor optimum costs speed, never
 * correctness.
 */
export function guideSaturation(
  constants: PortfolioConstants,
  fits: CellMediaFits = new CellMediaFits(constants),
): { alpha: Float64Array; lambda: Float64Array } {
  const C = constants.channelCount;
  const G = constants.cellCount;
  const alpha = new Float64Array(C).fill(0.5);
  const lambda = new Float64Array(C).fill(2);
  // cells × channels in use, as (cell, column index) per channel
  const uses: { g: number; idx: number }[][] = Array.from({ length: C }, () => []);
  for (let g = 0; g < G; g++) {
    if (!fits.usable(g)) continue;
    fits.activeChannels(g).forEach((c, idx) => {
      fits.setColumn(g, idx, alpha[c]!, lambda[c]!);
      uses[c]!.push({ g, idx });
    });
  }
  /** The objective's terms that depend on channel c, with channel c at (a, l). */
  const objective = (c: number, a: number, l: number): number => {
    let value = 0;
    for (const { g, idx } of uses[c]!) {
      fits.candidateColumn(g, a, l, c);
      if (!fits.solve(g, idx, false)) return Number.NEGATIVE_INFINITY;
      value += -0.5 * constants.trainWeeks[g]! * Math.log(fits.rss);
    }
    const logLambda = Math.log(l / 2) / 0.75;
    return value + Math.log(a * (1 - a)) - 0.5 * logLambda * logLambda;
  };
  const logit = (a: number): number => Math.log(a / (1 - a));
  const logistic = (x: number): number => 1 / (1 + Math.exp(-x));
  for (let sweep = 0; sweep < 2; sweep++) {
    for (let c = 0; c < C; c++) {
      if (uses[c]!.length === 0) continue;
      let bestX = logit(alpha[c]!);
      let bestY = Math.log(lambda[c]!);
      let best = objective(c, alpha[c]!, lambda[c]!);
      if (sweep === 0) {
        for (const a of [0.1, 0.3, 0.5, 0.7, 0.9]) {
          for (const l of [0.25, 0.7, 2, 5.6, 16]) {
            const value = objective(c, a, l);
            if (value > best) {
              best = value;
              bestX = logit(a);
              bestY = Math.log(l);
            }
          }
        }
      }
      let step = sweep === 0 ? 0.5 : 0.1;
      for (let round = 0; round < 60 && step > 0.005; round++) {
        let moved = false;
        for (const [dx, dy] of [[step, 0], [-step, 0], [0, step], [0, -step]] as const) {
          const x = Math.min(4.5, Math.max(-4.5, bestX + dx));
          const y = Math.min(4, Math.max(-3, bestY + dy));
          const value = objective(c, logistic(x), Math.exp(y));
          if (value > best) {
            best = value;
            bestX = x;
            bestY = y;
            moved = true;
          }
        }
        if (!moved) step /= 2;
      }
      alpha[c] = logistic(bestX);
      lambda[c] = Math.exp(bestY);
      for (const { g, idx } of uses[c]!) fits.setColumn(g, idx, alpha[c]!, lambda[c]!);
    }
  }
  return { alpha, lambda };
}

/**
 * Least-squares fits of each cell's training weeks on [1, trend, seasonal, controls] and
 * the saturated adstock of its active channels, in the Frisch–Waugh–Lovell form: the
 * baseline regressors are projected out once (modified Gram–Schmidt), so a fit only needs
 * the media columns' residuals, and changing one channel's α, λ recomputes one column.
 * Buffers are allocated once.
 */
export class CellMediaFits {
  private readonly k: PortfolioConstants;
  private readonly active: number[][];
  /** Per cell: orthonormal baseline basis (baseCount columns × train), or null when unusable. */
  private readonly basis: (Float64Array | null)[];
  private readonly baseCount: number;
  /** Per cell: outcome with the baseline projected out, and its squared norm. */
  private readonly residualOutcome: Float64Array[];
  private readonly outcomeSquares: Float64Array;
  /** Per cell: residual media columns (active count × train). */
  private readonly columns: Float64Array[];
  private readonly candidate: Float64Array;
  private readonly adstocked: Float64Array;
  private readonly gram: Float64Array;
  private readonly rhs: Float64Array;
  private readonly chol: Float64Array;
  private readonly scratch: Float64Array;
  private readonly unit: Float64Array;
  private readonly solution: Float64Array;
  rss = 0;
  readonly coefficient: Float64Array;
  readonly tStatistic: Float64Array;

  constructor(constants: PortfolioConstants) {
    const k = constants;
    this.k = k;
    const C = k.channelCount;
    const J = k.seasonalityOrder;
    const K = k.controlCount;
    this.baseCount = 2 + 2 * J + K;
    this.active = Array.from({ length: k.cellCount }, (_, g) => {
      const list: number[] = [];
      for (let c = 0; c < C; c++) if (k.channelActive[g * C + c] === 1) list.push(c);
      return list;
    });
    let maxT = 1;
    for (let g = 0; g < k.cellCount; g++) maxT = Math.max(maxT, k.trainWeeks[g]!);
    this.candidate = new Float64Array(maxT);
    this.adstocked = new Float64Array(maxT);
    this.gram = new Float64Array(C * C);
    this.rhs = new Float64Array(C);
    this.chol = new Float64Array(C * C);
    this.scratch = new Float64Array(C);
    this.unit = new Float64Array(C);
    this.solution = new Float64Array(C);
    this.coefficient = new Float64Array(C);
    this.tStatistic = new Float64Array(C);
    this.basis = [];
    this.residualOutcome = [];
    this.outcomeSquares = new Float64Array(k.cellCount);
    this.columns = [];
    for (let g = 0; g < k.cellCount; g++) {
      const train = k.trainWeeks[g]!;
      const T = k.weeks[g]!;
      const start = k.weekStart[g]!;
      const p = this.baseCount + this.active[g]!.length;
      this.columns.push(new Float64Array(this.active[g]!.length * train));
      const y = Float64Array.from(k.outcome.subarray(start, start + train));
      this.residualOutcome.push(y);
      if (train <= p + 1) {
        this.basis.push(null);
        continue;
      }
      const q = new Float64Array(this.baseCount * train);
      const raw = (j: number, t: number): number => {
        if (j === 0) return 1;
        if (j === 1) return k.trend[start + t]!;
        if (j < 2 + 2 * J) return k.seasonal[k.seasonalStart[g]! + (j - 2) * T + t]!;
        return k.controlDesign[k.controlStart[g]! + (j - 2 - 2 * J) * T + t]!;
      };
      let ok = true;
      for (let j = 0; j < this.baseCount && ok; j++) {
        const col = q.subarray(j * train, (j + 1) * train);
        let before = 0;
        for (let t = 0; t < train; t++) {
          col[t] = raw(j, t);
          before += col[t]! * col[t]!;
        }
        for (let i = 0; i < j; i++) project(col, q.subarray(i * train, (i + 1) * train));
        const norm = Math.sqrt(dot(col, col));
        if (!(norm > 1e-8 * Math.sqrt(before)) || !(norm > 0)) ok = false;
        else for (let t = 0; t < train; t++) col[t] = col[t]! / norm;
      }
      if (!ok) {
        this.basis.push(null);
        continue;
      }
      this.basis.push(q);
      for (let i = 0; i < this.baseCount; i++) project(y, q.subarray(i * train, (i + 1) * train));
      this.outcomeSquares[g] = dot(y, y);
    }
  }

  usable(g: number): boolean {
    return this.basis[g] !== null;
  }

  activeChannels(g: number): readonly number[] {
    return this.active[g]!;
  }

  /** Sets cell g's media column `idx` to channel activeChannels(g)[idx] at (α, λ). */
  setColumn(g: number, idx: number, alpha: number, lambda: number): void {
    const train = this.k.trainWeeks[g]!;
    this.mediaResidual(g, this.active[g]![idx]!, alpha, lambda, this.columns[g]!.subarray(idx * train, (idx + 1) * train));
  }

  /** Computes channel c's media column of cell g at (α, λ) as a candidate (see `solve`). */
  candidateColumn(g: number, alpha: number, lambda: number, c: number): void {
    this.mediaResidual(g, c, alpha, lambda, this.candidate.subarray(0, this.k.trainWeeks[g]!));
  }

  /**
   * Fits cell g with its media columns, column `replace` (−1: none) taken from the
   * candidate; sets `rss` and, on request, the coefficients and t statistics. False when
   * the media columns are (nearly) collinear with each other or the baseline.
   */
  solve(g: number, replace: number, withStatistics: boolean): boolean {
    const train = this.k.trainWeeks[g]!;
    const A = this.active[g]!.length;
    const cols = this.columns[g]!;
    const col = (i: number): Float64Array => (i === replace ? this.candidate.subarray(0, train) : cols.subarray(i * train, (i + 1) * train));
    const y = this.residualOutcome[g]!;
    const gram = this.gram;
    const rhs = this.rhs;
    for (let i = 0; i < A; i++) {
      const ci = col(i);
      rhs[i] = dot(ci, y);
      for (let j = 0; j <= i; j++) {
        const s = dot(ci, col(j));
        gram[i * A + j] = s;
        gram[j * A + i] = s;
      }
    }
    if (!choleskyLower(gram, A, this.chol)) return false;
    choleskySolve(this.chol, A, rhs, this.solution, this.scratch);
    let explained = 0;
    for (let i = 0; i < A; i++) explained += this.solution[i]! * rhs[i]!;
    const rss = this.outcomeSquares[g]! - explained;
    if (!(rss > 1e-12 * this.outcomeSquares[g]!)) return false;
    this.rss = rss;
    if (withStatistics) {
      const sigma2 = rss / (train - this.baseCount - A);
      for (let i = 0; i < A; i++) {
        this.unit.fill(0, 0, A);
        this.unit[i] = 1;
        choleskySolve(this.chol, A, this.unit, this.rhs, this.scratch);
        const variance = this.rhs[i]! * sigma2;
        this.coefficient[i] = this.solution[i]!;
        this.tStatistic[i] = variance > 0 ? this.solution[i]! / Math.sqrt(variance) : 0;
      }
    }
    return true;
  }

  private mediaResidual(g: number, c: number, alpha: number, lambda: number, out: Float64Array): void {
    const k = this.k;
    const C = k.channelCount;
    const train = k.trainWeeks[g]!;
    adstockGeometricUnchecked(k.spend, train, alpha, k.maxLag, this.adstocked, undefined, k.mediaStart[g * C + c]!, 0);
    const theta = lambda * k.spendMean[g * C + c]!;
    for (let t = 0; t < train; t++) out[t] = -theta * Math.expm1(-this.adstocked[t]! / theta);
    const q = this.basis[g]!;
    for (let i = 0; i < this.baseCount; i++) project(out, q.subarray(i * train, (i + 1) * train));
  }
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let t = 0; t < a.length; t++) s += a[t]! * b[t]!;
  return s;
}

/** x ← x − (x·e)e for a unit vector e. */
function project(x: Float64Array, e: Float64Array): void {
  const s = dot(x, e);
  for (let t = 0; t < x.length; t++) x[t] = x[t]! - s * e[t]!;
}

function choleskyLower(a: Float64Array, n: number, l: Float64Array): boolean {
  l.fill(0, 0, n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * n + j]!;
      for (let m = 0; m < j; m++) s -= l[i * n + m]! * l[j * n + m]!;
      if (i === j) {
        if (!(s > 1e-12 * Math.abs(a[i * n + i]!) && s > 0)) return false;
        l[i * n + i] = Math.sqrt(s);
      } else l[i * n + j] = s / l[j * n + j]!;
    }
  }
  return true;
}

/** Solves L Lᵀ x = b; `y` is scratch (length ≥ n). */
function choleskySolve(l: Float64Array, n: number, b: Float64Array, x: Float64Array, y: Float64Array): void {
  for (let i = 0; i < n; i++) {
    let s = b[i]!;
    for (let m = 0; m < i; m++) s -= l[i * n + m]! * y[m]!;
    y[i] = s / l[i * n + i]!;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i]!;
    for (let m = i + 1; m < n; m++) s -= l[m * n + i]! * x[m]!;
    x[i] = s / l[i * n + i]!;
  }
}
