import { describe, expect, it } from "vitest";
import type { CellSeries, PortfolioData } from "../../src/data/portfolio-data";
import { trendCentred } from "../../src/model/baseline";
import { priorCheck } from "../../src/prior-check/prior-check";

// A tiny invented portfolio: two cells of one market, two channels; Birchwood never uses radio.
function cell(brand: string, market: string, outcome: number[], spend: number[][]): CellSeries {
  return {
    brand,
    market,
    firstWeek: "2024-01-01",
    outcome: Float64Array.from(outcome),
    spend: spend.map((series) => Float64Array.from(series)),
    controls: [],
  };
}

const weeks = 12;
const tiny: PortfolioData = {
  channels: ["search", "radio"],
  controls: [],
  cells: [
    cell(
      "Alder",
      "Northland",
      [410, 395, 430, 460, 440, 420, 405, 470, 455, 430, 415, 440],
      [
        [900, 1200, 0, 1500, 1100, 800, 0, 1600, 1400, 1000, 900, 1200],
        [0, 0, 2000, 2500, 0, 0, 1800, 2200, 0, 0, 0, 2100],
      ],
    ),
    cell(
      "Birchwood",
      "Northland",
      [120, 135, 128, 150, 140, 131, 126, 160, 149, 138, 129, 144],
      [
        [400, 500, 450, 700, 600, 420, 380, 800, 650, 500, 430, 560],
        new Array<number>(weeks).fill(0),
      ],
    ),
  ],
};

/** Standard normal CDF through erfc, Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7; coefficients from memory). */
function normalCdf(x: number): number {
  const z = Math.abs(x) / Math.SQRT2;
  const t = 1 / (1 + 0.3275911 * z);
  const poly = t * (0.254829592 + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429))));
  const erfc = poly * Math.exp(-z * z);
  return x >= 0 ? 1 - erfc / 2 : erfc / 2;
}

const normalDensity = (x: number) => Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);

/**
 * X = N(center, baseVariance) + u·Z with u ~ HalfNormal(scale), Z ~ N(0, 1): given u, X is
 * normal with variance baseVariance + u², so its CDF is E_u[Φ((x − center)/√(baseVariance + u²))].
 * Returns that CDF and density by Simpson's rule over u = scale·|w|, w standard normal.
 */
function scaleMixture(x: number, center: number, baseVariance: number, scale: number): { cdf: number; density: number } {
  const steps = 2000;
  const top = 8;
  const h = top / steps;
  let cdf = 0;
  let density = 0;
  for (let i = 0; i <= steps; i++) {
    const w = i * h;
    const weight = (i === 0 || i === steps ? 1 : i % 2 === 1 ? 4 : 2) * (h / 3) * 2 * normalDensity(w);
    const sd = Math.sqrt(baseVariance + (scale * w) ** 2);
    cdf += weight * normalCdf((x - center) / sd);
    density += (weight * normalDensity((x - center) / sd)) / sd;
  }
  return { cdf, density };
}

function mixtureQuantile(p: number, center: number, baseVariance: number, scale: number): { value: number; density: number } {
  let lo = center - 50 * Math.sqrt(baseVariance + scale * scale);
  let hi = center + 50 * Math.sqrt(baseVariance + scale * scale);
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (scaleMixture(mid, center, baseVariance, scale).cdf < p) lo = mid;
    else hi = mid;
  }
  const value = (lo + hi) / 2;
  return { value, density: scaleMixture(value, center, baseVariance, scale).density };
}

/**
 * Allowed distance of a sample p-quantile from the true one: 4.5 standard errors, with the
 * large-sample standard error √(p(1 − p)/n) / f(q) of a sample quantile (asymptotic
 * normality of sample quantiles; e.g. Serfling 1980, §2.3.3).
 */
function quantileTolerance(p: number, n: number, density: number): number {
  return (4.5 * Math.sqrt((p * (1 - p)) / n)) / density;
}

describe("priorCheck: cost per new customer implied by the priors", () => {
  it("with the τ's at zero, CAC0 is lognormal: its 5 % and 95 % quantiles are exp(−m ± 1.645 s), i.e. the analyst's range", () => {
    // log CAC0 = −μ with μ ~ N(m, s), so CAC0's p-quantile is exp(−m + z_p·s) (lognormal quantiles;
    // z_0.95 = 1.6449, standard normal table). With m = −log √(lo·hi) and s = (log hi − log lo)/3.29
    // (model.md), exp(−m ± 1.645 s) = [lo, hi].
    const draws = 20_000;
    const [lo, hi] = [20, 400];
    const result = priorCheck(tiny, { cacRange: { search: [lo, hi] } }, { draws, seed: 11, tauPriorScale: 0 });
    const search = result.channels.find((channel) => channel.channel === "search")!;
    const m = -Math.log(Math.sqrt(lo * hi));
    const s = (Math.log(hi) - Math.log(lo)) / 3.29;
    expect(Math.exp(-m - 1.645 * s)).toBeCloseTo(lo, 6);
    expect(Math.exp(-m + 1.645 * s)).toBeCloseTo(hi, 6);
    // On the log scale the quantile's density is φ(1.645)/s.
    const logTolerance = quantileTolerance(0.05, draws, normalDensity(1.645) / s);
    expect(Math.abs(Math.log(search.cac0.q05) - (-m - 1.645 * s))).toBeLessThan(logTolerance);
    expect(Math.abs(Math.log(search.cac0.q95) - (-m + 1.645 * s))).toBeLessThan(logTolerance);
    const medianTolerance = quantileTolerance(0.5, draws, normalDensity(0) / s);
    expect(Math.abs(Math.log(search.cac0.q50) + m)).toBeLessThan(medianTolerance);
    // Both cells share μ when the τ's are zero, so each cell shows the same interval.
    const perCell = result.cells.map((c) => c.cac0.find((entry) => entry.channel === "search")!.quantiles.q95);
    expect(perCell[0]).toBeCloseTo(perCell[1]!, 10);
    // Radio has no range, so it gets the default [5, 2000].
    const radio = result.channels.find((channel) => channel.channel === "radio")!;
    expect(radio.cacRange).toEqual([5, 2000]);
    expect(Math.abs(Math.log(radio.cac0.q95) - Math.log(2000))).toBeLessThan(
      quantileTolerance(0.05, draws, normalDensity(1.645) / (Math.log(400) / 3.29)),
    );
  });

  it("with cell-level pooling on, log CAC0 spreads by the τ_G mixture: its quantiles match E_τ[Φ(·/√(s² + τ²))]", () => {
    // log β = μ + τ_G·z_G with τ_G ~ HalfNormal(0.5): given τ_G it is N(m, s² + τ_G²). A narrow
    // range keeps s small, so the spread comes mostly from τ_G and the check is sharp about it.
    const draws = 20_000;
    const [lo, hi] = [40, 60];
    const result = priorCheck(tiny, { cacRange: { radio: [lo, hi] }, pooling: "cell-only" }, { draws, seed: 5 });
    // Radio is used by one cell only, so its pooled quantiles come from one value per draw.
    const radio = result.channels.find((channel) => channel.channel === "radio")!;
    expect(radio.cellsWithSpend).toBe(1);
    const center = Math.log(Math.sqrt(lo * hi));
    const s = (Math.log(hi) - Math.log(lo)) / 3.29;
    for (const [p, observed] of [
      [0.05, radio.cac0.q05],
      [0.5, radio.cac0.q50],
      [0.95, radio.cac0.q95],
    ] as const) {
      const expected = mixtureQuantile(p, center, s * s, 0.5);
      expect(Math.abs(Math.log(observed) - expected.value)).toBeLessThan(quantileTolerance(p, draws, expected.density));
    }
    // And it is wider than the range the analyst gave.
    expect(radio.cac0.q05).toBeLessThan(lo);
    expect(radio.cac0.q95).toBeGreaterThan(hi);
  });

  it("the no-pooling comparison draws each cell's CAC0 straight from the range", () => {
    const draws = 20_000;
    const result = priorCheck(tiny, { cacRange: { search: [20, 400] } }, { draws, seed: 8, structure: "unpooled" });
    const s = Math.log(20) / 3.29;
    for (const c of result.cells) {
      const search = c.cac0.find((entry) => entry.channel === "search")!.quantiles;
      expect(Math.abs(Math.log(search.q95) - Math.log(400))).toBeLessThan(quantileTolerance(0.05, draws, normalDensity(1.645) / s));
    }
  });
});

describe("priorCheck: weekly outcome implied by the priors", () => {
  it("without media, each week's band is the analytic prior predictive N(ȳ, s²(1 + ť²)) + σ·ε, σ ~ HalfNormal(s)", () => {
    // y_rep[t] = β0 + β1·ť[t] + σ·ε with β0 ~ N(ȳ, s), β1 ~ N(0, s), σ ~ HalfNormal(s) (model.md,
    // no seasonality, no spend): given σ it is normal with variance s²(1 + ť²) + σ².
    const outcome = [52, 61, 48, 55, 70, 66, 58, 49, 63, 57, 60, 54];
    const data: PortfolioData = {
      channels: ["search"],
      controls: [],
      cells: [cell("Alder", "Northland", outcome, [new Array<number>(weeks).fill(0)])],
    };
    const holdoutWeeks = 2;
    const draws = 20_000;
    const result = priorCheck(data, { seasonalityOrder: 0, holdoutWeeks }, { draws, seed: 3 });
    const only = result.cells[0]!;
    expect(only.trainWeeks).toBe(weeks - holdoutWeeks);
    expect(only.cac0).toEqual([]);
    expect(only.mediaShare.q50).toBe(0);
    const train = outcome.slice(0, weeks - holdoutWeeks);
    const mean = train.reduce((a, b) => a + b, 0) / train.length;
    const sd = Math.sqrt(train.reduce((a, b) => a + (b - mean) ** 2, 0) / (train.length - 1));
    // The first week, the middle and the last (held-out) week, where the trend reaches furthest.
    for (const t of [0, 5, weeks - 1]) {
      const trend = trendCentred(t, weeks - holdoutWeeks);
      const baseVariance = sd * sd * (1 + trend * trend);
      for (const [p, band] of [
        [0.05, only.bands.q05],
        [0.25, only.bands.q25],
        [0.5, only.bands.q50],
        [0.95, only.bands.q95],
      ] as const) {
        const expected = mixtureQuantile(p, mean, baseVariance, sd);
        expect(Math.abs(band[t]! - expected.value)).toBeLessThan(quantileTolerance(p, draws, expected.density));
      }
    }
  });

  it("cheap priors make media explain more than the data holds; dear priors make it explain almost nothing", () => {
    const cheap = priorCheck(tiny, { cacRange: { search: [0.05, 0.2], radio: [0.05, 0.2] } }, { draws: 400, seed: 2 });
    const dear = priorCheck(tiny, { cacRange: { search: [1e5, 1e6], radio: [1e5, 1e6] } }, { draws: 400, seed: 2 });
    for (let g = 0; g < 2; g++) {
      expect(cheap.cells[g]!.mediaShare.q50).toBeGreaterThan(1);
      expect(dear.cells[g]!.mediaShare.q95).toBeLessThan(0.01);
      // Media spend pushed through cheap priors makes the weekly band far wider than the data's own range.
      expect(cheap.cells[g]!.outcome.q95 - cheap.cells[g]!.outcome.q05).toBeGreaterThan(dear.cells[g]!.outcome.q95 - dear.cells[g]!.outcome.q05);
    }
  });
});

describe("priorCheck: contract", () => {
  it("is repeatable for a seed and changes with it", () => {
    const a = priorCheck(tiny, {}, { draws: 50, seed: 9 });
    const b = priorCheck(tiny, {}, { draws: 50, seed: 9 });
    const c = priorCheck(tiny, {}, { draws: 50, seed: 10 });
    expect(b).toEqual(a);
    expect(c.channels[0]!.cac0.q50).not.toBe(a.channels[0]!.cac0.q50);
  });

  it("lists cells and channels in the data's order with a band per week, and skips channels a cell never used", () => {
    const result = priorCheck(tiny, { saturation: "hill", likelihood: "student-t" }, { draws: 40 });
    expect(result.channels.map((channel) => [channel.channel, channel.cellsWithSpend])).toEqual([
      ["search", 2],
      ["radio", 1],
    ]);
    expect(result.cells.map((c) => `${c.brand}/${c.market}`)).toEqual(["Alder/Northland", "Birchwood/Northland"]);
    expect(result.cells[1]!.cac0.map((entry) => entry.channel)).toEqual(["search"]);
    for (const c of result.cells) {
      expect(c.bands.q50).toHaveLength(weeks);
      expect(c.observed).toHaveLength(weeks);
      for (let t = 0; t < weeks; t++) {
        expect(c.bands.q05[t]!).toBeLessThanOrEqual(c.bands.q25[t]!);
        expect(c.bands.q25[t]!).toBeLessThanOrEqual(c.bands.q50[t]!);
        expect(c.bands.q50[t]!).toBeLessThanOrEqual(c.bands.q75[t]!);
        expect(c.bands.q75[t]!).toBeLessThanOrEqual(c.bands.q95[t]!);
      }
      expect(c.belowZeroShare).toBeGreaterThanOrEqual(0);
      expect(c.belowZeroShare).toBeLessThanOrEqual(1);
    }
  });

  it("names what is wrong with bad settings and data", () => {
    expect(() => priorCheck(tiny, {}, { draws: 1 })).toThrow(/draws must be an integer/);
    expect(() => priorCheck(tiny, { cacRange: { search: [400, 20] } })).toThrow(/0 < lo < hi/);
    expect(() => priorCheck(tiny, { cacRange: { video: [1, 2] } })).toThrow(/not in the data/);
    expect(() => priorCheck(tiny, { holdoutWeeks: 6 })).toThrow(/at least 8 weeks/);
    expect(() => priorCheck(tiny, {}, { tauPriorScale: -1 })).toThrow(/tauPriorScale/);
  });
});
