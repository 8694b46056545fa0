import { describe, expect, it } from "vitest";
import { adstockGeometric } from "../../src/model/adstock";
import { buildPortfolioModel } from "../../src/model/portfolio/build-portfolio-model";
import { cellEffectEstimates, fitCellEffectGuide, guideSaturation } from "../../src/model/portfolio/cell-parametrisation";
import { simulatePortfolio } from "../../src/simulate/simulate-portfolio";
import type { SimulationDesign } from "../../src/simulate/simulation-design";
import { testRandomSource } from "./test-random-source";
import { invertMatrix } from "./reference-density";

const design: SimulationDesign = {
  channels: ["Search", "Video"],
  cells: [
    { brand: "Alder", market: "Northland", firstWeek: "2022-01-03", weeks: 156, typicalSpend: [6000, 9000], baseline: 500 },
    { brand: "Alder", market: "Southmere", firstWeek: "2022-02-07", weeks: 156, typicalSpend: [3000, 4000], baseline: 250 },
    { brand: "Birchwood", market: "Northland", firstWeek: "2022-01-03", weeks: 156, typicalSpend: [5000, 6000], baseline: 400 },
    { brand: "Birchwood", market: "Eastvale", firstWeek: "2022-03-07", weeks: 104, typicalSpend: [2500, 5000], baseline: 220 },
  ],
};
const truths = [
  { channel: "Search", mu: Math.log(1 / 40), tauBrand: 0.1, tauMarket: 0.1, tauCell: 0.1, alpha: 0.3, lambda: 1 },
  { channel: "Video", mu: Math.log(1 / 60), tauBrand: 0.1, tauMarket: 0.1, tauCell: 0.1, alpha: 0.7, lambda: 3 },
];
const { data } = simulatePortfolio(design, testRandomSource(77), { channels: truths, noiseShare: 0.02 });
const constants = buildPortfolioModel(data).constants;

describe("the sampler's data guide", () => {
  it("finds the adstock and saturation the data were generated with (portfolio-wide least squares)", () => {
    const { alpha, lambda } = guideSaturation(constants);
    truths.forEach((t, c) => {
      expect(Math.abs(alpha[c]! - t.alpha)).toBeLessThan(0.08);
      expect(Math.abs(Math.log(lambda[c]! / t.lambda))).toBeLessThan(Math.log(1.5));
    });
  });

  it("estimates each cell effect as a direct least-squares fit on all regressors does", () => {
    const alpha = [0.3, 0.7];
    const lambda = [1, 3];
    const est = cellEffectEstimates(constants, alpha, lambda);
    const g = 1;
    const cell = data.cells[g]!;
    const T = cell.outcome.length;
    const k = constants;
    const start = k.weekStart[g]!;
    // the design written out: intercept, trend, 4 seasonal columns, two saturated adstocks
    const columns: number[][] = [Array.from({ length: T }, () => 1), Array.from(k.trend.subarray(start, start + T))];
    for (let j = 0; j < 4; j++) columns.push(Array.from(k.seasonal.subarray(k.seasonalStart[g]! + j * T, k.seasonalStart[g]! + (j + 1) * T)));
    design.channels.forEach((_, c) => {
      const spend = cell.spend[c]!;
      const positive = Array.from(spend).filter((x) => x > 0);
      const theta = lambda[c]! * (positive.reduce((a, b) => a + b, 0) / positive.length);
      const a = new Float64Array(T);
      adstockGeometric(spend, alpha[c]!, 8, a);
      columns.push(Array.from(a, (v) => theta * (1 - Math.exp(-v / theta))));
    });
    const p = columns.length;
    const xtx = columns.map((ci) => columns.map((cj) => ci.reduce((s, v, t) => s + v * cj[t]!, 0)));
    const xty = columns.map((ci) => ci.reduce((s, v, t) => s + v * cell.outcome[t]!, 0));
    const inverse = invertMatrix(xtx);
    const coef = inverse.map((row) => row.reduce((s, v, j) => s + v * xty[j]!, 0));
    const rss = Array.from(cell.outcome).reduce((s, y, t) => s + (y - columns.reduce((f, col, i) => f + coef[i]! * col[t]!, 0)) ** 2, 0);
    design.channels.forEach((_, c) => {
      const i = p - 2 + c;
      const se = Math.sqrt((inverse[i]![i]! * rss) / (T - p));
      expect(est.mean[g * 2 + c]).toBeCloseTo(Math.log(coef[i]!), 8);
      expect(est.sd[g * 2 + c]).toBeCloseTo(se / coef[i]!, 8);
    });
  });

  it("moves its estimates with α and λ as its slopes say (to first order)", () => {
    const guide = fitCellEffectGuide(constants);
    expect(guide.meanSlopeAlpha.some((s) => Math.abs(s) > 0.01)).toBe(true);
    const C = 2;
    const logit = (a: number): number => Math.log(a / (1 - a));
    const logistic = (x: number): number => 1 / (1 + Math.exp(-x));
    const step = 0.02;
    for (let c = 0; c < C; c++) {
      const alpha = Float64Array.from(guide.alpha);
      alpha[c] = logistic(logit(alpha[c]!) + step);
      const lambda = Float64Array.from(guide.lambda, (l, i) => (i === c ? l * Math.exp(step) : l));
      const moved = cellEffectEstimates(constants, alpha, lambda);
      for (let gc = 0; gc < data.cells.length * C; gc++) {
        if (guide.sd[gc] === Infinity) continue;
        const predicted = guide.mean[gc]! + step * (guide.meanSlopeAlpha[gc * C + c]! + guide.meanSlopeLambda[gc * C + c]!);
        expect(Math.abs(moved.mean[gc]! - predicted)).toBeLessThan(1e-3);
      }
    }
  });
});
