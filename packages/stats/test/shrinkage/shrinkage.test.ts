import { describe, expect, it } from "vitest";
import { poolingFactor } from "../../src/shrinkage/pooling-factor";
import { portfolioShrinkage, type ShrinkageInputs } from "../../src/shrinkage/portfolio-shrinkage";
import { testRandomSource } from "../model/test-random-source";

describe("poolingFactor (Gelman & Pardoe 2006)", () => {
  it("matches a hand-computed value", () => {
    // draws × units: [[1, 3], [3, 5]] → unit means 2, 4 → Var(E) = 2; per-draw variances 2, 2 → E(Var) = 2 → λ = 0
    expect(poolingFactor(new Float64Array([1, 3, 3, 5]), 2, 2)).toBeCloseTo(0, 14);
    // [[1, -1], [-1, 1]] → unit means 0, 0 → Var(E) = 0; E(Var) = 2 → λ = 1
    expect(poolingFactor(new Float64Array([1, -1, -1, 1]), 2, 2)).toBeCloseTo(1, 14);
    // [[0, 2], [0, 4]] → means 0, 3 → Var(E) = 4.5; variances 2, 8 → E(Var) = 5 → λ = 0.1
    expect(poolingFactor(new Float64Array([0, 2, 0, 4]), 2, 2)).toBeCloseTo(0.1, 14);
  });

  it("tends to 1 under complete pooling and 0 under none", () => {
    const rng = testRandomSource(3);
    const D = 4000;
    const J = 6;
    const complete = Float64Array.from({ length: D * J }, () => rng.normal());
    expect(poolingFactor(complete, D, J)).toBeGreaterThan(0.97);
    const none = Float64Array.from({ length: D * J }, (_, i) => 3 * (i % J) + 0.01 * rng.normal());
    expect(Math.abs(poolingFactor(none, D, J))).toBeLessThan(0.01);
  });

  it("is NaN with fewer than two units and rejects bad shapes", () => {
    expect(poolingFactor(new Float64Array([1, 2]), 2, 1)).toBeNaN();
    expect(() => poolingFactor(new Float64Array(3), 2, 2)).toThrow(/drawCount/);
  });
});

describe("portfolioShrinkage", () => {
  // two cells, one channel, 4 draws each: hand-made posteriors
  const channels = ["Search"];
  const pooledNames = ["beta[0,Search]", "beta[1,Search]", "logBetaGroup[0,Search]", "logBetaGroup[1,Search]", "cellDeviation[0,Search]", "cellDeviation[1,Search]"];
  const rows = [
    [Math.exp(-3.2), Math.exp(-4.1), -3.5, -3.5, 0.3, -0.6],
    [Math.exp(-3.0), Math.exp(-4.3), -3.4, -3.4, 0.4, -0.9],
    [Math.exp(-3.4), Math.exp(-3.9), -3.6, -3.6, 0.2, -0.3],
    [Math.exp(-3.2), Math.exp(-4.1), -3.5, -3.5, 0.3, -0.6],
  ];
  const unpooledRows = [
    [-3.0, -5.0],
    [-2.9, -5.2],
    [-3.1, -4.8],
    [-3.0, -5.0],
  ];
  const inputs = (weeks: number[]): ShrinkageInputs => ({
    channels,
    cells: [
      { brand: "Alder", market: "Northland", trainWeeks: 150, weeksWithSpend: [weeks[0]!] },
      { brand: "Birchwood", market: "Northland", trainWeeks: 150, weeksWithSpend: [weeks[1]!] },
    ],
    brandCount: 2,
    marketCount: 1,
    pooled: { names: pooledNames, draws: Float64Array.from(rows.flat()) },
    unpooled: { names: ["eta[0,Search]", "eta[1,Search]"], draws: Float64Array.from(unpooledRows.flat()) },
  });

  it("computes (m_unpooled − m_pooled)/(m_unpooled − m_group) without clipping", () => {
    const report = portfolioShrinkage(inputs([100, 100]));
    const [a, b] = report.cells;
    // cell 0: mU = −3.0, mP = −3.2, mG = −3.5 → 0.2/0.5 = 0.4
    expect(a!.shrinkage).toBeCloseTo(0.4, 12);
    // cell 1: mU = −5.0, mP = −4.1, mG = −3.5 → −0.9/−1.5 = 0.6
    expect(b!.shrinkage).toBeCloseTo(0.6, 12);
    expect(report.levels).toEqual([{ level: "cell", channel: "Search", poolingFactor: expect.any(Number) }]);
  });

  it("flags a cell whose unpooled interval excludes the group estimate, with a reason", () => {
    const report = portfolioShrinkage(inputs([100, 100]));
    // cell 1's unpooled 90 % interval (−5.2..−4.8) excludes −3.5; cell 0's (−3.1..−2.9) also does
    expect(report.candidateOutliers.map((o) => o.cell)).toEqual([0, 1]);
    expect(report.candidateOutliers[1]!.reason).toMatch(/Birchwood × Northland/);
    expect(report.candidateOutliers[1]!.reason).toMatch(/excludes/);
  });

  it("flags large shrinkage of long data and ignores cells without spend", () => {
    const wide = inputs([100, 100]);
    const widened = {
      ...wide,
      unpooled: { names: wide.unpooled.names, draws: Float64Array.from([-2.0, -6.5, -4.0, -3.0, -3.0, -5.5, -3.0, -5.0]) },
    };
    const report = portfolioShrinkage(widened, { largeShrinkage: 0.5, longDataWeeks: 52 });
    const reasons = report.candidateOutliers.map((o) => o.reason).join(" ");
    expect(reasons).toMatch(/of the way to its group although it has 100 weeks with spend/);
    expect(portfolioShrinkage(inputs([0, 0])).candidateOutliers).toEqual([]);
  });
});
