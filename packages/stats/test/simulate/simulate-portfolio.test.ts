import { describe, expect, it } from "vitest";
import { absoluteWeekOf } from "../../src/model/absolute-week";
import { adstockGeometric } from "../../src/model/adstock";
import { seasonalDesignCentred, trendCentred } from "../../src/model/baseline";
import { saturationExponential } from "../../src/model/saturation";
import { simulatePortfolio } from "../../src/simulate/simulate-portfolio";
import type { SimulationDesign } from "../../src/simulate/simulation-design";
import { testRandomSource } from "../model/test-random-source";

const design: SimulationDesign = {
  channels: ["Search", "Video", "Radio"],
  cells: [
    { brand: "Alder", market: "Northland", firstWeek: "2022-01-03", weeks: 104, typicalSpend: [8000, 12000, 0], baseline: 600 },
    { brand: "Alder", market: "Southmere", firstWeek: "2022-03-07", weeks: 80, typicalSpend: [5000, 0, 3000], baseline: 300 },
    { brand: "Birchwood", market: "Northland", firstWeek: "2023-01-02", weeks: 26, typicalSpend: [2000, 4000, 1000], baseline: 150 },
  ],
};

describe("simulatePortfolio", () => {
  it("returns data of the designed shape with non-negative, bursty spend", () => {
    const { data, truth } = simulatePortfolio(design, testRandomSource(7));
    expect(data.channels).toEqual(design.channels);
    expect(data.cells).toHaveLength(3);
    expect(truth.cells).toHaveLength(3);
    expect(truth.channels.map((c) => c.channel)).toEqual(design.channels);
    data.cells.forEach((cell, g) => {
      const d = design.cells[g]!;
      expect(cell.outcome).toHaveLength(d.weeks);
      expect(cell.spend).toHaveLength(3);
      expect(cell.controls).toEqual([]);
      cell.spend.forEach((series, c) => {
        expect(series).toHaveLength(d.weeks);
        for (const x of series) expect(x).toBeGreaterThanOrEqual(0);
        if (d.typicalSpend[c] === 0) {
          expect(series.every((x) => x === 0)).toBe(true);
        } else {
          const positive = series.filter((x) => x > 0);
          // typical spend is the mean over weeks with spend (x̄ of the model), up to rounding to cents
          const mean = positive.reduce((a, b) => a + b, 0) / positive.length;
          expect(mean).toBeCloseTo(d.typicalSpend[c]!, 0);
          if (d.weeks >= 80) expect(positive.length).toBeLessThan(d.weeks); // flighting leaves dark weeks
        }
      });
      const tc = truth.cells[g]!;
      tc.beta.forEach((b, c) => expect(tc.cac0[c]).toBeCloseTo(1 / b, 12));
    });
  });

  it("is reproducible for a seed and differs between seeds", () => {
    const a = simulatePortfolio(design, testRandomSource(11));
    const b = simulatePortfolio(design, testRandomSource(11));
    const c = simulatePortfolio(design, testRandomSource(12));
    expect(Array.from(a.data.cells[0]!.outcome)).toEqual(Array.from(b.data.cells[0]!.outcome));
    expect(Array.from(a.data.cells[0]!.outcome)).not.toEqual(Array.from(c.data.cells[0]!.outcome));
  });

  it("generates outcomes from the exact model mean (checked by recomputing it)", () => {
    const { data, truth } = simulatePortfolio(design, testRandomSource(3), { noiseShare: 0.05 });
    data.cells.forEach((cell, g) => {
      const tc = truth.cells[g]!;
      const T = cell.outcome.length;
      const seasonal = seasonalDesignCentred(absoluteWeekOf(cell.firstWeek), T, 2);
      const media = new Float64Array(T);
      const adstocked = new Float64Array(T);
      truth.channels.forEach((ch, c) => {
        const series = cell.spend[c]!;
        const positive = series.filter((x) => x > 0);
        const xbar = positive.length > 0 ? positive.reduce((a, b) => a + b, 0) / positive.length : 1;
        adstockGeometric(series, ch.alpha, 8, adstocked);
        for (let t = 0; t < T; t++) media[t] = media[t]! + tc.beta[c]! * saturationExponential(adstocked[t]!, ch.lambda * xbar);
      });
      const mediaMean = media.reduce((a, b) => a + b, 0) / T;
      let sumSq = 0;
      for (let t = 0; t < T; t++) {
        let mean = tc.beta0 + tc.beta1 * trendCentred(t, T) + media[t]! - mediaMean;
        for (let j = 0; j < 2; j++) mean += tc.gamma[j]! * seasonal[2 * j * T + t]! + tc.delta[j]! * seasonal[(2 * j + 1) * T + t]!;
        const z = (cell.outcome[t]! - mean) / tc.sigma;
        sumSq += z * z;
      }
      // standardised residuals are N(0,1): their mean square is χ²_T / T
      const meanSquare = sumSq / T;
      expect(meanSquare).toBeGreaterThan(0.4);
      expect(meanSquare).toBeLessThan(1.8);
    });
  });

  it("draws pooled effects around the channel effect and honours overrides", () => {
    const channels = design.channels.map((channel, c) => ({
      channel,
      mu: Math.log(1 / (50 + 50 * c)),
      tauBrand: 0,
      tauMarket: 0,
      tauCell: 0,
      alpha: 0.4,
      lambda: 1.5,
    }));
    const { truth } = simulatePortfolio(design, testRandomSource(5), {
      channels,
      cells: [undefined, { beta: [0.1, 0.2, 0.3], sigma: 9 }],
    });
    // zero scales: every drawn cell effect equals exp(μ)
    expect(truth.cells[0]!.beta[0]).toBeCloseTo(1 / 50, 14);
    expect(truth.cells[2]!.cac0[2]).toBeCloseTo(150, 10);
    expect(truth.cells[1]!.beta).toEqual([0.1, 0.2, 0.3]);
    expect(truth.cells[1]!.sigma).toBe(9);
  });

  it("rejects bad designs with a clear message", () => {
    const rng = testRandomSource(1);
    expect(() => simulatePortfolio({ ...design, channels: [] }, rng)).toThrow(/channel/);
    expect(() => simulatePortfolio({ ...design, cells: [{ ...design.cells[0]!, firstWeek: "2022-01-04" }] }, rng)).toThrow(/Monday/);
    expect(() => simulatePortfolio({ ...design, cells: [{ ...design.cells[0]!, typicalSpend: [1, 2] }] }, rng)).toThrow(/typicalSpend/);
    expect(() => simulatePortfolio({ ...design, cells: [{ ...design.cells[0]!, typicalSpend: [1, -2, 0] }] }, rng)).toThrow(/≥ 0/);
    expect(() => simulatePortfolio({ ...design, cells: [design.cells[0]!, design.cells[0]!] }, rng)).toThrow(/twice/);
    expect(() => simulatePortfolio({ ...design, cells: [{ ...design.cells[0]!, weeks: 1 }] }, rng)).toThrow(/weeks/);
  });
});
