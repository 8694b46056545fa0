import { describe, expect, it } from "vitest";
import reference from "../fixtures/eight-schools.json";
import { mcseQuantile } from "../../src/diagnostics/mcse";
import { summariseRun } from "../../src/diagnostics/summarise-run";
import { buildModel } from "../../src/models/registry";
import { sampleChain } from "../../src/sampler/sample-chain";
import type { SamplerSettings } from "../../src/sampler/sampler-settings";

// Reference: rstan 2.21.7, 200,000 draws of the non-centred eight-schools model
// (data Rubin 1981 / BDA3 §5.5), summarised with R's posterior; see test/fixtures/README.md.
interface ReferenceRow {
  mean: number;
  q05: number;
  q50: number;
  q95: number;
  mcse_mean: number;
  mcse_q05: number;
  mcse_q50: number;
  mcse_q95: number;
}
const ref = reference as unknown as { data: { y: number[]; sigma: number[] }; posterior: Record<string, ReferenceRow> };

describe("eight schools, non-centred, against rstan", () => {
  const spec = { kind: "eight-schools-noncentred", data: { y: ref.data.y, sigma: ref.data.sigma } };
  const settings: SamplerSettings = { chains: 4, warmup: 1000, draws: 2000, seed: 20240601, maxTreeDepth: 10, targetAcceptance: 0.9 };
  const model = buildModel(spec);
  const chains = Array.from({ length: settings.chains }, (_, k) => sampleChain(model, settings, k));
  const summary = summariseRun(chains);
  const row = (name: string) => summary.parameters.find((p) => p.name === name)!;
  const column = (name: string): Float64Array[] => {
    const j = chains[0]!.names.indexOf(name);
    const width = chains[0]!.names.length;
    return chains.map((c) => Float64Array.from({ length: c.draws.length / width }, (_, i) => c.draws[i * width + j]!));
  };

  const names = ["mu", "tau", ...Array.from({ length: 8 }, (_, j) => `theta[${j + 1}]`)];
  for (const name of names) {
    it(`${name}: mean and 5/50/95 % quantiles within 3 combined MCSE of rstan`, () => {
      const mine = row(name);
      const theirs = ref.posterior[name]!;
      const mcseQ50 = mcseQuantile(column(name), 0.5);
      const checks: [number, number, number, number][] = [
        [mine.mean, theirs.mean, mine.mcseMean, theirs.mcse_mean],
        [mine.q05, theirs.q05, mine.mcseQ05, theirs.mcse_q05],
        [mine.q50, theirs.q50, mcseQ50, theirs.mcse_q50],
        [mine.q95, theirs.q95, mine.mcseQ95, theirs.mcse_q95],
      ];
      for (const [a, b, sa, sb] of checks) {
        expect(Number.isFinite(a) && Number.isFinite(sa)).toBe(true);
        expect(Math.abs(a - b)).toBeLessThan(3 * Math.hypot(sa, sb));
      }
    });
  }

  it("converges: R-hat ≤ 1.01, bulk ESS ≥ 400 for every parameter", () => {
    expect(summary.diagnostics.maxRhat).toBeLessThanOrEqual(1.01);
    expect(summary.diagnostics.minEssBulk).toBeGreaterThanOrEqual(400);
  });
});
