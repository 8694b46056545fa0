import { describe, expect, it } from "vitest";
import fixtureFile from "../fixtures/convergence-fixtures.json";
import { essBulk, essMean, essQuantile, essTail } from "../../src/diagnostics/ess";
import { mcseMean, mcseQuantile } from "../../src/diagnostics/mcse";
import { rhat, rhatBasic } from "../../src/diagnostics/rhat";
import { summariseParameter } from "../../src/diagnostics/summarise-run";

// Reference values: R package posterior 1.4.0 on the draws in the fixture
// (Vehtari et al. 2021, Bayesian Analysis 16(2):667–718); see test/fixtures/README.md.
interface Fixture {
  draws: number[][];
  expected: Record<"rhat" | "ess_bulk" | "ess_tail" | "mcse_mean" | "mcse_quantile_0.05", number>;
  extra: Record<string, number>;
}
const fixtures = (fixtureFile as unknown as { fixtures: Record<string, Fixture> }).fixtures;

function expectRelative(actual: number, expected: number, tolerance = 1e-6): void {
  expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(tolerance);
}

describe("convergence diagnostics match R's posterior 1.4.0", () => {
  it("has the four draw sets", () => {
    expect(Object.keys(fixtures)).toEqual(["a_iid_normal", "b_ar1_phi0.9", "c_shifted_chain", "d_student_t2"]);
  });

  for (const [name, fixture] of Object.entries(fixtures)) {
    const chains = fixture.draws.map((c) => Float64Array.from(c));
    describe(name, () => {
      it("rank-normalised split R-hat (posterior::rhat)", () => expectRelative(rhat(chains), fixture.expected.rhat));
      it("bulk ESS (posterior::ess_bulk)", () => expectRelative(essBulk(chains), fixture.expected.ess_bulk));
      it("tail ESS (posterior::ess_tail)", () => expectRelative(essTail(chains), fixture.expected.ess_tail));
      it("MCSE of the mean (posterior::mcse_mean)", () => expectRelative(mcseMean(chains), fixture.expected.mcse_mean));
      it("MCSE of the 5 % quantile (posterior::mcse_quantile)", () =>
        expectRelative(mcseQuantile(chains, 0.05), fixture.expected["mcse_quantile_0.05"]));
      it("summary table row gives the same values (shared sorting and ranking)", () => {
        const row = summariseParameter(name, chains);
        expectRelative(row.rhat, fixture.expected.rhat);
        expectRelative(row.essBulk, fixture.expected.ess_bulk);
        expectRelative(row.essTail, fixture.expected.ess_tail);
        expectRelative(row.mcseMean, fixture.expected.mcse_mean);
        expectRelative(row.mcseQ05, fixture.expected["mcse_quantile_0.05"]);
        expectRelative(row.mcseQ95, fixture.extra["mcse_quantile_0.95"]!);
        expectRelative(row.mean, fixture.extra["mean"]!);
        expectRelative(row.sd, fixture.extra["sd"]!);
        expectRelative(row.q05, fixture.extra["quantile2_0.05"]!);
      });
      it("building blocks (posterior::rhat_basic, ess_mean, ess_quantile, mcse_quantile)", () => {
        expectRelative(rhatBasic(chains, true), fixture.extra["rhat_basic_split"]!);
        expectRelative(rhatBasic(chains, false), fixture.extra["rhat_basic_nosplit"]!);
        expectRelative(essMean(chains), fixture.extra["ess_mean"]!);
        expectRelative(essQuantile(chains, 0.05), fixture.extra["ess_quantile_0.05"]!);
        expectRelative(essQuantile(chains, 0.95), fixture.extra["ess_quantile_0.95"]!);
        expectRelative(mcseQuantile(chains, 0.5), fixture.extra["mcse_quantile_0.5"]!);
        expectRelative(mcseQuantile(chains, 0.95), fixture.extra["mcse_quantile_0.95"]!);
      });
    });
  }

  it("flags the shifted chain and the AR(1) chains as not converged by the 1.01 rule", () => {
    expect(rhat(fixtures["c_shifted_chain"]!.draws.map((c) => Float64Array.from(c)))).toBeGreaterThan(1.01);
    expect(rhat(fixtures["b_ar1_phi0.9"]!.draws.map((c) => Float64Array.from(c)))).toBeGreaterThan(1.01);
  });
});
