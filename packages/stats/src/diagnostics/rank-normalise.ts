import { normalQuantile } from "./normal-quantile";

/**
 * Rank normalisation (Vehtari et al. 2021, Bayesian Analysis 16(2), eq. 14): pooled ranks
 * over all chains, ties averaged, mapped through Φ⁻¹((r − 3/8) / (S + 1/4)) (Blom 1958).
 * Returns chains of the same shapes. `sortedPooled` may pass all draws already sorted.
 */
export function rankNormalise(chains: readonly Float64Array[], sortedPooled?: Float64Array): Float64Array[] {
  const ranks = pooledRanks(chains, sortedPooled);
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
export function pooledRanks(chains: readonly Float64Array[], sortedPooled?: Float64Array): Float64Array {
  let total = 0;
  for (const c of chains) total += c.length;
  let sorted = sortedPooled;
  if (sorted === undefined) {
    sorted = new Float64Array(total);
    let at = 0;
    for (const c of chains) {
      sorted.set(c, at);
      at += c.length;
    }
    sorted.sort();
  } else if (sorted.length !== total) {
    throw new Error("sorted draws must hold every draw of the chains");
  }
  const ranks = new Float64Array(total);
  let offset = 0;
  for (const c of chains) {
    for (let i = 0; i < c.length; i++) {
      const v = c[i]!;
      // First index holding v and first index past it; the tied block shares the mean rank.
      const first = lowerBound(sorted, v);
      const past = upperBound(sorted, v, first);
      ranks[offset + i] = (first + 1 + past) / 2;
    }
    offset += c.length;
  }
  return ranks;
}

function lowerBound(sorted: Float64Array, v: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid]! < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function upperBound(sorted: Float64Array, v: number, from: number): number {
  let lo = from;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid]! <= v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
