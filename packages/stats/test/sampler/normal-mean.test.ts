import { describe, expect, it } from "vitest";
import { mcseMean } from "../../src/diagnostics/mcse";
import { normalMeanPosterior, type NormalMeanData } from "../../src/models/examples/normal-mean";
import { buildModel } from "../../src/models/registry";
import { sampleChain } from "../../src/sampler/sample-chain";

describe("normal mean with known variance and a normal prior", () => {
  // Observations: the eight estimated effects of Rubin (1981) treated as draws with a common
  // known sd of 12; prior N(0, 5²). The posterior is normal in closed form (BDA3 §2.5).
  const data: NormalMeanData = { y: [28, 8, -3, 7, -1, 1, 18, 12], sigma: 12, priorMean: 0, priorSd: 5 };
  const exact = normalMeanPosterior(data);
  const model = buildModel({ kind: "normal-mean", data });
  const settings = { chains: 4, warmup: 500, draws: 1000, seed: 31, maxTreeDepth: 10, targetAcceptance: 0.8 };
  const chains = Array.from({ length: 4 }, (_, k) => Float64Array.from(sampleChain(model, settings, k).draws));

  it("closed form by hand: precision 1/25 + 8/144, mean (8·ȳ/144)/precision", () => {
    const precision = 1 / 25 + 8 / 144;
    expect(exact.variance).toBeCloseTo(1 / precision, 12);
    expect(exact.mean).toBeCloseTo(((8 * 8.75) / 144) / precision, 12);
  });

  it("recovers the exact posterior mean within 3 MCSE", () => {
    const all = chains.flatMap((c) => Array.from(c));
    const mean = all.reduce((a, b) => a + b, 0) / all.length;
    expect(Math.abs(mean - exact.mean)).toBeLessThan(3 * mcseMean(chains));
  });

  it("recovers the exact posterior variance within 3 MCSE of E[(μ − m)²]", () => {
    const squared = chains.map((c) => Float64Array.from(c, (x) => (x - exact.mean) ** 2));
    const all = squared.flatMap((c) => Array.from(c));
    const second = all.reduce((a, b) => a + b, 0) / all.length;
    expect(Math.abs(second - exact.variance)).toBeLessThan(3 * mcseMean(squared));
  });
});
