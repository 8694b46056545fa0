// Normal–normal partial pooling: with the population mean μ, scale τ and the noise σ known,
// each group's posterior is exactly Normal with mean (n/σ²·ȳ + μ/τ²)/(n/σ² + 1/τ²)
// (Gelman & Hill 2007, ch. 12, eq. 12.1). A sampler run must reproduce it, and thin
// groups must move further toward μ.
import { describe, expect, it } from "vitest";
import type { DensityModel } from "../../src/model/density-model";
import { sampleChain } from "../../src/sampler/sample-chain";
import { summariseRun } from "../../src/diagnostics/summarise-run";

const mu = 10;
const tau = 2;
const sigma = 6;
const groups = [
  { n: 2, ybar: 17 },
  { n: 5, ybar: 4 },
  { n: 20, ybar: 15 },
  { n: 80, ybar: 7 },
  { n: 200, ybar: 13 },
];

/** θ_j ~ Normal(μ, τ), ȳ_j ~ Normal(θ_j, σ/√n_j): the exact posterior is Normal. */
const model: DensityModel = {
  dimension: groups.length,
  constrainedNames: groups.map((_, j) => `theta[${j}]`),
  logDensityGradient(q, grad) {
    let lp = 0;
    groups.forEach(({ n, ybar }, j) => {
      const theta = q[j]!;
      const prior = (theta - mu) / tau;
      const data = (ybar - theta) / (sigma / Math.sqrt(n));
      lp += -0.5 * prior * prior - 0.5 * data * data;
      grad[j] = -prior / tau + (data * Math.sqrt(n)) / sigma;
    });
    return lp;
  },
  constrain(q, out) {
    out.set(q);
  },
};

describe("partial pooling in the normal–normal model", () => {
  const chains = [0, 1, 2, 3].map((i) => sampleChain(model, { chains: 4, warmup: 500, draws: 1500, seed: 31, maxTreeDepth: 10, targetAcceptance: 0.8 }, i));
  const summary = summariseRun(chains);

  it("matches the exact posterior means (Gelman & Hill 2007, ch. 12)", () => {
    groups.forEach(({ n, ybar }, j) => {
      const precision = n / sigma ** 2 + 1 / tau ** 2;
      const exactMean = (n / sigma ** 2 * ybar + mu / tau ** 2) / precision;
      const p = summary.parameters[j]!;
      expect(Math.abs(p.mean - exactMean)).toBeLessThan(4 * p.mcseMean);
      expect(p.sd).toBeCloseTo(1 / Math.sqrt(precision), 1);
    });
  });

  it("shrinks thin groups more: (ȳ − posterior mean)/(ȳ − μ) falls with n", () => {
    const shrinkage = groups.map(({ ybar }, j) => (ybar - summary.parameters[j]!.mean) / (ybar - mu));
    // exact: (1/τ²)/(n/σ² + 1/τ²) = 0.82, 0.64, 0.31, 0.10, 0.04
    groups.forEach(({ n }, j) => expect(shrinkage[j]).toBeCloseTo(1 / tau ** 2 / (n / sigma ** 2 + 1 / tau ** 2), 1));
    for (let j = 1; j < groups.length; j++) expect(shrinkage[j]!).toBeLessThan(shrinkage[j - 1]!);
  });
});
