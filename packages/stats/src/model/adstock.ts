/**
 * Normalised geometric adstock truncated at L lags (Broadbent 1979):
 *   a[t] = Σ_{l=0}^{L−1} α^l · x[t−l] / Σ_{l=0}^{L−1} α^l,  x = 0 before the first week.
 *
 * Computed exactly with the truncated recursion S[t] = x[t] + α·S[t−1] − α^L·x[t−L]
 * (the plain one-tap recursion a[t] = x[t] + α·a[t−1] would not truncate at L lags).
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
 * Hot-loop form without argument checks: reads spend[offset .. offset+length) and writes
 * out/dOut at the same positions. S[t] = Σ α^l x[t−l], D[t] = dS[t]/dα obeys
 * D[t] = S[t−1] + α·D[t−1] − L·α^{L−1}·x[t−L].
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
  let alphaPowLagMinus1 = 1;
  for (let l = 1; l < maxLag; l++) alphaPowLagMinus1 *= alpha;
  const alphaPowLag = alphaPowLagMinus1 * alpha;
  const weightSum = adstockWeightSum(alpha, maxLag);
  const invWeightSum = 1 / weightSum;
  let s = 0;
  if (dOut === undefined) {
    for (let t = 0; t < length; t++) {
      const x = spend[offset + t]!;
      const dropped = t >= maxLag ? spend[offset + t - maxLag]! : 0;
      s = x + alpha * s - alphaPowLag * dropped;
      out[outOffset + t] = s * invWeightSum;
    }
    return;
  }
  const weightSumDerivative = adstockWeightSumDerivative(alpha, maxLag);
  const lagTimesPow = maxLag * alphaPowLagMinus1;
  const dScale = weightSumDerivative * invWeightSum * invWeightSum;
  let d = 0;
  for (let t = 0; t < length; t++) {
    const x = spend[offset + t]!;
    const dropped = t >= maxLag ? spend[offset + t - maxLag]! : 0;
    d = s + alpha * d - lagTimesPow * dropped;
    s = x + alpha * s - alphaPowLag * dropped;
    out[outOffset + t] = s * invWeightSum;
    dOut[outOffset + t] = d * invWeightSum - s * dScale;
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
