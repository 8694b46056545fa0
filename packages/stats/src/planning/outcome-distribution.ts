import { quantileSorted } from "../decisions/draw-summary";

/** An outcome over posterior draws, ready to summarise and to draw as a histogram. */
export interface OutcomeDistribution {
  readonly mean: number;
  readonly sd: number;
  readonly q05: number;
  readonly q50: number;
  readonly q95: number;
  /** The outcome per posterior draw, in draw order. */
  readonly draws: Float64Array;
  /** Counts per bin; bin i covers [edges[i], edges[i+1]) (the last bin includes its right edge). */
  readonly histogram: { readonly edges: Float64Array; readonly counts: Uint32Array };
}

/**
 * Distributions of several outcomes over the same draws, binned on shared edges (equal
 * width over the pooled range) so that their histograms can be drawn on one axis.
 */
export function outcomeDistributions(samples: readonly Float64Array[], bins: number): OutcomeDistribution[] {
  if (!Number.isInteger(bins) || bins < 1) throw new RangeError(`histogram bins must be a whole number ≥ 1, got ${bins}`);
  let min = Infinity;
  let max = -Infinity;
  for (const s of samples) {
    for (let i = 0; i < s.length; i++) {
      min = Math.min(min, s[i]!);
      max = Math.max(max, s[i]!);
    }
  }
  if (!(max > min)) {
    const pad = Math.max(Math.abs(min) * 1e-6, 1e-9);
    min -= pad;
    max += pad;
  }
  const edges = new Float64Array(bins + 1);
  for (let i = 0; i <= bins; i++) edges[i] = min + ((max - min) * i) / bins;
  edges[bins] = max;
  return samples.map((draws) => {
    const n = draws.length;
    const sorted = Float64Array.from(draws).sort();
    let mean = 0;
    let m2 = 0;
    const counts = new Uint32Array(bins);
    for (let i = 0; i < n; i++) {
      const x = sorted[i]!;
      const delta = x - mean;
      mean += delta / (i + 1);
      m2 += delta * (x - mean);
      const bin = Math.min(bins - 1, Math.max(0, Math.floor(((x - min) / (max - min)) * bins)));
      counts[bin] = counts[bin]! + 1;
    }
    return {
      mean,
      sd: n > 1 ? Math.sqrt(m2 / (n - 1)) : 0,
      q05: quantileSorted(sorted, 0.05),
      q50: quantileSorted(sorted, 0.5),
      q95: quantileSorted(sorted, 0.95),
      draws: Float64Array.from(draws),
      histogram: { edges, counts },
    };
  });
}
