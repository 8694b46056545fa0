import { describe, expect, it } from "vitest";
import { buildModel } from "../../src/models/registry";
import { buildPortfolioModel, buildUnpooledCellModels, combineIndependentDraws } from "../../src/model/portfolio/build-portfolio-model";
import { buildDrawSet } from "../../src/decisions/draw-set";
import { cacLowSpend } from "../../src/decisions/cac";
import { smallPortfolio } from "./small-portfolio";
import { testRandomSource } from "./test-random-source";

describe("portfolio model kinds in the registry", () => {
  it("rebuild the same density from plain, structured-clonable data", () => {
    const portfolio = smallPortfolio(true);
    const options = { likelihood: "student-t" as const, holdoutWeeks: 2 };
    const spec = structuredClone({ kind: "portfolio-pooled", data: { portfolio, options } });
    const rebuilt = buildModel(spec);
    const direct = buildPortfolioModel(portfolio, options);
    expect(rebuilt.constrainedNames).toEqual(direct.constrainedNames);
    const q = new Float64Array(direct.dimension);
    direct.initialPoint(testRandomSource(3), q);
    expect(rebuilt.logDensityGradient(q, new Float64Array(q.length))).toBe(direct.logDensity(q));
    const cell = buildModel({ kind: "portfolio-unpooled", data: { portfolio, options, cell: 2 } });
    expect(cell.constrainedNames).toContain("eta[2,Search]");
  });

  it("reject malformed model data with a clear message", () => {
    expect(() => buildModel({ kind: "portfolio-pooled", data: null })).toThrow(/portfolio/);
    expect(() => buildModel({ kind: "portfolio-pooled", data: { portfolio: { channels: [], cells: [] } } })).toThrow(/channels, controls and cells/);
    expect(() => buildModel({ kind: "portfolio-unpooled", data: { portfolio: smallPortfolio(false) } })).toThrow(/cell's index/);
    expect(() => buildModel({ kind: "portfolio-unpooled", data: { portfolio: smallPortfolio(false), cell: 9 } })).toThrow(/outside/);
  });

  it("give a draw set from the combined unpooled draws", () => {
    const portfolio = smallPortfolio(false);
    const models = buildUnpooledCellModels(portfolio);
    const rng = testRandomSource(4);
    const parts = models.map((m) => {
      const draws = new Float64Array(3 * m.constrainedNames.length);
      const q = new Float64Array(m.dimension);
      for (let d = 0; d < 3; d++) {
        m.initialPoint(rng, q);
        m.constrain(q, draws.subarray(d * m.constrainedNames.length, (d + 1) * m.constrainedNames.length));
      }
      return { names: m.constrainedNames, draws };
    });
    const joined = combineIndependentDraws(parts);
    const set = buildDrawSet(portfolio, {}, joined);
    expect(set.model).toBe("unpooled");
    const beta = joined.names.indexOf("beta[1,Radio]");
    expect(cacLowSpend(set, 1, 2)[2]).toBeCloseTo(1 / joined.draws[2 * joined.names.length + beta]!, 12);
  });
});
