import type { DensityModel } from "../../src/model/density-model";
import { sampleChain } from "../../src/sampler/sample-chain";
import { summariseRun, type RunSummary } from "../../src/diagnostics/summarise-run";
import type { ChainResult } from "../../src/sampler/sampler-settings";
import { combineIndependentDraws } from "../../src/model/portfolio/build-portfolio-model";

export interface Fit {
  readonly names: readonly string[];
  /** All chains' draws stacked, row-major. */
  readonly draws: Float64Array;
  readonly chains: readonly ChainResult[];
  readonly summary: RunSummary;
}

/** Runs `chains` chains in this thread with a fixed seed (small runs for tests). */
export function fitModel(model: DensityModel, seed: number, chains = 4, warmup = 400, draws = 400): Fit {
  const results = Array.from({ length: chains }, (_, i) =>
    sampleChain(model, { chains, warmup, draws, seed, maxTreeDepth: 10, targetAcceptance: 0.8 }, i),
  );
  const width = model.constrainedNames.length;
  const stacked = new Float64Array(results.reduce((a, r) => a + r.draws.length, 0));
  let at = 0;
  for (const r of results) {
    stacked.set(r.draws, at);
    at += r.draws.length;
  }
  if (stacked.length % width !== 0) throw new Error("draws do not match names");
  return { names: model.constrainedNames, draws: stacked, chains: results, summary: summariseRun(results) };
}

/** Fits independent models (e.g. the unpooled cells) and joins their draws column-wise. */
export function fitIndependent(models: readonly DensityModel[], seed: number, chains = 4, warmup = 400, draws = 400): { names: string[]; draws: Float64Array; fits: Fit[] } {
  const fits = models.map((m, i) => fitModel(m, seed + 7919 * (i + 1), chains, warmup, draws));
  const joined = combineIndependentDraws(fits.map((f) => ({ names: f.names, draws: f.draws })));
  return { names: joined.names, draws: joined.draws, fits };
}

/** Draws of one named column. */
export function columnOf(fit: { names: readonly string[]; draws: Float64Array }, name: string): Float64Array {
  const j = fit.names.indexOf(name);
  if (j < 0) throw new Error(`no column ${name}`);
  const width = fit.names.length;
  const n = fit.draws.length / width;
  return Float64Array.from({ length: n }, (_, i) => fit.draws[i * width + j]!);
}

export function quantile(values: Float64Array, p: number): number {
  const s = Float64Array.from(values).sort();
  const h = (s.length - 1) * p;
  const lo = Math.floor(h);
  return s[lo]! + (h - lo) * (s[Math.min(lo + 1, s.length - 1)]! - s[lo]!);
}
