/**
 * Energy Bayesian fraction of missing information of one chain (Betancourt 2016,
 * arXiv:1604.00695, eq. 3.4 estimator): Σ (E_n − E_{n−1})² / Σ (E_n − Ē)².
 * Values below 0.3 suggest the momentum resampling explores the energy poorly (common practice).
 */
export function ebfmi(energy: ArrayLike<number>): number {
  const n = energy.length;
  if (n < 2) return Number.NaN;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += energy[i]!;
  mean /= n;
  let numerator = 0;
  let denominator = 0;
  for (let i = 0; i < n; i++) {
    const d = energy[i]! - mean;
    denominator += d * d;
    if (i > 0) {
      const step = energy[i]! - energy[i - 1]!;
      numerator += step * step;
    }
  }
  return numerator / denominator;
}
