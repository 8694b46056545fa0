import { betaQuantile } from "./beta-quantile";
import { essMean, essQuantile } from "./ess";
import { pooled, variance } from "./moments";
import { sortedCopy } from "./quantile";

/** Monte Carlo standard error of the mean: sd / √ESS_mean (Vehtari et al. 2021, §3.2; posterior's mcse_mean). */
export function mcseMean(chains: readonly Float64Array[]): number {
  return Math.sqrt(variance(pooled(chains))) / Math.sqrt(essMean(chains));
}

/**
 * Monte Carlo standard error of the p-quantile (Vehtari et al. 2021, §4.4; posterior's
 * mcse_quantile): half the distance between the order statistics at the ±1 sd points of
 * the Beta(ESS·p + 1, ESS·(1 − p) + 1) distribution of the quantile's rank.
 * `quantileEss` may pass a precomputed essQuantile(chains, probability), `sortedPooled` all draws sorted.
 */
export function mcseQuantile(chains: readonly Float64Array[], probability: number, quantileEss?: number, sortedPooled?: Float64Array): number {
  const ess = quantileEss ?? essQuantile(chains, probability, sortedPooled);
  if (Number.isNaN(ess)) return Number.NaN;
  const a1 = betaQuantile(0.1586553, ess * probability + 1, ess * (1 - probability) + 1);
  const a2 = betaQuantile(0.8413447, ess * probability + 1, ess * (1 - probability) + 1);
  const sorted = sortedPooled ?? sortedCopy(pooled(chains));
  const s = sorted.length;
  const lower = sorted[Math.max(Math.floor(a1 * s), 1) - 1]!;
  const upper = sorted[Math.min(Math.ceil(a2 * s), s) - 1]!;
  return (upper - lower) / 2;
}
