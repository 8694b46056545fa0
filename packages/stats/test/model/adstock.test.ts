import { describe, expect, it } from "vitest";
import {
  adstockGeometric,
  adstockGeometricDirect,
  adstockGeometricWithDerivative,
  adstockWeightSum,
  adstockWeightSumDerivative,
} from "../../src/model/adstock";

describe("adstockGeometric", () => {
  it("matches the hand-worked normalised example", () => {
    // Broadbent (1979) geometric adstock, normalised; hand-worked in references.md:
    // α = 0.5, L = 4, spend 100 then zeros: weights 1, .5, .25, .125 over 1.875.
    const spend = new Float64Array([100, 0, 0, 0, 0, 0]);
    const out = new Float64Array(6);
    adstockGeometric(spend, 0.5, 4, out);
    expect(out[0]).toBeCloseTo(53.3333333, 6);
    expect(out[1]).toBeCloseTo(26.6666667, 6);
    expect(out[2]).toBeCloseTo(13.3333333, 6);
    expect(out[3]).toBeCloseTo(6.6666667, 6);
    // Truncated at L lags: nothing carries over past lag 3 (the one-tap recursion would give 3.33).
    expect(Math.abs(out[4]!)).toBeLessThan(1e-12);
    expect(Math.abs(out[5]!)).toBeLessThan(1e-12);
  });

  it("agrees with the direct truncated sum on random spend", () => {
    const spend = new Float64Array(60);
    for (let t = 0; t < 60; t++) spend[t] = t % 7 < 3 ? 1000 + 37 * ((t * 13) % 11) : 0;
    for (const alpha of [0, 0.2, 0.6, 0.95]) {
      for (const lag of [1, 3, 8]) {
        const fast = new Float64Array(60);
        const direct = new Float64Array(60);
        adstockGeometric(spend, alpha, lag, fast);
        adstockGeometricDirect(spend, alpha, lag, direct);
        for (let t = 0; t < 60; t++) expect(fast[t]).toBeCloseTo(direct[t]!, 8);
      }
    }
  });

  it("keeps a constant spend constant once the window is full", () => {
    const spend = new Float64Array(20).fill(250);
    const out = new Float64Array(20);
    adstockGeometric(spend, 0.7, 8, out);
    for (let t = 7; t < 20; t++) expect(out[t]).toBeCloseTo(250, 10);
  });

  it("gives the α-derivative of the adstock (finite differences)", () => {
    const spend = new Float64Array([500, 0, 1200, 800, 0, 0, 0, 300, 0, 0, 0, 0, 0, 0, 900, 0]);
    const n = spend.length;
    const out = new Float64Array(n);
    const d = new Float64Array(n);
    const plus = new Float64Array(n);
    const minus = new Float64Array(n);
    for (const alpha of [0.1, 0.5, 0.9]) {
      adstockGeometricWithDerivative(spend, alpha, 8, out, d);
      const h = 1e-6;
      adstockGeometricDirect(spend, alpha + h, 8, plus);
      adstockGeometricDirect(spend, alpha - h, 8, minus);
      for (let t = 0; t < n; t++) expect(d[t]).toBeCloseTo((plus[t]! - minus[t]!) / (2 * h), 4);
    }
  });

  it("has the weight sum and its derivative", () => {
    expect(adstockWeightSum(0.5, 4)).toBeCloseTo(1.875, 14);
    // d/dα (1 + α + α² + α³) = 1 + 2α + 3α² = 1 + 1 + 0.75 at α = 0.5
    expect(adstockWeightSumDerivative(0.5, 4)).toBeCloseTo(2.75, 14);
  });

  it("rejects bad arguments", () => {
    const spend = new Float64Array(3);
    expect(() => adstockGeometric(spend, 1, 8, new Float64Array(3))).toThrow(/alpha/);
    expect(() => adstockGeometric(spend, -0.1, 8, new Float64Array(3))).toThrow(/alpha/);
    expect(() => adstockGeometric(spend, 0.5, 0, new Float64Array(3))).toThrow(/maxLag/);
    expect(() => adstockGeometric(spend, 0.5, 2.5, new Float64Array(3))).toThrow(/maxLag/);
    expect(() => adstockGeometric(spend, 0.5, 8, new Float64Array(2))).toThrow(/length/);
  });
});
