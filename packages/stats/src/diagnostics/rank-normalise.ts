import { normalQuantile } from "./normal-quantile";

/**
 * Rank normalisation (Vehtari et al. 2021, Bayesian Analysis 16(2), eq. 14): pooled ranks
 * over all chains, ties averaged, mapped through Φ⁻¹((r − 3/8) / (S + 1/4)) (Blom 1958).
 * Returns chains of the same shapes.
 */
export function rankNormalise(chains: readonly Float64Array[]): Float64Array[] {
  const ranks = pooledRanks(chains);
  const total = ranks.length;
  const out: Float64Array[] = [];
  let offset = 0;
  for (const chain of chains) {
    const z = new Float64Array(chain.length);
    for (let i = 0; i < chain.length; i++) z[i] = normalQuantile((ranks[offset + i]! - 0.375) / (total - 0.75 + 1));
    offset += chain.length;
    out.push(z);
  }
  return out;
}

/** Ranks (1-based, ties averaged) of all draws of all chains pooled, in chain order. */
export function pooledRanks(chains: readonly Float64Array[]): Float64Array {
  let total = 0;
  for (const c of chains) total += c.length;
  const values = new Float64Array(total);
  let offset = 0;
  for (const c of chains) {
    values.set(c, offset);
    offset += c.length;
  }
  const order = new Uint32Array(total);
  for (let i = 0; i < total; i++) order[i] = i;
  order.sort((a, b) => values[a]! - values[b]!);
  const ranks = new Float64Array(total);
  let i = 0;
  while (i < total) {
    let j = i;
    while (j + 1 < total && values[order[j + 1]!] === values[order[i]!]) j++;
    const rank = (i + j) / 2 + 1;
    for (let k = i; k <= j; k++) ranks[order[k]!] = rank;
    i = j + 1;
  }
  return ranks;
}
