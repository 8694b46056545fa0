import type { LineResponses } from "./line-response";

/** How the outcome's spread over posterior draws is weighed. */
export type RiskAttitude =
  | { readonly kind: "expected" }
  /** Maximise this quantile of the outcome over draws (e.g. 0.1: the outcome reached in 90 % of draws). */
  | { readonly kind: "lower-quantile"; readonly quantile: number }
  /** Maximise mean − penalty × standard deviation of the outcome over draws. */
  | { readonly kind: "mean-minus-sd"; readonly penalty: number };

/**
 * The outcome of an allocation in posterior draw d over a horizon of H weeks at steady
 * state: Y_d = H·Σ_l (w_l·R_ld(s_l) − p·s_l), with s_l the weekly spend of line l.
 */
export interface DrawOutcome {
  readonly responses: LineResponses;
  readonly weight: Float64Array;
  /** 1 when spend is subtracted (profit), 0 for customers. */
  readonly spendCost: number;
  readonly horizon: number;
}

/** Writes Y_d for every draw into `out`, and R′_ld(s_l) at slopes[l·D + d] when `slopes` is given. */
export function outcomeDraws(problem: DrawOutcome, spend: Float64Array, out: Float64Array, slopes?: Float64Array): void {
  const { responses: R, weight, horizon: H } = problem;
  out.fill(0);
  let cost = 0;
  for (let l = 0; l < R.lineCount; l++) {
    R.addResponseDraws(l, spend[l]!, H * weight[l]!, out, slopes, l * R.drawCount);
    cost += spend[l]!;
  }
  if (problem.spendCost !== 0) for (let d = 0; d < out.length; d++) out[d] = out[d]! - H * problem.spendCost * cost;
}

/** Type-7 quantile of values (sorted copy). */
function quantileOf(values: Float64Array, p: number, sorted: Float64Array): number {
  sorted.set(values);
  sorted.sort();
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

/** The risk criterion of outcome draws: mean, a lower quantile, or mean − k·sd. */
export function riskValue(risk: RiskAttitude, draws: Float64Array): number {
  const D = draws.length;
  if (risk.kind === "lower-quantile") return quantileOf(draws, risk.quantile, new Float64Array(D));
  let mean = 0;
  for (let d = 0; d < D; d++) mean += draws[d]!;
  mean /= D;
  if (risk.kind === "expected") return mean;
  let ss = 0;
  for (let d = 0; d < D; d++) ss += (draws[d]! - mean) ** 2;
  return mean - risk.penalty * (D > 1 ? Math.sqrt(ss / (D - 1)) : 0);
}

/** Feasible set of weekly spends: bounds, and a total that must equal (or not exceed) the budget. */
export interface SpendBox {
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly budget: number;
  readonly spendAtMost: boolean;
}

/**
 * Projection onto {lower ≤ s ≤ upper, Σ s = budget} (or ≤ budget) in the metric
 * Σ (s_l − y_l)² / scale_l (Euclidean when `scale` is left out): s_l = clamp(y_l − τ·scale_l)
 * with τ found by bisection, then the rounding residual moved onto lines with room.
 */
export function projectOntoBudget(box: SpendBox, y: Float64Array, out: Float64Array, scale?: Float64Array): void {
  const n = y.length;
  const { lower, upper, budget } = box;
  const w = (l: number): number => (scale === undefined ? 1 : scale[l]!);
  const clampedSum = (tau: number): number => {
    let sum = 0;
    for (let l = 0; l < n; l++) sum += Math.min(Math.max(y[l]! - tau * w(l), lower[l]!), upper[l]!);
    return sum;
  };
  if (box.spendAtMost && clampedSum(0) <= budget) {
    for (let l = 0; l < n; l++) out[l] = Math.min(Math.max(y[l]!, lower[l]!), upper[l]!);
    return;
  }
  let hi = -Infinity; // Σ(τ = hi) = Σ lower ≤ budget
  let lo = Infinity; // Σ(τ = lo) ≥ budget
  for (let l = 0; l < n; l++) {
    hi = Math.max(hi, (y[l]! - lower[l]!) / w(l));
    lo = Math.min(lo, (y[l]! - lower[l]! - budget) / w(l), Number.isFinite(upper[l]!) ? (y[l]! - upper[l]!) / w(l) : Infinity);
  }
  for (let it = 0; it < 200 && hi - lo > 0; it++) {
    const mid = 0.5 * (lo + hi);
    if (mid === lo || mid === hi) break;
    if (clampedSum(mid) >= budget) lo = mid;
    else hi = mid;
  }
  let sum = 0;
  for (let l = 0; l < n; l++) {
    out[l] = Math.min(Math.max(y[l]! - lo * w(l), lower[l]!), upper[l]!);
    sum += out[l]!;
  }
  let residual = budget - sum;
  for (let l = 0; l < n && residual !== 0; l++) {
    const moved = Math.min(Math.max(out[l]! + residual, lower[l]!), upper[l]!);
    residual -= moved - out[l]!;
    out[l] = moved;
  }
}

export interface RiskOptimum {
  readonly spend: Float64Array;
  /** The criterion reached (on the exact, unsmoothed criterion). */
  readonly value: number;
  /** The criterion at the start (the expected-value solution). */
  readonly startValue: number;
  readonly iterations: number;
}

/**
 * Maximises a risk criterion of the outcome over the draws by projected gradient ascent:
 * spectral (Barzilai–Borwein) steps projected onto the feasible set, as in Birgin,
 * Martínez & Raydan (SIAM J. Optim. 10(4), 2000), here with a monotone Armijo search and
 * a diagonal metric from each line's expected curvature
 * from `start`, keeping every iterate feasible. A lower quantile is smoothed with a
 * Gaussian kernel over the sorted draws, whose width shrinks stage by stage to the exact
 * quantile. The allocation returned is the best iterate on the exact criterion, so it is
 * never worse than `start`. A local, approximate optimum.
 */
export function optimiseRisk(problem: DrawOutcome, box: SpendBox, risk: RiskAttitude, start: Float64Array, maxIterations = 400): RiskOptimum {
  const R = problem.responses;
  const n = R.lineCount;
  const D = R.drawCount;
  const H = problem.horizon;
  const draws = new Float64Array(D);
  const coef = new Float64Array(D);
  const order = new Uint32Array(D);
  const sorted = new Float64Array(D);
  const kernel = new Float64Array(D);
  const slopes = new Float64Array(n * D);

  // Kernel weights over sorted positions for a quantile; bandwidth 0 is the type-7 quantile.
  const setKernel = (q: number, bandwidth: number): void => {
    kernel.fill(0);
    const h = (D - 1) * q;
    if (bandwidth <= 0 || D < 3) {
      const lo = Math.floor(h);
      kernel[lo] = 1 - (h - lo);
      if (lo + 1 < D) kernel[lo + 1] = kernel[lo + 1]! + (h - lo);
      return;
    }
    let sum = 0;
    for (let i = 0; i < D; i++) {
      const z = (i / (D - 1) - q) / bandwidth;
      kernel[i] = Math.exp(-0.5 * z * z);
      sum += kernel[i]!;
    }
    for (let i = 0; i < D; i++) kernel[i] = kernel[i]! / sum;
  };

  // Smoothed criterion at the current draws; fills coef = d criterion / d Y_d. Returns [smoothed, exact].
  const evaluate = (spend: Float64Array, withCoef: boolean): [number, number] => {
    outcomeDraws(problem, spend, draws, withCoef ? slopes : undefined);
    if (risk.kind === "lower-quantile") {
      for (let d = 0; d < D; d++) order[d] = d;
      order.sort((a, b) => draws[a]! - draws[b]!);
      let smooth = 0;
      for (let i = 0; i < D; i++) {
        sorted[i] = draws[order[i]!]!;
        smooth += kernel[i]! * sorted[i]!;
        if (withCoef) coef[order[i]!] = kernel[i]!;
      }
      const h = (D - 1) * risk.quantile;
      const lo = Math.floor(h);
      const exact = sorted[lo]! + (h - lo) * (sorted[Math.min(lo + 1, D - 1)]! - sorted[lo]!);
      return [smooth, exact];
    }
    let mean = 0;
    for (let d = 0; d < D; d++) mean += draws[d]!;
    mean /= D;
    if (risk.kind === "expected") {
      if (withCoef) coef.fill(1 / D);
      return [mean, mean];
    }
    let ss = 0;
    for (let d = 0; d < D; d++) ss += (draws[d]! - mean) ** 2;
    const sd = D > 1 ? Math.sqrt(ss / (D - 1)) : 0;
    if (withCoef) for (let d = 0; d < D; d++) coef[d] = 1 / D - (sd > 0 ? (risk.penalty * (draws[d]! - mean)) / ((D - 1) * sd) : 0);
    const value = mean - risk.penalty * sd;
    return [value, value];
  };

  // Gradient at the spend of the last evaluation with coefficients (its slopes and coef).
  const gradient = (out: Float64Array): void => {
    let coefSum = 0;
    for (let d = 0; d < D; d++) coefSum += coef[d]!;
    for (let l = 0; l < n; l++) {
      let sum = 0;
      for (let d = 0; d < D; d++) sum += coef[d]! * slopes[l * D + d]!;
      out[l] = H * (problem.weight[l]! * sum - problem.spendCost * coefSum);
    }
  };

  const bandwidths = risk.kind === "lower-quantile" ? [...[0.1, 0.05, 0.02, 0.01].filter((b) => b > 4 / D), 0] : [0];
  const x = Float64Array.from(start);
  projectOntoBudget(box, x, x);
  const best = Float64Array.from(x);
  if (risk.kind === "lower-quantile") setKernel(risk.quantile, 0);
  const startValue = evaluate(x, false)[1];
  let bestValue = startValue;
  const g = new Float64Array(n);
  const gOld = new Float64Array(n);
  const xOld = new Float64Array(n);
  const trial = new Float64Array(n);
  const step = new Float64Array(n);
  const scaleBudget = Math.max(box.budget, 1e-12);
  let iterations = 0;
  const perStage = Math.max(20, Math.floor(maxIterations / bandwidths.length));

  const metric = new Float64Array(n);
  const scratch = new Float64Array(2);
  for (const bandwidth of bandwidths) {
    if (risk.kind === "lower-quantile") setKernel(risk.quantile, bandwidth);
    // Diagonal scaling by the inverse expected curvature H·w·|E R″| of each line at the
    // stage's start: lines of very different size then move at their own pace.
    let maxCurvature = 0;
    for (let l = 0; l < n; l++) {
      R.logSlope(l, Math.max(x[l]!, 1e-9 * R.typicalScale(l)), scratch);
      const c = H * problem.weight[l]! * Math.abs(scratch[1]! * Math.exp(scratch[0]!));
      metric[l] = Number.isFinite(c) ? c : 0;
      maxCurvature = Math.max(maxCurvature, metric[l]!);
    }
    if (!(maxCurvature > 0)) metric.fill(1);
    else for (let l = 0; l < n; l++) metric[l] = 1 / Math.max(metric[l]!, 1e-9 * maxCurvature);
    let [current] = evaluate(x, true);
    gradient(g);
    let gMax = 0;
    for (let l = 0; l < n; l++) gMax = Math.max(gMax, Math.abs(g[l]! * metric[l]!));
    if (!(gMax > 0)) continue;
    let t = Math.min(1, (0.05 * scaleBudget) / gMax);
    let stall = 0;
    for (let it = 0; it < perStage; it++) {
      iterations++;
      let accepted = false;
      let value = current;
      for (let back = 0; back < 40; back++) {
        for (let l = 0; l < n; l++) step[l] = x[l]! + t * metric[l]! * g[l]!;
        projectOntoBudget(box, step, trial, metric);
        let ascent = 0;
        for (let l = 0; l < n; l++) ascent += g[l]! * (trial[l]! - x[l]!);
        if (!(ascent > 0)) break;
        const [smooth, exact] = evaluate(trial, true);
        if (exact > bestValue) {
          bestValue = exact;
          best.set(trial);
        }
        if (smooth >= current + 1e-4 * ascent) {
          accepted = true;
          value = smooth;
          break;
        }
        t *= 0.5;
      }
      if (!accepted) break;
      xOld.set(x);
      gOld.set(g);
      x.set(trial);
      gradient(g); // coef and slopes are those of the accepted evaluation
      let ss = 0;
      let sy = 0;
      for (let l = 0; l < n; l++) {
        const sl = x[l]! - xOld[l]!;
        ss += (sl * sl) / metric[l]!;
        sy += sl * (g[l]! - gOld[l]!);
      }
      const improvement = value - current;
      current = value;
      t = sy < 0 ? ss / -sy : 2 * t; // concave ascent: Δs·Δg < 0
      // A criterion estimated from draws is not worth polishing below 1e-9 relative.
      if (Math.abs(improvement) <= 1e-9 * Math.max(1, Math.abs(current))) {
        if (++stall >= 5) break;
      } else stall = 0;
    }
    x.set(best);
  }
  return { spend: best, value: bestValue, startValue, iterations };
}
