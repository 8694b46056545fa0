import { describe, expect, it } from "vitest";
import { buildPortfolioModel, buildUnpooledCellModel, buildUnpooledCellModels, combineIndependentModels } from "../../src/model/portfolio/build-portfolio-model";
import type { PortfolioDensity } from "../../src/model/portfolio/portfolio-density";
import type { PortfolioModelOptions } from "../../src/model/portfolio/portfolio-options";
import type { DensityModel } from "../../src/model/density-model";
import { ParameterColumns } from "../../src/model/portfolio/portfolio-names";
import { referenceLogDensity } from "./reference-density";
import { smallLiftTests, smallPortfolio } from "./small-portfolio";
import { testRandomSource } from "./test-random-source";

function randomPoint(model: DensityModel, seed: number): Float64Array {
  const rng = testRandomSource(seed);
  const q = new Float64Array(model.dimension);
  model.initialPoint!(rng, q);
  for (let i = 0; i < q.length; i++) q[i] = q[i]! + 0.3 * rng.normal();
  return q;
}

/** Central finite differences of every coordinate against the analytic gradient. */
function expectGradientMatchesFiniteDifferences(model: DensityModel, q: Float64Array): void {
  const grad = new Float64Array(model.dimension);
  const scratch = new Float64Array(model.dimension);
  model.logDensityGradient(q, grad);
  const h = 1e-5;
  let worst = 0;
  for (let i = 0; i < model.dimension; i++) {
    const keep = q[i]!;
    q[i] = keep + h;
    const up = model.logDensityGradient(q, scratch);
    q[i] = keep - h;
    const down = model.logDensityGradient(q, scratch);
    q[i] = keep;
    const fd = (up - down) / (2 * h);
    const error = Math.abs(fd - grad[i]!) / Math.max(1, Math.abs(fd));
    worst = Math.max(worst, error);
    if (error > 1e-5) throw new Error(`coordinate ${i}: analytic ${grad[i]} vs finite difference ${fd}`);
  }
  expect(worst).toBeLessThan(1e-5);
}

const configurations: [string, boolean, PortfolioModelOptions][] = [
  ["reference model (normal, crossed)", false, {}],
  ["Student-t with controls, lift tests and a holdout", true, { likelihood: "student-t", liftTests: smallLiftTests, holdoutWeeks: 4 }],
  ["normal with controls, lift tests and a holdout", true, { liftTests: smallLiftTests, holdoutWeeks: 4, cacRange: { Search: [10, 300] } }],
  ["Hill saturation, brand pooling, lift tests", false, { saturation: "hill", pooling: "brand", liftTests: smallLiftTests }],
  ["market pooling, L = 4, J = 1", false, { pooling: "market", maxLag: 4, seasonalityOrder: 1 }],
  ["cell-only pooling, J = 0", true, { pooling: "cell-only", seasonalityOrder: 0 }],
  ["explicit cell guide, some exactly non-centred", false, { cellEffectGuide: { mean: Array.from({ length: 12 }, (_, i) => -4 + 0.1 * i), sd: Array.from({ length: 12 }, (_, i) => (i % 3 === 0 ? Infinity : 0.05 + 0.1 * i)) } }],
  ["cell level non-centred (as written in model.md)", false, { cellEffectGuide: "none" }],
  ["fixed baseline prior centre and scale", true, { baselinePriorScale: { centre: [400, 150, 250, 90], scale: [60, 30, 40, 20] }, likelihood: "student-t" }],
];

describe("pooled portfolio density", () => {
  for (const [label, controls, options] of configurations) {
    it(`has an exact gradient: ${label}`, () => {
      const model = buildPortfolioModel(smallPortfolio(controls), options);
      for (const seed of [1, 2]) expectGradientMatchesFiniteDifferences(model, randomPoint(model, seed));
    });

    it(`equals the literal model density up to a constant: ${label}`, () => {
      const data = smallPortfolio(controls);
      const model = buildPortfolioModel(data, options);
      const q1 = randomPoint(model, 3);
      const q2 = randomPoint(model, 4);
      const fast = model.logDensity(q1) - model.logDensity(q2);
      const literal = referenceLogDensity(model, data, q1, options.liftTests) - referenceLogDensity(model, data, q2, options.liftTests);
      expect(fast).toBeCloseTo(literal, 6);
    });
  }

  it("equals the literal density with Hill shape below 1 at short lags (adstock exactly 0 where the window is empty)", () => {
    // with k < 1, r(a) = θ·a^k/(a^k + θ^k) magnifies any rounding residue left where the adstock should be 0
    for (const maxLag of [1, 2]) {
      const data = smallPortfolio(true);
      const model = buildPortfolioModel(data, { saturation: "hill", maxLag });
      const at = (seed: number): Float64Array => {
        const q = randomPoint(model, seed);
        for (let c = 0; c < 3; c++) q[model.layout.hillShape + c] = -2 + 0.3 * c; // k = e^{u/2} ≈ 0.37 to 0.50
        return q;
      };
      const q0 = at(3);
      for (const seed of [4, 5, 6]) {
        const q = at(seed);
        const fast = model.logDensity(q) - model.logDensity(q0);
        const literal = referenceLogDensity(model, data, q) - referenceLogDensity(model, data, q0);
        expect(Math.abs(fast - literal) / Math.max(1, Math.abs(literal))).toBeLessThan(1e-10);
      }
      expectGradientMatchesFiniteDifferences(model, at(7));
    }
  });

  it("builds log β from μ, τ and z as specified", () => {
    const model = buildPortfolioModel(smallPortfolio(false));
    const q = randomPoint(model, 8);
    const out = new Float64Array(model.constrainedNames.length);
    model.constrain(q, out);
    const cols = new ParameterColumns(model.constrainedNames);
    const lay = model.layout;
    const k = model.constants;
    // the small portfolio exercises guided and exactly non-centred cell effects, and a guide that follows α and λ
    expect(lay.guidePrecision.some((b) => b > 0)).toBe(true);
    expect(lay.guidePrecision.some((b) => b === 0)).toBe(true);
    expect(lay.guideSlopeAlpha.some((s) => s !== 0)).toBe(true);
    expect(lay.guideSlopeLogLambda.some((s) => s !== 0)).toBe(true);
    const C = k.channelCount;
    const guideMeanAt = (gc: number): number => {
      let m = lay.guideMean[gc]!;
      k.channels.forEach((name, c) => {
        const alpha = out[cols.channel("alpha", name)]!;
        const lambda = out[cols.channel("lambda", name)]!;
        m += lay.guideSlopeAlpha[gc * C + c]! * (Math.log(alpha / (1 - alpha)) - lay.guideLogitAlpha[c]!);
        m += lay.guideSlopeLogLambda[gc * C + c]! * (Math.log(lambda) - lay.guideLogLambda[c]!);
      });
      return m;
    };
    k.channels.forEach((ch, c) => {
      for (let g = 0; g < k.cellCount; g++) {
        const tau = out[cols.channel("tauCell", ch)]!;
        const group =
          out[cols.channel("mu", ch)]! +
          out[cols.indexOf(`brandDeviation[${k.cellBrand[g]},${ch}]`)]! +
          out[cols.indexOf(`marketDeviation[${k.cellMarket[g]},${ch}]`)]!;
        const b = lay.guidePrecision[g * 3 + c]!;
        const v = 1 / (1 / (tau * tau) + b);
        const expected = v * (group / (tau * tau) + b * guideMeanAt(g * 3 + c)) + Math.sqrt(v) * q[lay.zCell + g * 3 + c]!;
        expect(Math.log(out[cols.cellChannel("beta", g, ch)]!)).toBeCloseTo(expected, 12);
        expect(out[cols.cellChannel("cellDeviation", g, ch)]).toBeCloseTo(expected - group, 12);
        if (b === 0) expect(expected - group).toBeCloseTo(tau * q[lay.zCell + g * 3 + c]!, 12);
        expect(out[cols.cellChannel("cac0", g, ch)]! * out[cols.cellChannel("beta", g, ch)]!).toBeCloseTo(1, 12);
        const fromDeviations = out[cols.channel("mu", ch)]! + out[cols.indexOf(`brandDeviation[${k.cellBrand[g]},${ch}]`)]! + out[cols.indexOf(`marketDeviation[${k.cellMarket[g]},${ch}]`)]!;
        expect(out[cols.cellChannel("logBetaGroup", g, ch)]).toBeCloseTo(fromDeviations, 12);
        expect(fromDeviations).toBeCloseTo(group, 12);
      }
    });
  });

  it("is exactly non-centred at every level without a guide (as written in model.md)", () => {
    const model = buildPortfolioModel(smallPortfolio(false), { cellEffectGuide: "none" });
    const q = randomPoint(model, 12);
    const out = new Float64Array(model.constrainedNames.length);
    model.constrain(q, out);
    const cols = new ParameterColumns(model.constrainedNames);
    const lay = model.layout;
    model.constants.channels.forEach((ch, c) => {
      model.constants.brands.forEach((_, b) => expect(out[cols.indexOf(`brandDeviation[${b},${ch}]`)]).toBeCloseTo(out[cols.channel("tauBrand", ch)]! * q[lay.zBrand + b * 3 + c]!, 12));
      model.constants.markets.forEach((_, m) => expect(out[cols.indexOf(`marketDeviation[${m},${ch}]`)]).toBeCloseTo(out[cols.channel("tauMarket", ch)]! * q[lay.zMarket + m * 3 + c]!, 12));
      for (let g = 0; g < 4; g++) expect(out[cols.cellChannel("cellDeviation", g, ch)]).toBeCloseTo(out[cols.channel("tauCell", ch)]! * q[lay.zCell + g * 3 + c]!, 12);
    });
  });

  it("names every quantity the reports need", () => {
    const model = buildPortfolioModel(smallPortfolio(true), { likelihood: "student-t" });
    const names = new Set(model.constrainedNames);
    for (const n of ["mu[Search]", "tauBrand[Video]", "tauMarket[Radio]", "tauCell[Search]", "alpha[Video]", "lambda[Radio]", "beta[0,Search]", "cac0[3,Radio]", "logBetaGroup[2,Video]", "beta0[1]", "beta1[2]", "sigma[3]", "gamma[0,1]", "delta[3,2]", "controlCoef[1,Price index]", "nu"]) {
      expect(names.has(n), n).toBe(true);
    }
    expect(names.size).toBe(model.constrainedNames.length);
    const noBrand = buildPortfolioModel(smallPortfolio(false), { pooling: "market" });
    expect(noBrand.constrainedNames.some((n) => n.startsWith("tauBrand"))).toBe(false);
  });

  it("does not allocate a different answer on repeated calls (buffers are reused correctly)", () => {
    const model = buildPortfolioModel(smallPortfolio(true), { liftTests: smallLiftTests, holdoutWeeks: 3 });
    const q1 = randomPoint(model, 5);
    const q2 = randomPoint(model, 6);
    const g1 = new Float64Array(model.dimension);
    const g2 = new Float64Array(model.dimension);
    const a = model.logDensityGradient(q1, g1);
    model.logDensityGradient(q2, g2);
    const b = model.logDensityGradient(q1, g2);
    expect(b).toBe(a);
    expect(Array.from(g2)).toEqual(Array.from(g1));
  });

  it("ignores the holdout weeks' outcomes", () => {
    const data = smallPortfolio(false);
    const model = buildPortfolioModel(data, { holdoutWeeks: 5 });
    const changed = {
      ...data,
      cells: data.cells.map((cell) => {
        const y = Float64Array.from(cell.outcome);
        for (let t = y.length - 5; t < y.length; t++) y[t] = y[t]! * 3 + 1000;
        return { ...cell, outcome: y };
      }),
    };
    const other = buildPortfolioModel(changed, { holdoutWeeks: 5 });
    const q = randomPoint(model, 9);
    expect(other.logDensity(q)).toBe(model.logDensity(q));
  });

  it("rejects bad data and options with a clear message", () => {
    const data = smallPortfolio(false);
    expect(() => buildPortfolioModel(data, { maxLag: 0 })).toThrow(/maxLag/);
    expect(() => buildPortfolioModel(data, { cacRange: { Print: [5, 50] } })).toThrow(/Print/);
    expect(() => buildPortfolioModel(data, { cacRange: { Search: [50, 5] } })).toThrow(/cacRange/);
    expect(() => buildPortfolioModel(data, { holdoutWeeks: 15 })).toThrow(/at least 8 weeks/);
    expect(() => buildPortfolioModel(data, { liftTests: [{ ...smallLiftTests[0]!, channel: "Print" }] })).toThrow(/Print/);
    expect(() => buildPortfolioModel(data, { liftTests: [{ ...smallLiftTests[0]!, standardError: 0 }] })).toThrow(/standard error/);
    expect(() => buildPortfolioModel(data, { liftTests: [{ ...smallLiftTests[0]!, firstWeek: "2030-01-07", lastWeek: "2030-01-14" }] })).toThrow(/outside/);
    const negative = { ...data, cells: [{ ...data.cells[0]!, spend: [Float64Array.from(data.cells[0]!.spend[0]!, (x, i) => (i === 3 ? -1 : x)), ...data.cells[0]!.spend.slice(1)] }] };
    expect(() => buildPortfolioModel(negative)).toThrow(/≥ 0/);
    const badLength = { ...data, cells: [{ ...data.cells[0]!, outcome: data.cells[0]!.outcome.subarray(0, 20) }] };
    expect(() => buildPortfolioModel(badLength)).toThrow(/weeks/);
    expect(() => buildPortfolioModel({ ...data, cells: [data.cells[0]!, data.cells[0]!] })).toThrow(/twice/);
  });
});

describe("unpooled cell models", () => {
  it("have exact gradients and the literal density", () => {
    const data = smallPortfolio(true);
    const options: PortfolioModelOptions = { likelihood: "student-t", liftTests: smallLiftTests, holdoutWeeks: 2, baselinePriorScale: { centre: [400, 150, 250, 90], scale: [60, 30, 40, 20] } };
    for (const g of [0, 1, 2]) {
      const model: PortfolioDensity = buildUnpooledCellModel(data, g, options);
      expectGradientMatchesFiniteDifferences(model, randomPoint(model, 10 + g));
      const single = { ...data, cells: [data.cells[g]!] };
      const q1 = randomPoint(model, 20);
      const q2 = randomPoint(model, 21);
      const lifts = smallLiftTests.filter((t) => t.brand === data.cells[g]!.brand && t.market === data.cells[g]!.market);
      expect(model.logDensity(q1) - model.logDensity(q2)).toBeCloseTo(referenceLogDensity(model, single, q1, lifts) - referenceLogDensity(model, single, q2, lifts), 6);
    }
  });

  it("name parameters by the cell's global index and combine into one model", () => {
    const data = smallPortfolio(false);
    const models = buildUnpooledCellModels(data);
    expect(models[2]!.constrainedNames).toContain("eta[2,Video]");
    expect(models[2]!.constrainedNames).toContain("alpha[2,Video]");
    const joint = combineIndependentModels(models);
    expect(joint.dimension).toBe(models.reduce((a, m) => a + m.dimension, 0));
    const q = randomPoint(joint, 30);
    const grad = new Float64Array(joint.dimension);
    let sum = 0;
    let at = 0;
    for (const m of models) {
      sum += m.logDensity(q.slice(at, at + m.dimension));
      at += m.dimension;
    }
    expect(joint.logDensityGradient(q, grad)).toBeCloseTo(sum, 8);
    expectGradientMatchesFiniteDifferences(joint, q);
  });
});
