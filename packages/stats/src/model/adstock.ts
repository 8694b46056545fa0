/**
 * Normalised geometric adstock truncated at L lags (Broadbent 1979):
 *   a[t] = Σ_{l=0}^{L−1} α^l · x[t−l] / Σ_{l=0}^{L−1} α^l,  x = 0 before the first week.
 *
 * Computed with the truncated recursion S[t] = α·S[t−1] + x[t] − α^L·x[t−L] (the plain
 * one-tap recursion a[t] = x[t] + α·a[t−1] would not truncate at L lags). Subtracting the
 * dropped week leaves a rounding residue of the size of the spend it removes, so once the
 * window holds no spend the sums are set to exactly 0, as the direct sum gives.
 */

/** Σ_{l=0}^{L−1} α^l, the normalising sum of the adstock weights. */
export function adstockWeightSum(alpha: number, maxLag: number): number {
  let sum = 0;
  let power = 1;
  for (let l = 0; l < maxLag; l++) {
    sum += power;
    power *= alpha;
  }
  return sum;
}

/** d/dα Σ_{l=0}^{L−1} α^l = Σ_{l=1}^{L−1} l·α^{l−1}. */
export function adstockWeightSumDerivative(alpha: number, maxLag: number): number {
  let sum = 0;
  let power = 1;
  for (let l = 1; l < maxLag; l++) {
    sum += l * power;
    power *= alpha;
  }
  return sum;
}

function checkAdstockArguments(spend: Float64Array, alpha: number, maxLag: number, out: Float64Array): void {
  if (!(alpha >= 0 && alpha < 1)) throw new RangeError(`adstock: alpha must be in [0, 1), got ${alpha}`);
  if (!Number.isInteger(maxLag) || maxLag < 1) throw new RangeError(`adstock: maxLag must be a positive integer, got ${maxLag}`);
  if (out.length < spend.length) throw new RangeError(`adstock: output length ${out.length} is shorter than the spend series (${spend.length})`);
}

/** Writes the normalised, truncated geometric adstock of `spend` into `out`. */
export function adstockGeometric(spend: Float64Array, alpha: number, maxLag: number, out: Float64Array): void {
  checkAdstockArguments(spend, alpha, maxLag, out);
  adstockGeometricUnchecked(spend, spend.length, alpha, maxLag, out, undefined);
}

/**
 * Writes the adstock into `out` and its derivative with respect to α into `dOut`.
 * With W = Σ α^l and S, D as below: a = S/W, da/dα = (D·W − S·W′)/W².
 */
export function adstockGeometricWithDerivative(
  spend: Float64Array,
  alpha: number,
  maxLag: number,
  out: Float64Array,
  dOut: Float64Array,
): void {
  checkAdstockArguments(spend, alpha, maxLag, out);
  if (dOut.length < spend.length) throw new RangeError(`adstock: derivative length ${dOut.length} is shorter than the spend series`);
  adstockGeometricUnchecked(spend, spend.length, alpha, maxLag, out, dOut);
}

/**
 * The weeks t < length at which the window [t−L+1, t] of spend[offset + …] has just become
 * empty (spend at t−L, none since): where the recursion leaves a residue instead of 0.
 * Appends them to `out` in order; each is ≥ L.
 */
export function adstockEmptiedWeeks(spend: Float64Array, offset: number, length: number, maxLag: number, out: number[]): void {
  let idle = maxLag + 1; // weeks since the last spend; the weeks before the series count as without spend
  for (let t = 0; t < length; t++) {
    if (spend[offset + t] !== 0) idle = 0;
    else if (++idle === maxLag) out.push(t);
  }
}

/**
 * The unnormalised sums S[t] = Σ_{l<L} α^l x[t−l] and D[t] = dS[t]/dα for t < length:
 * reads spend[offset .. offset+length), writes s and d (when given) at outOffset + t.
 * D obeys D[t] = α·D[t−1] + S[t−1] − L·α^{L−1}·x[t−L]. `emptied` from `emptiedAt` lists
 * the weeks of adstockEmptiedWeeks in order, ended by −1; both sums are 0 from there
 * until the next spend. No argument checks (hot loop).
 */
export function adstockSumsUnchecked(
  spend: Float64Array,
  offset: number,
  length: number,
  alpha: number,
  maxLag: number,
  s: Float64Array,
  d: Float64Array | undefined,
  outOffset: number,
  emptied: Int32Array,
  emptiedAt: number,
): void {
  let alphaPowLagMinus1 = 1;
  for (let l = 1; l < maxLag; l++) alphaPowLagMinus1 *= alpha;
  const alphaPowLag = alphaPowLagMinus1 * alpha;
  const lagPow = maxLag * alphaPowLagMinus1;
  const head = Math.min(maxLag, length);
  let sv = 0;
  let dv = 0;
  let next = emptied[emptiedAt]!;
  let e = emptiedAt;
  if (d === undefined) {
    for (let t = 0; t < head; t++) {
      sv = alpha * sv + spend[offset + t]!;
      s[outOffset + t] = sv;
    }
    for (let t = head; t < length; t++) {
      sv = alpha * sv + (spend[offset + t]! - alphaPowLag * spend[offset + t - maxLag]!);
      if (t === next) {
        sv = 0;
        next = emptied[++e]!;
      }
      s[outOffset + t] = sv;
    }
    return;
  }
  for (let t = 0; t < head; t++) {
    dv = alpha * dv + sv;
    sv = alpha * sv + spend[offset + t]!;
    s[outOffset + t] = sv;
    d[outOffset + t] = dv;
  }
  for (let t = head; t < length; t++) {
    const dropped = spend[offset + t - maxLag]!;
    dv = alpha * dv + (sv - lagPow * dropped);
    sv = alpha * sv + (spend[offset + t]! - alphaPowLag * dropped);
    if (t === next) {
      sv = 0;
      dv = 0;
      next = emptied[++e]!;
    }
    s[outOffset + t] = sv;
    d[outOffset + t] = dv;
  }
}

/**
 * Hot-loop form of adstockGeometric(WithDerivative) without argument checks: reads
 * spend[offset .. offset+length) and writes out/dOut at outOffset + t. With W = Σ α^l,
 * a = S/W and da/dα = D/W − S·W′/W².
 */
export function adstockGeometricUnchecked(
  spend: Float64Array,
  length: number,
  alpha: number,
  maxLag: number,
  out: Float64Array,
  dOut: Float64Array | undefined,
  offset = 0,
  outOffset = offset,
): void {
  const weeks: number[] = [];
  adstockEmptiedWeeks(spend, offset, length, maxLag, weeks);
  weeks.push(-1);
  adstockSumsUnchecked(spend, offset, length, alpha, maxLag, out, dOut, outOffset, Int32Array.from(weeks), 0);
  const invWeightSum = 1 / adstockWeightSum(alpha, maxLag);
  if (dOut === undefined) {
    for (let t = outOffset; t < outOffset + length; t++) out[t] = out[t]! * invWeightSum;
    return;
  }
  const dScale = adstockWeightSumDerivative(alpha, maxLag) * invWeightSum * invWeightSum;
  for (let t = outOffset; t < outOffset + length; t++) {
    const sum = out[t]!;
    dOut[t] = dOut[t]! * invWeightSum - sum * dScale;
    out[t] = sum * invWeightSum;
  }
}

/** The direct O(T·L) sum, for tests and as a readable definition. */
export function adstockGeometricDirect(spend: Float64Array, alpha: number, maxLag: number, out: Float64Array): void {
  checkAdstockArguments(spend, alpha, maxLag, out);
  const weightSum = adstockWeightSum(alpha, maxLag);
  for (let t = 0; t < spend.length; t++) {
    let sum = 0;
    let power = 1;
    for (let l = 0; l < maxLag && l <= t; l++) {
      sum += power * spend[t - l]!;
      power *= alpha;
    }
    out[t] = sum / weightSum;
  }
}
