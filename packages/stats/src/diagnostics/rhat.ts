import { isDegenerate, mean, pooled, variance } from "./moments";
import { quantile } from "./quantile";
import { rankNormalise } from "./rank-normalise";
import { splitChains } from "./split-chains";

/** Potential scale reduction of chains as given (Gelman & Rubin 1992; BDA3 §11.4). */
export function rhatOfChains(chains: readonly Float64Array[]): number {
  if (chains.length === 0 || isDegenerate(chains)) return Number.NaN;
  const n = chains[0]!.length;
  for (const c of chains) if (c.length !== n) throw new Error("all chains must have the same number of draws");
  const means = Float64Array.from(chains, (c) => mean(c));
  const variances = Float64Array.from(chains, (c) => variance(c));
  const between = n * variance(means);
  const within = mean(variances);
  return Math.sqrt((between / within + n - 1) / n);
}

/** Split R-hat without rank normalisation (posterior's rhat_basic). */
export function rhatBasic(chains: readonly Float64Array[], split = true): number {
  return rhatOfChains(split ? splitChains(chains) : chains);
}

/**
 * Rank-normalised split R-hat: the larger of the bulk R-hat and the folded (tail) R-hat of
 * |x − median| (Vehtari et al. 2021, Bayesian Analysis 16(2), §4.2).
 */
export function rhat(chains: readonly Float64Array[]): number {
  if (chains.length === 0 || isDegenerate(chains)) return Number.NaN;
  const bulk = rhatOfChains(rankNormalise(splitChains(chains)));
  const median = quantile(pooled(chains), 0.5);
  const folded = chains.map((c) => Float64Array.from(c, (v) => Math.abs(v - median)));
  const tail = rhatOfChains(rankNormalise(splitChains(folded)));
  return Math.max(bulk, tail);
}
