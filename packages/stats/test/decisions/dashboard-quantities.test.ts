// Quantities the dashboards show: combined average CAC, current spend, carry-over
// profile, weekly contribution against the baseline, log-scale histograms of draws.
import { describe, expect, it } from "vitest";
import { adstockGeometricDirect } from "../../src/model/adstock";
import { buildPortfolioModel } from "../../src/model/portfolio/build-portfolio-model";
import { buildDrawSet, type DrawSet } from "../../src/decisions/draw-set";
import { averageCac } from "../../src/decisions/cac";
import { averageCacCombined, averageCacCombinedRecent, recentWeeklySpend } from "../../src/decisions/combined-cac";
import { carryOverWeights } from "../../src/decisions/carry-over";
import { weeklyContribution } from "../../src/decisions/weekly-contribution";
import { logHistogram, thinDraws } from "../../src/decisions/draw-histogram";
import { predictCell, weekColumn } from "../../src/decisions/predictive";
import { quantileSorted } from "../../src/decisions/draw-summary";
import { smallPortfolio } from "../model/small-portfolio";
import { testRandomSource } from "../model/test-random-source";

function drawSetAt(draws: number): { set: DrawSet; values: (name: string, d: number) => number } {
  const data = smallPortfolio(false);
  const model = buildPortfolioModel(data, {});
  const rng = testRandomSource(43);
  const width = model.constrainedNames.length;
  const matrix = new Float64Array(draws * width);
  const q = new Float64Array(model.dimension);
  for (let d = 0; d < draws; d++) {
    model.initialPoint(rng, q);
    model.constrain(q, matrix.subarray(d * width, (d + 1) * width));
  }
  const set = buildDrawSet(data, {}, { names: model.constrainedNames, draws: matrix });
  return { set, values: (name, d) => matrix[d * width + model.constrainedNames.indexOf(name)]! };
}

describe("combined average CAC", () => {
  const { set, values } = drawSetAt(6);

  it("is total spend over total contribution of every channel in the window (with carry-over)", () => {
    const g = 0;
    const cell = set.cells[g]!;
    const d = 4;
    let spent = 0;
    let gained = 0;
    set.channels.forEach((ch, c) => {
      const spend = cell.spend[c]!;
      const adstock = new Float64Array(spend.length);
      adstockGeometricDirect(spend, values(`alpha[${ch}]`, d), 8, adstock);
      const beta = values(`beta[${g},${ch}]`, d);
      const theta = values(`theta[${g},${ch}]`, d);
      for (let t = 10; t <= 22; t++) {
        spent += spend[t]!;
        gained += beta * theta * (1 - Math.exp(-adstock[t]! / theta));
      }
    });
    expect(averageCacCombined(set, g, 10, 22)[d]).toBeCloseTo(spent / gained, 8);
  });

  it("lies between the channels' own average CACs, and equals the one channel's when only one spends", () => {
    const cell = set.cells[0]!;
    const from = cell.trainWeeks - 13;
    const to = cell.trainWeeks - 1;
    const combined = averageCacCombinedRecent(set, 0);
    const perChannel = set.channels.map((_, c) => averageCac(set, 0, c, from, to));
    for (let d = 0; d < set.drawCount; d++) {
      const own = perChannel.map((v) => v[d]!);
      expect(combined[d]!).toBeGreaterThanOrEqual(Math.min(...own) * (1 - 1e-12));
      expect(combined[d]!).toBeLessThanOrEqual(Math.max(...own) * (1 + 1e-12));
    }
    // Alder × Southmere never spends on Video: the combined CAC is that of Search and Radio.
    expect(set.cells[1]!.spend[1]!.every((s) => s === 0)).toBe(true);
    expect(Number.isFinite(averageCacCombinedRecent(set, 1)[0]!)).toBe(true);
    expect(() => averageCacCombined(set, 0, 5, 2)).toThrow(/window/);
  });

  it("gives the current spend as the mean weekly spend of the last fitted weeks", () => {
    const cell = set.cells[2]!;
    const s = cell.spend[0]!;
    let sum = 0;
    for (let t = cell.trainWeeks - 13; t < cell.trainWeeks; t++) sum += s[t]!;
    expect(recentWeeklySpend(set, 2, 0)).toBeCloseTo(sum / 13, 10);
    expect(recentWeeklySpend(set, 1, 1)).toBe(0);
    expect(() => recentWeeklySpend(set, 2, 0, 0)).toThrow(/positive integer/);
  });
});

describe("carry-over profile", () => {
  it("is the adstock of a single week's spend: weights α^l / Σ α^k that sum to one", () => {
    const { set, values } = drawSetAt(3);
    const weights = carryOverWeights(set, 1, 2);
    const L = set.maxLag;
    const impulse = new Float64Array(12);
    impulse[0] = 1;
    for (let d = 0; d < 3; d++) {
      const adstock = new Float64Array(12);
      adstockGeometricDirect(impulse, values("alpha[Radio]", d), L, adstock);
      let sum = 0;
      for (let l = 0; l < L; l++) {
        expect(weights[d * L + l]).toBeCloseTo(adstock[l]!, 12);
        sum += weights[d * L + l]!;
      }
      expect(sum).toBeCloseTo(1, 12);
    }
  });
});

describe("weekly contribution against the baseline", () => {
  it("has the quantiles over draws of the predictive contribution and baseline", () => {
    const { set } = drawSetAt(9);
    const g = 3;
    const cell = set.cells[g]!;
    const T = cell.weeks;
    const weekly = weeklyContribution(set, g, 1);
    const p = predictCell(set, g, cell.spend, 0, T, testRandomSource(3));
    for (const t of [0, 7, T - 1]) {
      const contribution = weekColumn(p.contribution[1]!, 9, T, t).sort();
      const baseline = weekColumn(p.baseline, 9, T, t).sort();
      expect(weekly.contribution.q50[t]).toBeCloseTo(quantileSorted(contribution, 0.5), 10);
      expect(weekly.contribution.q05[t]).toBeCloseTo(quantileSorted(contribution, 0.05), 10);
      expect(weekly.baseline.q95[t]).toBeCloseTo(quantileSorted(baseline, 0.95), 8);
      expect(weekly.baseline.q25[t]!).toBeLessThanOrEqual(weekly.baseline.q75[t]!);
    }
    expect(weekly.contribution.q50).toHaveLength(T);
  });
});

describe("log-scale histogram and thinning", () => {
  it("counts every finite positive draw once, in log-spaced bins with the trimmed tails apart", () => {
    const values = Float64Array.from({ length: 1000 }, (_, i) => Math.exp((i - 500) / 100));
    const h = logHistogram([...values, NaN, Infinity, 0, -3], 20, 0.01);
    expect(h.total).toBe(1000);
    expect(h.counts.reduce((a, b) => a + b, 0) + h.below + h.above).toBe(1000);
    expect(h.below).toBe(10);
    expect(h.above).toBe(10);
    // Uniform on the log scale: equal counts per bin.
    for (const c of h.counts) expect(Math.abs(c - 49)).toBeLessThanOrEqual(2);
    const ratio = h.edges[1]! / h.edges[0]!;
    expect(h.edges[11]! / h.edges[10]!).toBeCloseTo(ratio, 10);
    expect(logHistogram([5, 5, 5], 4).counts.reduce((a, b) => a + b, 0)).toBe(3);
    expect(logHistogram([], 4).total).toBe(0);
    expect(() => logHistogram([1], 0)).toThrow(/bins/);
  });

  it("thins evenly over all draws", () => {
    const values = Float64Array.from({ length: 10 }, (_, i) => i);
    expect(Array.from(thinDraws(values, 5))).toEqual([0, 2, 4, 6, 8]);
    expect(Array.from(thinDraws(values, 20))).toHaveLength(10);
    expect(() => thinDraws(values, 0)).toThrow(/keep/);
  });
});
