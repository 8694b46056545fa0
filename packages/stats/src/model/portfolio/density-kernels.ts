/**
 * The portfolio density's loops over the weeks, one cell × channel (or one cell) at a time.
 * The saturation reads the unnormalised adstock S[t] = Σ_{l<L} α^l x[t−l] and D[t] = dS/dα
 * (adstockSumsUnchecked); the normalisation a = S/W is folded into its constants.
 */

/**
 * Exponential saturation r = θ(1 − e) with e = exp(−a/θ), a = S/W: writes e for t < n at
 * `at + t` and returns Σ_t (1 − e) = Σ_t r/θ. `kappa` is 1/(W·θ).
 */
export function exponentialSaturation(s: Float64Array, at: number, n: number, kappa: number, e: Float64Array): number {
  const minusKappa = -kappa;
  let sum = 0;
  for (let t = 0; t < n; t++) {
    const ev = Math.exp(minusKappa * s[at + t]!);
    e[at + t] = ev;
    sum += 1 - ev;
  }
  return sum;
}

/**
 * Hill saturation r = θ·p with p = u/(1+u), u = (a/θ)^k, a = S/W. With w = 1/(1+u) and
 * q = p·w = u/(1+u)², the partial derivatives are dr/dθ = p − k·q, dr/dk = θ·q·log(a/θ)
 * and (dr/da)·(da/dα) = k·θ·q·(D/S − W′/W). Writes p, q, q·(D/S − W′/W) and q·log(a/θ)
 * for t < n at `at + t` and returns Σ_t p.
 *
 * Where the window holds no spend (S ≤ 0) r and its θ and k derivatives are 0; dr/da is 1
 * for k = 1 (else 0), so the third value is then (da/dα)/θ for k = 1 and 0 otherwise.
 * `kappa` is 1/(W·θ), `invWeightSum` 1/W, `dScale` W′/W², `weightRatio` W′/W.
 */
export function hillSaturation(
  s: Float64Array,
  d: Float64Array,
  at: number,
  n: number,
  kappa: number,
  invWeightSum: number,
  dScale: number,
  weightRatio: number,
  theta: number,
  shape: number,
  p: Float64Array,
  q: Float64Array,
  qAlpha: Float64Array,
  qShape: Float64Array,
): number {
  const slopeAtZero = shape === 1 ? 1 / theta : 0;
  let sum = 0;
  for (let t = 0; t < n; t++) {
    const i = at + t;
    const sv = s[i]!;
    if (sv > 0) {
      const logRatio = Math.log(sv * kappa);
      const u = Math.exp(shape * logRatio);
      const w = 1 / (1 + u);
      const pv = u * w;
      const qv = pv * w;
      p[i] = pv;
      q[i] = qv;
      qAlpha[i] = qv * (d[i]! / sv - weightRatio);
      qShape[i] = qv * logRatio;
      sum += pv;
    } else {
      p[i] = 0;
      q[i] = 0;
      qAlpha[i] = slopeAtZero * (d[i]! * invWeightSum - sv * dScale);
      qShape[i] = 0;
    }
  }
  return sum;
}

/**
 * y[yAt + t] = intercept + slope·trend[trendAt + t] + Σ_j factor·coef[coefAt + j]·X[xAt + j·stride + t]
 * for t < n and j < count: the line and up to four columns in one pass, the rest by addColumns.
 */
export function setLineAndColumns(
  y: Float64Array,
  yAt: number,
  intercept: number,
  slope: number,
  trend: Float64Array,
  trendAt: number,
  X: Float64Array,
  xAt: number,
  stride: number,
  coef: Float64Array,
  coefAt: number,
  factor: number,
  count: number,
  n: number,
): void {
  const x0 = xAt;
  const x1 = x0 + stride;
  const x2 = x1 + stride;
  const x3 = x2 + stride;
  let done: number;
  if (count >= 4) {
    const c0 = factor * coef[coefAt]!;
    const c1 = factor * coef[coefAt + 1]!;
    const c2 = factor * coef[coefAt + 2]!;
    const c3 = factor * coef[coefAt + 3]!;
    for (let t = 0; t < n; t++) {
      y[yAt + t] = intercept + slope * trend[trendAt + t]! + c0 * X[x0 + t]! + c1 * X[x1 + t]! + c2 * X[x2 + t]! + c3 * X[x3 + t]!;
    }
    done = 4;
  } else if (count >= 2) {
    const c0 = factor * coef[coefAt]!;
    const c1 = factor * coef[coefAt + 1]!;
    for (let t = 0; t < n; t++) y[yAt + t] = intercept + slope * trend[trendAt + t]! + c0 * X[x0 + t]! + c1 * X[x1 + t]!;
    done = 2;
  } else {
    for (let t = 0; t < n; t++) y[yAt + t] = intercept + slope * trend[trendAt + t]!;
    done = 0;
  }
  if (count > done) addColumns(y, yAt, X, xAt + done * stride, stride, coef, coefAt + done, factor, count - done, n);
}

/**
 * y[yAt + t] += Σ_j factor·coef[coefAt + j] · X[xAt + j·stride + t] for t < n and j < count,
 * four columns per pass over y.
 */
export function addColumns(
  y: Float64Array,
  yAt: number,
  X: Float64Array,
  xAt: number,
  stride: number,
  coef: Float64Array,
  coefAt: number,
  factor: number,
  count: number,
  n: number,
): void {
  let j = 0;
  for (; j + 4 <= count; j += 4) {
    const c0 = factor * coef[coefAt + j]!;
    const c1 = factor * coef[coefAt + j + 1]!;
    const c2 = factor * coef[coefAt + j + 2]!;
    const c3 = factor * coef[coefAt + j + 3]!;
    const x0 = xAt + j * stride;
    const x1 = x0 + stride;
    const x2 = x1 + stride;
    const x3 = x2 + stride;
    for (let t = 0; t < n; t++) {
      y[yAt + t] = y[yAt + t]! + c0 * X[x0 + t]! + c1 * X[x1 + t]! + c2 * X[x2 + t]! + c3 * X[x3 + t]!;
    }
  }
  for (; j + 2 <= count; j += 2) {
    const c0 = factor * coef[coefAt + j]!;
    const c1 = factor * coef[coefAt + j + 1]!;
    const x0 = xAt + j * stride;
    const x1 = x0 + stride;
    for (let t = 0; t < n; t++) y[yAt + t] = y[yAt + t]! + c0 * X[x0 + t]! + c1 * X[x1 + t]!;
  }
  for (; j < count; j++) {
    const c0 = factor * coef[coefAt + j]!;
    const x0 = xAt + j * stride;
    for (let t = 0; t < n; t++) y[yAt + t] = y[yAt + t]! + c0 * X[x0 + t]!;
  }
}

/**
 * out[outAt + j] += factor · Σ_t r[rAt + t] · X[xAt + j·stride + t] for j < count,
 * four columns per pass over r.
 */
export function addColumnDots(
  r: Float64Array,
  rAt: number,
  X: Float64Array,
  xAt: number,
  stride: number,
  count: number,
  n: number,
  factor: number,
  out: Float64Array,
  outAt: number,
): void {
  let j = 0;
  for (; j + 4 <= count; j += 4) {
    const x0 = xAt + j * stride;
    const x1 = x0 + stride;
    const x2 = x1 + stride;
    const x3 = x2 + stride;
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    for (let t = 0; t < n; t++) {
      const rt = r[rAt + t]!;
      s0 += rt * X[x0 + t]!;
      s1 += rt * X[x1 + t]!;
      s2 += rt * X[x2 + t]!;
      s3 += rt * X[x3 + t]!;
    }
    out[outAt + j] = out[outAt + j]! + factor * s0;
    out[outAt + j + 1] = out[outAt + j + 1]! + factor * s1;
    out[outAt + j + 2] = out[outAt + j + 2]! + factor * s2;
    out[outAt + j + 3] = out[outAt + j + 3]! + factor * s3;
  }
  for (; j < count; j++) {
    const x0 = xAt + j * stride;
    let s0 = 0;
    for (let t = 0; t < n; t++) s0 += r[rAt + t]! * X[x0 + t]!;
    out[outAt + j] = out[outAt + j]! + factor * s0;
  }
}

/**
 * The baseline's share of the gradient and the centring of r in one go:
 * out[trendOutAt] += trendFactor·Σ_t r[t]·trend[t], out[outAt + j] += factor·Σ_t r[t]·X_j[t]
 * (as addColumnDots), then r[t] is replaced by r[t] − rMean; returns Σ_t (r[t] − rMean).
 * Up to four columns share the last pass over r.
 */
export function lineAndColumnDotsThenCentre(
  r: Float64Array,
  rAt: number,
  rMean: number,
  trend: Float64Array,
  trendAt: number,
  trendFactor: number,
  X: Float64Array,
  xAt: number,
  stride: number,
  factor: number,
  count: number,
  n: number,
  out: Float64Array,
  trendOutAt: number,
  outAt: number,
): number {
  const last = count >= 4 ? 4 : count >= 2 ? 2 : 0;
  const first = count - last;
  if (first > 0) addColumnDots(r, rAt, X, xAt, stride, first, n, factor, out, outAt);
  const x0 = xAt + first * stride;
  const x1 = x0 + stride;
  const x2 = x1 + stride;
  const x3 = x2 + stride;
  let sTrend = 0;
  let sCentred = 0;
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  if (last === 4) {
    for (let t = 0; t < n; t++) {
      const rt = r[rAt + t]!;
      sTrend += rt * trend[trendAt + t]!;
      s0 += rt * X[x0 + t]!;
      s1 += rt * X[x1 + t]!;
      s2 += rt * X[x2 + t]!;
      s3 += rt * X[x3 + t]!;
      const centred = rt - rMean;
      r[rAt + t] = centred;
      sCentred += centred;
    }
  } else if (last === 2) {
    for (let t = 0; t < n; t++) {
      const rt = r[rAt + t]!;
      sTrend += rt * trend[trendAt + t]!;
      s0 += rt * X[x0 + t]!;
      s1 += rt * X[x1 + t]!;
      const centred = rt - rMean;
      r[rAt + t] = centred;
      sCentred += centred;
    }
  } else {
    for (let t = 0; t < n; t++) {
      const rt = r[rAt + t]!;
      sTrend += rt * trend[trendAt + t]!;
      const centred = rt - rMean;
      r[rAt + t] = centred;
      sCentred += centred;
    }
  }
  out[trendOutAt] = out[trendOutAt]! + trendFactor * sTrend;
  const o = outAt + first;
  if (last >= 2) {
    out[o] = out[o]! + factor * s0;
    out[o + 1] = out[o + 1]! + factor * s1;
  }
  if (last === 4) {
    out[o + 2] = out[o + 2]! + factor * s2;
    out[o + 3] = out[o + 3]! + factor * s3;
  }
  return sCentred;
}
