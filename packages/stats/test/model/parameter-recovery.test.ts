// Parameter recovery: data generated from the model with known parameters, fitted with
// the sampler. Small portfolios, short chains and fixed seeds keep this to about a minute.
import { describe, expect, it } from "vitest";
import { buildPortfolioModel, buildUnpooledCellModels } from "../../src/model/portfolio/build-portfolio-model";
import { createRandomSource } from "../../src/rng/create-random-source";
import { portfolioShrinkage, shrinkageInputsFrom } from "../../src/shrinkage/portfolio-shrinkage";
import { simulatePortfolio } from "../../src/simulate/simulate-portfolio";
import type { SimulationDesign } from "../../src/simulate/simulation-design";
import { columnOf, fitIndependent, fitModel, quantile } from "./fit-helpers";

const channels = ["Search", "Video"];
const longCell = (brand: string, market: string, firstWeek: string, spend: [number, number], baseline: number) => ({ brand, market, firstWeek, weeks: 104, typicalSpend: spend, baseline });

describe("parameter recovery", () => {
  it("covers the true cell CACs with its 90 % intervals at a rate consistent with 90 %", () => {
    // Truths drawn from the model's generative structure with μ from the CAC range given to the model.
    const design: SimulationDesign = {
      channels,
      cells: [
        longCell("Alder", "Northland", "2022-01-03", [6000, 9000], 500),
        longCell("Alder", "Southmere", "2022-02-07", [3000, 4000], 250),
        longCell("Birchwood", "Northland", "2022-01-03", [5000, 6000], 400),
        longCell("Birchwood", "Eastvale", "2022-03-07", [2500, 5000], 220),
        { brand: "Cedarline", market: "Southmere", firstWeek: "2023-06-05", weeks: 40, typicalSpend: [2000, 2500], baseline: 150 },
      ],
    };
    let covered = 0;
    let total = 0;
    for (const seed of [101, 202, 303]) {
      const { data, truth } = simulatePortfolio(design, createRandomSource(seed), { cacRange: [20, 400] });
      const model = buildPortfolioModel(data, { cacRange: { Search: [20, 400], Video: [20, 400] } });
      const fit = fitModel(model, seed, 2, 400, 400);
      expect(fit.summary.diagnostics.maxRhat).toBeLessThan(1.05);
      data.cells.forEach((_, g) => {
        channels.forEach((ch, c) => {
          const cac = columnOf(fit, `cac0[${g},${ch}]`);
          const t = truth.cells[g]!.cac0[c]!;
          total++;
          if (t >= quantile(cac, 0.05) && t <= quantile(cac, 0.95)) covered++;
        });
      });
    }
    // 30 intervals: under 90 % coverage the count is Binomial(30, 0.9); P(count ≤ 22) ≈ 0.007,
    // so accept 23..30 (intervals within a data set are correlated, which only widens the spread).
    expect(total).toBe(30);
    expect(covered).toBeGreaterThanOrEqual(23);
  });

  const mu = [Math.log(1 / 60), Math.log(1 / 150)];
  const truthChannels = channels.map((channel, c) => ({ channel, mu: mu[c]!, tauBrand: 0.1, tauMarket: 0.1, tauCell: 0.1, alpha: 0.5, lambda: 2 }));
  const options = { cacRange: { Search: [20, 400] as const, Video: [20, 400] as const } };

  it("flags a truly different cell as a candidate outlier", () => {
    const design: SimulationDesign = {
      channels,
      cells: [
        longCell("Alder", "Northland", "2022-01-03", [8000, 9000], 500),
        longCell("Alder", "Southmere", "2022-01-03", [8000, 6000], 450),
        longCell("Birchwood", "Northland", "2022-01-03", [8000, 7000], 480),
        longCell("Birchwood", "Southmere", "2022-01-03", [9000, 6000], 520),
        longCell("Cedarline", "Northland", "2022-01-03", [8000, 8000], 500),
        longCell("Cedarline", "Southmere", "2022-01-03", [8000, 6000], 480),
      ],
    };
    // cell 3 (Birchwood × Southmere): Search 3.3× cheaper than the rest of the portfolio
    const cells = design.cells.map((_, g) => ({ beta: [Math.exp(mu[0]! + (g === 3 ? 1.2 : 0)), Math.exp(mu[1]!)] }));
    const { data } = simulatePortfolio(design, createRandomSource(7), { channels: truthChannels, cells, noiseShare: 0.04 });
    const pooled = fitModel(buildPortfolioModel(data, options), 11, 2, 400, 400);
    const unpooled = fitIndependent(buildUnpooledCellModels(data, options), 12, 2, 400, 400);
    const report = portfolioShrinkage(shrinkageInputsFrom(data, options, pooled, unpooled));
    const flagged = report.candidateOutliers.map((o) => `${o.cell},${o.channel}`);
    expect(flagged).toContain("3,Search");
    expect(report.candidateOutliers.find((o) => o.cell === 3)!.reason).toMatch(/Birchwood × Southmere/);
    // pooling factors are reported for every level and channel
    expect(report.levels).toHaveLength(6);
  });

  it("pulls a thin cell toward its group more than a long one", () => {
    // Gelman & Hill (2007), ch. 12: with less data a group's estimate moves further toward the group mean.
    const design: SimulationDesign = {
      channels,
      cells: [
        longCell("Alder", "Northland", "2022-01-03", [8000, 9000], 500),
        longCell("Birchwood", "Northland", "2022-01-03", [8000, 7000], 480),
        longCell("Cedarline", "Northland", "2022-01-03", [8000, 8000], 500),
        longCell("Dunmore", "Northland", "2022-01-03", [8000, 6000], 450),
        { brand: "Elmsey", market: "Northland", firstWeek: "2023-07-03", weeks: 16, typicalSpend: [2000, 6000], baseline: 480 },
      ],
    };
    // cells 3 (104 weeks) and 4 (16 weeks, light spend) are both 1.8× cheaper than the others on Search
    const cells = design.cells.map((_, g) => ({ beta: [Math.exp(mu[0]! + (g >= 3 ? 0.6 : 0)), Math.exp(mu[1]!)] }));
    const { data } = simulatePortfolio(design, createRandomSource(8), { channels: truthChannels, cells, noiseShare: 0.08 });
    const cellOnly = { ...options, pooling: "cell-only" as const };
    const pooled = fitModel(buildPortfolioModel(data, cellOnly), 21, 2, 400, 400);
    const unpooled = fitIndependent(buildUnpooledCellModels(data, cellOnly), 22, 2, 400, 400);
    const report = portfolioShrinkage(shrinkageInputsFrom(data, cellOnly, pooled, unpooled));
    const shrink = (g: number) => report.cells.find((c) => c.cell === g && c.channel === "Search")!.shrinkage;
    expect(shrink(4)).toBeGreaterThan(0.1);
    expect(shrink(4)).toBeGreaterThan(shrink(3));
    expect(shrink(4)).toBeLessThan(1.5);
  });
});
