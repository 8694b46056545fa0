import type { LineResponses } from "./line-response";

/**
 * The expected-value budget problem over lines l with weekly spend s_l:
 *   maximise Σ_l (w_l·E_d R_ld(s_l) − p·s_l)  subject to  lower_l ≤ s_l ≤ upper_l and
 *   Σ_l s_l = budget (or ≤ budget when `spendAtMost`),
 * with w_l = 1, p = 0 for customers and w_l = customer value, p = 1 for profit.
 */
export interface MarginalProblem {
  readonly responses: LineResponses;
  readonly weight: Float64Array;
  readonly lower: Float64Array;
  /** May hold Infinity (no upper bound). */
  readonly upper: Float64Array;
  readonly budget: number;
  readonly spendAtMost: boolean;
}

export type LineStatus = "lower" | "upper" | "fixed" | "interior";

export interface MarginalSolution {
  /** Weekly spend per line. */
  readonly spend: Float64Array;
  readonly status: readonly LineStatus[];
  /**
   * ν: the common weighted expected marginal return w_l·E R′_l(s_l) of every line not at a
   * bound. For customers it is new customers per extra currency unit; for profit it is
   * 1 + the budget's shadow price (1 when the budget is not all spent).
   */
  readonly multiplier: number;
  /** Whether the whole budget is spent (always for customers). */
  readonly budgetBinding: boolean;
  /** True when every line's expected response is concave on its bounds, so the KKT point is the optimum. */
  readonly exact: boolean;
  /** Evaluations of the total spend at a multiplier. */
  readonly iterations: number;
}

const GRID = 48;

/** Safeguarded Newton for a decreasing function with a sign change in [a, b] (b may be ∞); Press et al., Numerical Recipes 3rd ed. §9.4 (rtsafe). */
function rootDecreasing(
  fn: (x: number, out: Float64Array) => void,
  a: number,
  b: number,
  start: number,
  scale: number,
  scratch: Float64Array,
): { x: number; derivative: number } {
  const origin = a;
  let x = start > a && start < b ? start : Number.isFinite(b) ? 0.5 * (a + b) : a + scale;
  fn(x, scratch);
  let g = scratch[0]!;
  let dg = scratch[1]!;
  let stepOld = Number.isFinite(b) ? b - a : Infinity;
  let step = stepOld;
  for (let it = 0; it < 300; it++) {
    if (g === 0) break;
    if (g > 0) a = x;
    else b = x;
    const tol = 1e-14 * Math.max(Math.abs(x), scale);
    let next: number;
    const newton = x - g / dg;
    if (!Number.isFinite(b)) {
      // No upper end yet: take the Newton step when it moves right, else double the distance.
      next = Number.isFinite(newton) && newton > x ? Math.max(newton, x + 1e-3 * scale) : x + 2 * (x - origin) + scale;
      next = Math.min(next, x + 4 * (x - origin) + 4 * scale);
    } else if (!(dg < 0) || !Number.isFinite(newton) || newton <= a || newton >= b || Math.abs(2 * g) > Math.abs(stepOld * dg)) {
      stepOld = step;
      next = 0.5 * (a + b);
    } else {
      stepOld = step;
      next = newton;
    }
    step = next - x;
    x = next;
    if (Number.isFinite(b) && (Math.abs(step) <= tol || b - a <= tol)) {
      fn(x, scratch);
      dg = scratch[1]!;
      break;
    }
    fn(x, scratch);
    g = scratch[0]!;
    dg = scratch[1]!;
  }
  return { x, derivative: dg };
}

/**
 * Solves the KKT conditions of the expected-value problem: per line s_l(ν) = the spend
 * where w_l·E R′_l(s) = ν, clamped to the bounds; one multiplier ν for the budget found by
 * safeguarded Newton on log ν. Exact (to ~1e-13 relative) when the responses are concave;
 * with S-shaped Hill responses each line takes its best stationary point or bound for ν,
 * and a budget that falls in a jump of the total goes to the line that jumps (flagged
 * as not exact).
 */
export function solveEqualMarginalReturn(problem: MarginalProblem): MarginalSolution {
  const { responses: R, weight, lower, upper, budget } = problem;
  const n = R.lineCount;
  const scratch = new Float64Array(2);
  const logWeight = Float64Array.from(weight, Math.log);
  const scale = new Float64Array(n);
  const concaveFrom = new Float64Array(n);
  const logSlopeLower = new Float64Array(n);
  const logSlopeUpper = new Float64Array(n);
  let allConcave = true;
  const grids: (Float64Array | null)[] = [];
  const gridLog: (Float64Array | null)[] = [];
  for (let l = 0; l < n; l++) {
    scale[l] = Math.max(R.typicalScale(l), 1e-300);
    concaveFrom[l] = R.inflectionPoint(l);
    R.logSlope(l, lower[l]!, scratch);
    logSlopeLower[l] = scratch[0]!;
    if (Number.isFinite(upper[l]!)) {
      R.logSlope(l, upper[l]!, scratch);
      logSlopeUpper[l] = scratch[0]!;
    } else logSlopeUpper[l] = -Infinity;
    if (concaveFrom[l]! > lower[l]! && upper[l]! > lower[l]!) {
      allConcave = false;
      const top = Math.min(concaveFrom[l]!, upper[l]!);
      const x = new Float64Array(GRID + 1);
      const v = new Float64Array(GRID + 1);
      for (let i = 0; i <= GRID; i++) {
        x[i] = lower[l]! + (top - lower[l]!) * (i / GRID) * (i / GRID);
        R.logSlope(l, x[i]!, scratch);
        v[i] = scratch[0]!;
      }
      grids.push(x);
      gridLog.push(v);
    } else {
      grids.push(null);
      gridLog.push(null);
    }
  }

  const warm = Float64Array.from(lower);
  const spend = new Float64Array(n);
  const dsdu = new Float64Array(n);
  const status: LineStatus[] = new Array<LineStatus>(n).fill("interior");

  const concaveLine = (l: number, target: number): void => {
    const lo = lower[l]!;
    const hi = upper[l]!;
    dsdu[l] = 0;
    if (lo === hi) {
      spend[l] = lo;
      status[l] = "fixed";
      return;
    }
    if (logSlopeLower[l]! <= target) {
      spend[l] = lo;
      status[l] = "lower";
      return;
    }
    if (logSlopeUpper[l]! >= target) {
      spend[l] = hi;
      status[l] = "upper";
      return;
    }
    const fn = (s: number, out: Float64Array): void => {
      R.logSlope(l, s, out);
      out[0] = out[0]! - target;
    };
    const root = rootDecreasing(fn, lo, hi, warm[l]!, scale[l]!, scratch);
    spend[l] = root.x;
    warm[l] = root.x;
    status[l] = "interior";
    dsdu[l] = root.derivative < 0 ? 1 / root.derivative : 0;
  };

  // Best of the bounds and the stationary points of w·E R(s) − ν·s on an S-shaped line.
  const sShapedLine = (l: number, u: number): void => {
    const target = u - logWeight[l]!;
    const x = grids[l]!;
    const v = gridLog[l]!;
    const nu = Math.exp(u);
    const value = (s: number): number => weight[l]! * R.meanResponse(l, s) - nu * s;
    let bestS = lower[l]!;
    let best = value(bestS);
    let bestStatus: LineStatus = "lower";
    let bestDeriv = 0;
    const consider = (s: number, st: LineStatus, deriv: number): void => {
      const f = value(s);
      if (f > best) {
        best = f;
        bestS = s;
        bestStatus = st;
        bestDeriv = deriv;
      }
    };
    const fn = (s: number, out: Float64Array): void => {
      R.logSlope(l, s, out);
      out[0] = out[0]! - target;
    };
    for (let i = 0; i < GRID; i++) {
      if (v[i]! > target && v[i + 1]! <= target) {
        const root = rootDecreasing(fn, x[i]!, x[i + 1]!, 0.5 * (x[i]! + x[i + 1]!), scale[l]!, scratch);
        consider(root.x, "interior", root.derivative < 0 ? 1 / root.derivative : 0);
      }
    }
    const top = x[GRID]!;
    if (top < upper[l]!) {
      if (logSlopeUpper[l]! >= target) consider(upper[l]!, "upper", 0);
      else if (v[GRID]! > target) {
        const root = rootDecreasing(fn, top, upper[l]!, Math.max(warm[l]!, top), scale[l]!, scratch);
        consider(root.x, "interior", root.derivative < 0 ? 1 / root.derivative : 0);
        warm[l] = root.x;
      }
    } else consider(upper[l]!, "upper", 0);
    spend[l] = bestS;
    status[l] = bestStatus;
    dsdu[l] = bestDeriv;
  };

  let iterations = 0;
  const totalAt = (u: number): number => {
    iterations++;

    let total = 0;
    for (let l = 0; l < n; l++) {
      if (grids[l] === null) concaveLine(l, u - logWeight[l]!);
      else sShapedLine(l, u);
      total += spend[l]!;
    }
    return total;
  };

  const sumLower = lower.reduce((a, b) => a + b, 0);
  const sumUpper = upper.reduce((a, b) => a + b, 0);
  const tolerance = 1e-13 * Math.max(budget, 1e-300);
  const spendLow = new Float64Array(n); // spend at uLow, where the total is ≥ the budget
  const finish = (u: number, binding: boolean, exact: boolean): MarginalSolution => ({
    spend: Float64Array.from(spend),
    status: [...status],
    multiplier: Math.exp(u),
    budgetBinding: binding,
    exact,
    iterations,
  });

  // Profit: first the spend where every line's value × marginal return falls to 1.
  const minU = problem.spendAtMost ? 0 : -Infinity;
  let uLow = minU;
  let uHigh = Infinity;
  if (problem.spendAtMost) {
    const total = totalAt(0);
    if (total <= budget + tolerance) return finish(0, total >= budget - tolerance, allConcave);
    spendLow.set(spend);
  }
  if (budget <= sumLower + tolerance) {
    spend.set(lower);
    let nu = -Infinity;
    for (let l = 0; l < n; l++) {
      status[l] = lower[l] === upper[l] ? "fixed" : "lower";
      nu = Math.max(nu, logWeight[l]! + logSlopeLower[l]!);
    }
    return finish(Math.max(nu, minU), true, allConcave);
  }
  if (budget >= sumUpper - tolerance) {
    spend.set(upper);
    let nu = Infinity;
    for (let l = 0; l < n; l++) {
      status[l] = lower[l] === upper[l] ? "fixed" : "upper";
      nu = Math.min(nu, logWeight[l]! + logSlopeUpper[l]!);
    }
    return finish(nu, true, allConcave);
  }

  // Bracket log ν: F(u) = Σ s_l(u) − budget is non-increasing in u. Start from the median
  // log marginal return at an even split (a mean would follow lines saturated far below it).
  let u: number;
  {
    const share = budget / n;
    const logs: number[] = [];
    for (let l = 0; l < n; l++) {
      R.logSlope(l, Math.min(Math.max(share, lower[l]!), upper[l]!), scratch);
      if (Number.isFinite(scratch[0]!)) logs.push(scratch[0]! + logWeight[l]!);
    }
    logs.sort((a, b) => a - b);
    u = Math.max(logs.length > 0 ? logs[logs.length >> 1]! : 0, minU);
  }
  let f = totalAt(u) - budget;
  const record = (at: number, value: number): void => {
    if (value >= 0) {
      uLow = at;
      spendLow.set(spend);
    } else uHigh = at;
  };
  record(u, f);
  for (let step = 1; !(Number.isFinite(uLow) && Number.isFinite(uHigh)); step *= 2) {
    if (step > 1e6) throw new RangeError("budget split: no multiplier balances the budget; check the bounds and the draws");
    u = Number.isFinite(uHigh) ? uHigh - step : uLow + step;
    f = totalAt(u) - budget;
    record(u, f);
  }

  // Safeguarded Newton on u with derivative Σ ds_l/du over the lines not at a bound.
  let converged = Math.abs(f) <= tolerance;
  for (let it = 0; it < 200 && !converged; it++) {
    let slope = 0;
    for (let l = 0; l < n; l++) slope += dsdu[l]!;
    const newton = u - f / slope;
    const next = slope < 0 && Number.isFinite(newton) && newton > uLow && newton < uHigh ? newton : 0.5 * (uLow + uHigh);
    if (next === u || uHigh - uLow <= 1e-15 * Math.max(1, Math.abs(u))) break;
    u = next;
    f = totalAt(u) - budget;
    record(u, f);
    converged = Math.abs(f) <= tolerance;
  }

  if (!converged && !allConcave) {
    // The total jumps over the budget between uLow and uHigh (an S-shaped line switches
    // from its bound to its concave part): spend as at uHigh, the rest on the lines that jump.
    totalAt(uHigh);
    let rest = budget - spend.reduce((a, b) => a + b, 0);
    for (let l = 0; l < n && rest > 0; l++) {
      const room = spendLow[l]! - spend[l]!;
      if (room <= 0) continue;
      const add = Math.min(room, rest);
      spend[l] = spend[l]! + add;
      rest -= add;
      status[l] = "interior";
    }
    return finish(uHigh, true, false);
  }

  // Spread the last rounding residual over the free lines in proportion to ds/du, which
  // keeps their marginal returns equal to first order.
  let residual = budget - spend.reduce((a, b) => a + b, 0);
  let weightSum = 0;
  for (let l = 0; l < n; l++) if (status[l] === "interior") weightSum += dsdu[l]!;
  if (weightSum < 0) {
    for (let l = 0; l < n; l++) if (status[l] === "interior") spend[l] = Math.min(Math.max(spend[l]! + (residual * dsdu[l]!) / weightSum, lower[l]!), upper[l]!);
  }
  residual = budget - spend.reduce((a, b) => a + b, 0);
  for (let l = 0; l < n && residual !== 0; l++) {
    const moved = Math.min(Math.max(spend[l]! + residual, lower[l]!), upper[l]!);
    residual -= moved - spend[l]!;
    spend[l] = moved;
  }
  return finish(u, true, allConcave);
}
