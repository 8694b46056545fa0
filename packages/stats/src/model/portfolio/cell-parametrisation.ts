import { adstockGeometricUnchecked } from "../adstock";
import type { PortfolioConstants } from "./portfolio-constants";

/**
 * A rough data estimate of each cell effect log β[g,c] and its standard error, from a
 * per-cell least-squares fit of the outcome on the baseline regressors and each channel's
 * saturated adstock at the prior medians (α = 0.5, λ = 2): log β̂ and se(β̂)/β̂. Used only
 * to guide the sampler (see ParameterLayout.guideMean); the posterior does not depend on it.
 * Channels without spend, fits with t < 1 and rank-deficient fits get sd = Infinity.
 */
export function cellEffectEstimates(constants: PortfolioConstants): { mean: Float64Array; sd: Float64Array } {
  const tStatistic = cellEffectTStatistics(constants);
  const mean = new Float64Array(tStatistic.beta.length);
  const sd = new Float64Array(tStatistic.beta.length).fill(Infinity);
  for (let i = 0; i < mean.length; i++) {
    const t = tStatistic.t[i]!;
    if (t >= 1) {
      mean[i] = Math.log(tStatistic.beta[i]!);
      sd[i] = 1 / t;
    }
  }
  return { mean, sd };
}

function cellEffectTStatistics(constants: PortfolioConstants): { beta: Float64Array; t: Float64Array } {
  const k = constants;
  const C = k.channelCount;
  const J = k.seasonalityOrder;
  const K = k.controlCount;
  const strength = new Float64Array(k.cellCount * C);
  const estimate = new Float64Array(k.cellCount * C);
  for (let g = 0; g < k.cellCount; g++) {
    const T = k.weeks[g]!;
    const train = k.trainWeeks[g]!;
    const start = k.weekStart[g]!;
    const active: number[] = [];
    for (let c = 0; c < C; c++) if (k.channelActive[g * C + c] === 1) active.push(c);
    const p = 2 + 2 * J + K + active.length;
    if (train <= p + 1) continue;
    const columns: Float64Array[] = [];
    columns.push(new Float64Array(train).fill(1));
    columns.push(k.trend.slice(start, start + train));
    for (let j = 0; j < 2 * J; j++) columns.push(k.seasonal.slice(k.seasonalStart[g]! + j * T, k.seasonalStart[g]! + j * T + train));
    for (let j = 0; j < K; j++) columns.push(k.controlDesign.slice(k.controlStart[g]! + j * T, k.controlStart[g]! + j * T + train));
    const adstocked = new Float64Array(T);
    for (const c of active) {
      adstockGeometricUnchecked(k.spend, train, 0.5, k.maxLag, adstocked, undefined, k.mediaStart[g * C + c]!, 0);
      const theta = 2 * k.spendMean[g * C + c]!;
      columns.push(Float64Array.from(adstocked.subarray(0, train), (a) => -theta * Math.expm1(-a / theta)));
    }
    // normal equations X'X b = X'y, solved by Cholesky; (X'X)^{-1} diagonal for the standard errors
    const xtx = new Float64Array(p * p);
    const xty = new Float64Array(p);
    for (let i = 0; i < p; i++) {
      const ci = columns[i]!;
      for (let t = 0; t < train; t++) xty[i] = xty[i]! + ci[t]! * k.outcome[start + t]!;
      for (let j = 0; j <= i; j++) {
        const cj = columns[j]!;
        let s = 0;
        for (let t = 0; t < train; t++) s += ci[t]! * cj[t]!;
        xtx[i * p + j] = s;
        xtx[j * p + i] = s;
      }
    }
    const chol = choleskyLower(xtx, p);
    if (chol === undefined) continue;
    const coef = choleskySolve(chol, p, xty);
    let rss = 0;
    for (let t = 0; t < train; t++) {
      let fit = 0;
      for (let i = 0; i < p; i++) fit += coef[i]! * columns[i]![t]!;
      rss += (k.outcome[start + t]! - fit) ** 2;
    }
    const sigma2 = rss / (train - p);
    active.forEach((c, idx) => {
      const i = p - active.length + idx;
      const unit = new Float64Array(p);
      unit[i] = 1;
      const variance = choleskySolve(chol, p, unit)[i]! * sigma2;
      strength[g * C + c] = variance > 0 ? coef[i]! / Math.sqrt(variance) : 0;
      estimate[g * C + c] = coef[i]!;
    });
  }
  return { beta: estimate, t: strength };
}

function choleskyLower(a: Float64Array, n: number): Float64Array | undefined {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * n + j]!;
      for (let m = 0; m < j; m++) s -= l[i * n + m]! * l[j * n + m]!;
      if (i === j) {
        if (!(s > 1e-12 * Math.abs(a[i * n + i]!) && s > 0)) return undefined;
        l[i * n + i] = Math.sqrt(s);
      } else l[i * n + j] = s / l[j * n + j]!;
    }
  }
  return l;
}

function choleskySolve(l: Float64Array, n: number, b: Float64Array): Float64Array {
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = b[i]!;
    for (let m = 0; m < i; m++) s -= l[i * n + m]! * y[m]!;
    y[i] = s / l[i * n + i]!;
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i]!;
    for (let m = i + 1; m < n; m++) s -= l[m * n + i]! * x[m]!;
    x[i] = s / l[i * n + i]!;
  }
  return x;
}
