/**
 * Splits each chain into its first and second half (Vehtari et al. 2021, Bayesian
 * Analysis 16(2), §3); with an odd length the middle draw is dropped, as R's posterior does.
 */
export function splitChains(chains: readonly Float64Array[]): Float64Array[] {
  const out: Float64Array[] = [];
  for (const chain of chains) {
    const n = chain.length;
    if (n < 2) {
      out.push(chain);
      continue;
    }
    const half = Math.floor(n / 2);
    out.push(chain.subarray(0, half), chain.subarray(n - half));
  }
  return out;
}
