import { autocovariance, createAutocovarianceWorkspace, nextSmoothSize } from "./autocovariance";
import { isDegenerate, mean, pooled, variance } from "./moments";
import { quantileSorted, sortedCopy } from "./quantile";
import { rankNormalise } from "./rank-normalise";
import { splitChains } from "./split-chains";

/**
 * Effective sample size of chains of equal length (Vehtari et al. 2021, Bayesian Analysis
 * 16(2), §3.2): multi-chain autocorrelations, Geyer's initial positive and monotone
 * sequences (Geyer 1992), the antithetic-case improvement and the cap S·log10(S), as in
 * R's posterior. NaN for fewer than 3 draws per chain or non-finite/constant draws.
 */
export function essOfChains(chains: readonly Float64Array[]): number {
  const m = chains.length;
  if (m === 0) return Number.NaN;
  const n = chains[0]!.length;
  for (const c of chains) if (c.length !== n) throw new Error("all chains must have the same number of draws");
  if (n < 3 || isDegenerate(chains)) return Number.NaN;

  const meanAcov = meanAutocovariance(chains, n);
  const chainMeans = Float64Array.from(chains, (c) => mean(c));
  const meanVar = (meanAcov(0) * n) / (n - 1);
  let varPlus = (meanVar * (n - 1)) / n;
  if (m > 1) varPlus += variance(chainMeans);

  const rho = new Float64Array(n);
  let t = 0;
  let rhoEven = 1;
  rho[0] = rhoEven;
  let rhoOdd = 1 - (meanVar - meanAcov(1)) / varPlus;
  rho[1] = rhoOdd;
  while (t < n - 5 && !Number.isNaN(rhoEven + rhoOdd) && rhoEven + rhoOdd > 0) {
    t += 2;
    rhoEven = 1 - (meanVar - meanAcov(t)) / varPlus;
    rhoOdd = 1 - (meanVar - meanAcov(t + 1)) / varPlus;
    if (rhoEven + rhoOdd >= 0) {
      rho[t] = rhoEven;
      rho[t + 1] = rhoOdd;
    }
  }
  const maxT = t;
  if (rhoEven > 0) rho[maxT] = rhoEven;

  t = 0;
  while (t <= maxT - 4) {
    t += 2;
    if (rho[t]! + rho[t + 1]! > rho[t - 2]! + rho[t - 1]!) {
      rho[t] = (rho[t - 2]! + rho[t - 1]!) / 2;
      rho[t + 1] = rho[t]!;
    }
  }
  const draws = m * n;
  let sum = 0;
  for (let i = 0; i < maxT; i++) sum += rho[i]!;
  let tau = -1 + 2 * sum + rho[maxT]!;
  tau = Math.max(tau, 1 / Math.log10(draws));
  return draws / tau;
}

/** Lags computed by direct sums before switching to FFT (well-mixing chains need few lags). */
const directLagLimit = 48;

/**
 * Mean over chains of the autocovariance at a lag, on demand: direct sums for the first
 * lags (O(N) each), all lags by FFT once a longer sequence is needed. Both give the same
 * values as posterior's FFT estimate up to rounding.
 */
function meanAutocovariance(chains: readonly Float64Array[], n: number): (lag: number) => number {
  const m = chains.length;
  const centred = chains.map((c) => {
    const mu = mean(c);
    return Float64Array.from(c, (x) => x - mu);
  });
  const scale = nextSmoothSize(n) / (n * n);
  const direct = new Float64Array(directLagLimit);
  let known = 0;
  let full: Float64Array | undefined;
  return (lag: number): number => {
    if (full !== undefined) return full[lag]!;
    if (lag < directLagLimit) {
      while (known <= lag) {
        let sum = 0;
        for (const c of centred) {
          let s = 0;
          for (let i = 0; i + known < n; i++) s += c[i]! * c[i + known]!;
          sum += s;
        }
        direct[known] = (sum * scale) / m;
        known++;
      }
      return direct[lag]!;
    }
    const workspace = createAutocovarianceWorkspace(n);
    full = new Float64Array(n);
    for (const c of chains) {
      const acov = autocovariance(c, workspace);
      for (let i = 0; i < n; i++) full[i] = full[i]! + acov[i]! / m;
    }
    return full[lag]!;
  };
}

/** ESS for the mean: split chains, no rank normalisation (posterior's ess_mean / ess_basic). */
export function essMean(chains: readonly Float64Array[]): number {
  return essOfChains(splitChains(chains));
}

/** Bulk ESS: rank-normalised split chains (Vehtari et al. 2021, §4.3). */
export function essBulk(chains: readonly Float64Array[]): number {
  if (isDegenerate(chains)) return Number.NaN;
  return essOfChains(rankNormalise(splitChains(chains)));
}

/** ESS of the indicator I(x ≤ q_p), for a quantile estimate (Vehtari et al. 2021, §4.3); `sortedPooled` may pass all draws sorted. */
export function essQuantile(chains: readonly Float64Array[], probability: number, sortedPooled?: Float64Array): number {
  if (!(probability >= 0 && probability <= 1)) throw new Error(`probability must be in [0, 1], got ${String(probability)}`);
  if (isDegenerate(chains)) return Number.NaN;
  const q = quantileSorted(sortedPooled ?? sortedCopy(pooled(chains)), probability);
  const indicators = chains.map((c) => Float64Array.from(c, (v) => (v <= q ? 1 : 0)));
  return essOfChains(splitChains(indicators));
}

/** Tail ESS: the smaller of the ESS of the 5 % and 95 % quantiles (Vehtari et al. 2021, §4.3). */
export function essTail(chains: readonly Float64Array[]): number {
  return Math.min(essQuantile(chains, 0.05), essQuantile(chains, 0.95));
}
