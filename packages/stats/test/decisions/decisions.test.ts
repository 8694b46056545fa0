import { describe, expect, it } from "vitest";
import { absoluteWeekOf } from "../../src/model/absolute-week";
import { adstockGeometricDirect } from "../../src/model/adstock";
import { buildPortfolioModel } from "../../src/model/portfolio/build-portfolio-model";
import type { PortfolioModelOptions } from "../../src/model/portfolio/portfolio-options";
import { buildDrawSet, type DrawSet } from "../../src/decisions/draw-set";
import { averageCac, averageCacRecent, cacLowSpend, marginalCac } from "../../src/decisions/cac";
import { responseCurve } from "../../src/decisions/response-curve";
import { probabilityProfitable } from "../../src/decisions/probability-profitable";
import { forecastSpendPlan } from "../../src/decisions/forecast";
import { crpsSample, holdoutAccuracy } from "../../src/decisions/holdout-accuracy";
import { posteriorPredictiveBands } from "../../src/decisions/posterior-predictive";
import { predictCell } from "../../src/decisions/predictive";
import { summariseDraws } from "../../src/decisions/draw-summary";
import { smallPortfolio } from "../model/small-portfolio";
import { testRandomSource } from "../model/test-random-source";

/** A draw set from constrained values at a few points of the model (a stand-in for sampler draws). */
function drawSetAt(options: PortfolioModelOptions, draws: number, controls = false): { set: DrawSet; values: (name: string, d: number) => number } {
  const data = smallPortfolio(controls);
  const model = buildPortfolioModel(data, options);
  const rng = testRandomSource(41);
  const width = model.constrainedNames.length;
  const matrix = new Float64Array(draws * width);
  const q = new Float64Array(model.dimension);
  for (let d = 0; d < draws; d++) {
    model.initialPoint(rng, q);
    model.constrain(q, matrix.subarray(d * width, (d + 1) * width));
  }
  const set = buildDrawSet(data, options, { names: model.constrainedNames, draws: matrix });
  const values = (name: string, d: number): number => {
    const j = model.constrainedNames.indexOf(name);
    if (j < 0) throw new Error(name);
    return matrix[d * width + j]!;
  };
  return { set, values };
}

describe("draw set and CAC", () => {
  const { set, values } = drawSetAt({}, 5);

  it("keeps β, θ, α per draw, cell and channel", () => {
    expect(set.drawCount).toBe(5);
    expect(set.model).toBe("pooled");
    const cac = cacLowSpend(set, 2, 1);
    for (let d = 0; d < 5; d++) expect(cac[d]).toBeCloseTo(values("cac0[2,Video]", d), 10);
  });

  it("gives the marginal CAC exp(s/θ)/β", () => {
    const theta = values("theta[0,Search]", 3);
    const beta = values("beta[0,Search]", 3);
    expect(marginalCac(set, 0, 0, 0)[3]).toBeCloseTo(1 / beta, 10);
    expect(marginalCac(set, 0, 0, theta)[3]).toBeCloseTo(Math.E / beta, 8);
  });

  it("gives the steady-state response β·θ·(1 − exp(−s/θ)) with bands", () => {
    const curve = responseCurve(set, 0, 1, [0, 1000, 5000]);
    expect(curve[0]!.response.mean).toBe(0);
    const expected = Array.from({ length: 5 }, (_, d) => values("beta[0,Video]", d) * values("theta[0,Video]", d) * (1 - Math.exp(-5000 / values("theta[0,Video]", d))));
    expect(curve[2]!.response.mean).toBeCloseTo(expected.reduce((a, b) => a + b, 0) / 5, 8);
    expect(curve[2]!.response.q05).toBeLessThanOrEqual(curve[2]!.response.q95);
  });

  it("gives the average CAC over a window as Σ spend / Σ contribution (with carry-over)", () => {
    const cell = set.cells[0]!;
    const spend = cell.spend[0]!;
    const adstock = new Float64Array(spend.length);
    const d = 1;
    adstockGeometricDirect(spend, values("alpha[Search]", d), 8, adstock);
    const beta = values("beta[0,Search]", d);
    const theta = values("theta[0,Search]", d);
    let spent = 0;
    let gained = 0;
    for (let t = 20; t <= 32; t++) {
      spent += spend[t]!;
      gained += beta * theta * (1 - Math.exp(-adstock[t]! / theta));
    }
    expect(averageCac(set, 0, 0, 20, 32)[d]).toBeCloseTo(spent / gained, 8);
    expect(averageCacRecent(set, 0, 0)[d]).toBeCloseTo(averageCac(set, 0, 0, cell.trainWeeks - 13, cell.trainWeeks - 1)[d]!, 12);
    expect(() => averageCac(set, 0, 0, 30, 20)).toThrow(/window/);
  });

  it("gives P(profitable) as the share of draws with CAC below the customer value", () => {
    const cac = averageCacRecent(set, 0, 0);
    const sorted = Float64Array.from(cac).sort();
    const value = (sorted[2]! + sorted[3]!) / 2;
    const result = probabilityProfitable(set, 0, 0, value);
    expect(result.probability).toBeCloseTo(3 / 5, 12);
    expect(result.basis).toMatch(/last 13/);
    expect(result.note).toMatch(/lift test/);
    expect(probabilityProfitable(set, 0, 0, 1e12, { kind: "low-spend" }).probability).toBe(1);
    expect(() => probabilityProfitable(set, 0, 0, -5)).toThrow(/customer value/);
  });
});

describe("predictive quantities", () => {
  it("reproduce the model's mean in the fitted weeks (baseline level, trend, seasonality, media)", () => {
    const { set, values } = drawSetAt({}, 3);
    const cell = set.cells[1]!;
    const T = cell.weeks;
    const p = predictCell(set, 1, cell.spend, 0, T, testRandomSource(1));
    const d = 2;
    const w0 = absoluteWeekOf(cell.firstWeek);
    const media = set.channels.map((ch, c) => {
      const a = new Float64Array(T);
      adstockGeometricDirect(cell.spend[c]!, values(`alpha[${ch}]`, d), 8, a);
      const theta = values(`theta[1,${ch}]`, d);
      return Array.from(a, (x) => values(`beta[1,${ch}]`, d) * theta * (1 - Math.exp(-x / theta)));
    });
    const mediaMeans = media.map((m) => m.reduce((s, v) => s + v, 0) / T);
    const seas = (j: number, f: (x: number) => number): number[] => Array.from({ length: T }, (_, t) => f((2 * Math.PI * j * (w0 + t)) / 52.1775));
    for (let t = 0; t < T; t++) {
      let mean = values("beta0[1]", d) + (values("beta1[1]", d) * (t - (T - 1) / 2)) / 52;
      for (let j = 1; j <= 2; j++) {
        const s = seas(j, Math.sin);
        const c = seas(j, Math.cos);
        mean += values(`gamma[1,${j}]`, d) * (s[t]! - s.reduce((a, b) => a + b, 0) / T) + values(`delta[1,${j}]`, d) * (c[t]! - c.reduce((a, b) => a + b, 0) / T);
      }
      media.forEach((m, c) => (mean += m[t]! - mediaMeans[c]!));
      expect(p.mean[d * T + t]).toBeCloseTo(mean, 6);
    }
  });

  it("forecasts a spend plan with carry-over that dies out after L weeks", () => {
    const { set } = drawSetAt({}, 4);
    const plan = set.channels.map(() => new Array<number>(12).fill(0));
    const forecast = forecastSpendPlan(set, 0, plan, testRandomSource(5));
    expect(forecast.weeks).toHaveLength(12);
    expect(forecast.weeks[0]!.week).toBe("2023-10-09"); // 2023-01-02 + 40 weeks
    const first = forecast.weeks[0]!.contribution.reduce((a, s) => a + s.mean, 0);
    expect(first).toBeGreaterThan(0); // carry-over from the last data weeks
    for (let h = 7; h < 12; h++) for (const s of forecast.weeks[h]!.contribution) expect(Math.abs(s.mean)).toBeLessThan(1e-9);
    const spending = forecastSpendPlan(set, 0, set.channels.map(() => new Array<number>(12).fill(5000)), testRandomSource(5));
    expect(spending.weeks[10]!.contribution[0]!.mean).toBeGreaterThan(0);
    expect(forecast.note).toMatch(/lift test/);
    expect(() => forecastSpendPlan(set, 0, [[1, 2]], testRandomSource(1))).toThrow(/one spend row per channel/);
    expect(() => forecastSpendPlan(set, 0, set.channels.map(() => [-1]), testRandomSource(1))).toThrow(/≥ 0/);
  });

  it("scores holdout weeks and gives posterior predictive bands", () => {
    const { set } = drawSetAt({ holdoutWeeks: 4, likelihood: "student-t" }, 40, true);
    const accuracy = holdoutAccuracy(set, testRandomSource(9));
    expect(accuracy.cells).toHaveLength(4);
    for (const c of accuracy.cells) {
      expect(c.weeks).toBe(4);
      expect(c.crps).toBeGreaterThan(0);
      expect(c.mape).toBeGreaterThanOrEqual(0);
    }
    const bands = posteriorPredictiveBands(set, testRandomSource(3));
    expect(bands[0]!.q05.length).toBe(set.cells[0]!.weeks);
    for (let t = 0; t < bands[0]!.q05.length; t++) {
      expect(bands[0]!.q05[t]).toBeLessThanOrEqual(bands[0]!.q50[t]!);
      expect(bands[0]!.q50[t]).toBeLessThanOrEqual(bands[0]!.q95[t]!);
    }
    const fitted = drawSetAt({}, 3).set;
    expect(() => holdoutAccuracy(fitted, testRandomSource(1))).toThrow(/no holdout/);
  });
});

describe("crpsSample", () => {
  it("is |x − y| for a point forecast", () => {
    expect(crpsSample([3, 3, 3], 5)).toBeCloseTo(2, 14);
  });

  it("matches the closed form for a normal forecast", () => {
    // Gneiting & Raftery (2007), JASA 102, eq. 5: CRPS(N(μ, σ²), y) = σ[z(2Φ(z) − 1) + 2φ(z) − 1/√π]
    const rng = testRandomSource(77);
    const samples = Float64Array.from({ length: 40000 }, () => 10 + 2 * rng.normal());
    const y = 12.5;
    const z = (y - 10) / 2;
    const phi = Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
    let Phi = 0.5; // Φ(z) by Simpson's rule on [0, z]
    const n = 2000;
    for (let i = 0; i <= n; i++) {
      const x = (i / n) * z;
      const w = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
      Phi += (w * (z / n) * Math.exp(-0.5 * x * x)) / (3 * Math.sqrt(2 * Math.PI));
    }
    const exact = 2 * (z * (2 * Phi - 1) + 2 * phi - 1 / Math.sqrt(Math.PI));
    expect(crpsSample(samples, y)).toBeCloseTo(exact, 1);
    expect(Math.abs(crpsSample(samples, y) - exact) / exact).toBeLessThan(0.02);
  });
});

describe("summariseDraws", () => {
  it("gives type-7 quantiles and the sample sd", () => {
    const s = summariseDraws([1, 2, 3, 4, 5]);
    expect(s.mean).toBe(3);
    expect(s.sd).toBeCloseTo(Math.sqrt(2.5), 14);
    expect(s.q25).toBe(2);
    expect(s.q05).toBeCloseTo(1.2, 14); // R: quantile(1:5, 0.05) = 1.2
  });
});
