import { describe, expect, it } from "vitest";
import {
  adstockEmptiedWeeks,
  adstockGeometric,
  adstockGeometricDirect,
  adstockGeometricWithDerivative,
  adstockWeightSum,
  adstockWeightSumDerivative,
} from "../../src/model/adstock";

/** Invented flighted weekly spend: 2,000 to 290,000 a week with dark weeks and a long pause. */
function flightedSpend(weeks: number): Float64Array {
  const spend = new Float64Array(weeks);
  for (let t = 0; t < weeks; t++) spend[t] = t % 13 < 5 || (t > 60 && t < 75) || t > 140 ? 0 : 2000 + ((t * 7919) % 97) * 3000;
  return spend;
}

/** The α-derivative of the adstock as direct sums: (Σ l·α^{l−1}·x[t−l]·W − Σ α^l·x[t−l]·W′)/W². */
function adstockDerivativeDirect(spend: Float64Array, alpha: number, maxLag: number, out: Float64Array): void {
  const W = adstockWeightSum(alpha, maxLag);
  const dW = adstockWeightSumDerivative(alpha, maxLag);
  for (let t = 0; t < spend.length; t++) {
    let sum = 0;
    let dSum = 0;
    let power = 1;
    let powerBelow = 0;
    for (let l = 0; l < maxLag && l <= t; l++) {
      sum += power * spend[t - l]!;
      dSum += l * powerBelow * spend[t - l]!;
      powerBelow = power;
      power *= alpha;
    }
    out[t] = (dSum * W - sum * dW) / (W * W);
  }
}

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

  it("agrees with the direct sums to 1e-12 on flighted spend, for α near 0 and near 1", () => {
    const spend = flightedSpend(156);
    const n = spend.length;
    const fast = new Float64Array(n);
    const dFast = new Float64Array(n);
    const direct = new Float64Array(n);
    const dDirect = new Float64Array(n);
    for (const lag of [1, 2, 3, 8, 13, 52]) {
      for (const alpha of [0, 1e-9, 1e-3, 0.3, 0.7, 0.95, 0.999, 1 - 1e-9]) {
        adstockGeometricWithDerivative(spend, alpha, lag, fast, dFast);
        adstockGeometricDirect(spend, alpha, lag, direct);
        adstockDerivativeDirect(spend, alpha, lag, dDirect);
        for (let t = 0; t < n; t++) {
          let windowMax = 0;
          for (let l = 0; l < lag && l <= t; l++) windowMax = Math.max(windowMax, spend[t - l]!);
          if (windowMax === 0) continue;
          // relative to the adstock itself; the derivative (which cancels for steady spend) relative to L·(largest spend in the window)
          const error = direct[t] === 0 ? Math.abs(fast[t]!) / windowMax : Math.abs(fast[t]! - direct[t]!) / direct[t]!;
          expect(error, `L ${lag}, α ${alpha}, week ${t}`).toBeLessThan(1e-12);
          expect(Math.abs(dFast[t]! - dDirect[t]!) / (lag * windowMax), `derivative, L ${lag}, α ${alpha}, week ${t}`).toBeLessThan(1e-12);
        }
      }
    }
  });

  it("is exactly 0, with its derivative, once the window holds no spend (as the direct sum)", () => {
    const spend = flightedSpend(156);
    const n = spend.length;
    const out = new Float64Array(n);
    const d = new Float64Array(n);
    let emptyWeeks = 0;
    for (const lag of [1, 2, 8]) {
      for (const alpha of [0.3, 0.95, 1 - 1e-9]) {
        adstockGeometricWithDerivative(spend, alpha, lag, out, d);
        for (let t = 0; t < n; t++) {
          let any = false;
          for (let l = 0; l < lag && l <= t; l++) if (spend[t - l] !== 0) any = true;
          if (any) continue;
          emptyWeeks++;
          expect(out[t], `L ${lag}, α ${alpha}, week ${t}`).toBe(0);
          expect(d[t], `L ${lag}, α ${alpha}, week ${t}`).toBe(0);
        }
      }
    }
    expect(emptyWeeks).toBeGreaterThan(100);
  });

  it("lists the weeks where the window has just emptied (hand-worked)", () => {
    // L = 2, spend 5 at week 0 and 3 at week 4: the window [t−1, t] empties at weeks 2 and 6
    const weeks: number[] = [];
    adstockEmptiedWeeks(new Float64Array([5, 0, 0, 0, 3, 0, 0, 0]), 0, 8, 2, weeks);
    expect(weeks).toEqual([2, 6]);
    const none: number[] = [];
    adstockEmptiedWeeks(new Float64Array([0, 0, 7, 7, 7, 0]), 0, 6, 4, none);
    expect(none).toEqual([]);
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
