import { describe, expect, it } from "vitest";
import { GuidedChannelLevel } from "../../src/model/portfolio/guided-channel-level";
import { testRandomSource } from "./test-random-source";
import { invertMatrix } from "./reference-density";

// A crossed design: 4 brands in 3 markets, 8 cells (cell 5 unguided, as a channel whose
// least-squares estimate is too weak), 2 channels; channel 1 has no guide at all.
const B = 4;
const M = 3;
const C = 2;
const cellBrand = Int32Array.from([0, 0, 1, 1, 2, 2, 3, 3]);
const cellMarket = Int32Array.from([0, 1, 0, 2, 1, 2, 0, 1]);
const G = cellBrand.length;
const rng = testRandomSource(31);
const guideMean = Float64Array.from({ length: G * C }, () => -3 + rng.normal());
const guidePrecision = Float64Array.from({ length: G * C }, (_, i) => {
  const g = Math.floor(i / C);
  return i % C === 1 || g === 5 ? 0 : 1 / (0.05 + 0.3 * rng.uniform()) ** 2;
});
const q = Float64Array.from({ length: C + B * C }, () => rng.normal());

/**
 * The conditional mean and covariance of x = (μ − m0, δB) by brute force: the joint Gaussian
 * of (μ − m0, δB, δM, δG) with independent priors and each guided cell's estimate
 * m̂ ~ Normal(μ + δB + δM + δG, ŝ). Without a brand level x = (μ − m0).
 */
function exactConditional(c: number, m0: number, s0: number, tauB: number, tauM: number, tauG: number, brandOn: boolean): { mean: number[]; cov: number[][] } {
  const nB = brandOn ? B : 0;
  const n = 1 + nB + M + G;
  const priorPrecision = (i: number): number => (i === 0 ? 1 / s0 ** 2 : i < 1 + nB ? 1 / tauB ** 2 : i < 1 + nB + M ? 1 / tauM ** 2 : 1 / tauG ** 2);
  const precision = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i !== j ? 0 : priorPrecision(i))));
  const linear = new Array<number>(n).fill(0);
  for (let g = 0; g < G; g++) {
    const prec = guidePrecision[g * C + c]!;
    if (prec === 0) continue;
    const z = [0, ...(brandOn ? [1 + cellBrand[g]!] : []), 1 + nB + cellMarket[g]!, 1 + nB + M + g];
    for (const i of z) {
      linear[i] = linear[i]! + prec * (guideMean[g * C + c]! - m0);
      for (const j of z) precision[i]![j] = precision[i]![j]! + prec;
    }
  }
  const cov = invertMatrix(precision);
  const mean = cov.map((row) => row.reduce((s, v, j) => s + v * linear[j]!, 0));
  return { mean: mean.slice(0, 1 + nB), cov: cov.slice(0, 1 + nB).map((row) => row.slice(0, 1 + nB)) };
}

// q holds μ's coordinates at 0..C−1 and the brands' at C + b·C + c
const MU_AT = 0;
const Z_AT = C;

describe("guided channel level (μ and the brand deviations)", () => {
  const tau = { m0: -3.4, s0: 1.8, tauB: 0.4, tauM: 0.3, tauG: 0.15 };

  for (const brandOn of [true, false]) {
    it(`maps u = 0 to the exact conditional mean and u's unit spread to the exact conditional covariance (brand level ${brandOn ? "on" : "off"})`, () => {
      const level = new GuidedChannelLevel(B, M, C, cellBrand, cellMarket, brandOn, true);
      const c = 0;
      const n = brandOn ? 1 + B : 1;
      const exact = exactConditional(c, tau.m0, tau.s0, tau.tauB, tau.tauM, tau.tauG, brandOn);
      const mu = new Float64Array(C);
      const delta = new Float64Array(B * C);
      const at = (u: Float64Array): number[] => {
        level.build(c, tau.m0, tau.s0, tau.tauB, tau.tauM, tau.tauG, guideMean, guidePrecision, u, MU_AT, Z_AT, mu, delta);
        return [mu[c]! - tau.m0, ...Array.from({ length: n - 1 }, (_, b) => delta[b * C + c]!)];
      };
      const centre = at(new Float64Array(C + B * C));
      centre.forEach((v, i) => expect(v).toBeCloseTo(exact.mean[i]!, 10));
      // x = mean + A·u with A = L⁻ᵀ: A·Aᵀ must be the conditional covariance
      const columns = Array.from({ length: n }, (_, i) => {
        const u = new Float64Array(C + B * C);
        u[i === 0 ? MU_AT + c : Z_AT + (i - 1) * C + c] = 1;
        return at(u).map((v, j) => v - centre[j]!);
      });
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          const aat = columns.reduce((s, col) => s + col[i]! * col[j]!, 0);
          expect(aat).toBeCloseTo(exact.cov[i]![j]!, 10);
        }
      }
    });
  }

  it("is exactly non-centred for a channel without a guide (μ = m0 + s0·u, δB = τB·u, as in model.md)", () => {
    const level = new GuidedChannelLevel(B, M, C, cellBrand, cellMarket, true, true);
    const mu = new Float64Array(C);
    const delta = new Float64Array(B * C);
    const lp = level.build(1, tau.m0, tau.s0, tau.tauB, tau.tauM, tau.tauG, guideMean, guidePrecision, q, MU_AT, Z_AT, mu, delta);
    expect(mu[1]).toBeCloseTo(tau.m0 + tau.s0 * q[MU_AT + 1]!, 12);
    for (let b = 0; b < B; b++) expect(delta[b * C + 1]).toBeCloseTo(tau.tauB * q[Z_AT + b * C + 1]!, 12);
    // log N(u): the Jacobian s0·τB^B cancels the priors' normalisers
    let expected = -0.5 * q[MU_AT + 1]! ** 2;
    for (let b = 0; b < B; b++) expected -= 0.5 * q[Z_AT + b * C + 1]! ** 2;
    expect(lp).toBeCloseTo(expected, 10);
  });

  it("has an exact reverse pass (finite differences in u, the log τ's and the guide's means)", () => {
    // f = build's term + k0·μ + Σ_b k_b·δB_b, so that the downstream gradient is k
    const k = Float64Array.from({ length: 1 + B }, () => rng.normal());
    for (const [brandOn, marketOn] of [[true, true], [true, false], [false, true], [false, false]] as const) {
      const lv = new GuidedChannelLevel(B, M, C, cellBrand, cellMarket, brandOn, marketOn);
      const f = (u: Float64Array, x: readonly number[], means: Float64Array = guideMean): number => {
        const mu = new Float64Array(C);
        const delta = new Float64Array(B * C);
        let value = lv.build(0, tau.m0, tau.s0, Math.exp(x[0]!), Math.exp(x[1]!), Math.exp(x[2]!), means, guidePrecision, u, MU_AT, Z_AT, mu, delta);
        value += k[0]! * mu[0]!;
        if (brandOn) for (let b = 0; b < B; b++) value += k[1 + b]! * delta[b * C]!;
        return value;
      };
      const x = [Math.log(tau.tauB), Math.log(tau.tauM), Math.log(tau.tauG)] as const;
      const mu = new Float64Array(C);
      const delta = new Float64Array(B * C);
      lv.build(0, tau.m0, tau.s0, tau.tauB, tau.tauM, tau.tauG, guideMean, guidePrecision, q, MU_AT, Z_AT, mu, delta);
      const gradDelta = new Float64Array(B * C);
      for (let b = 0; b < B; b++) gradDelta[b * C] = k[1 + b]!;
      const grad = new Float64Array(C + B * C);
      const out = new Float64Array(3);
      const meanGrad = new Float64Array(G * C);
      lv.backprop(0, tau.m0, tau.s0, tau.tauB, tau.tauM, tau.tauG, guideMean, guidePrecision, k[0]!, gradDelta, MU_AT, Z_AT, grad, out, meanGrad);
      const h = 1e-6;
      const coordinates = [MU_AT, ...(brandOn ? Array.from({ length: B }, (_, b) => Z_AT + b * C) : [])];
      for (const i of coordinates) {
        const up = q.slice();
        const down = q.slice();
        up[i] = up[i]! + h;
        down[i] = down[i]! - h;
        expect(grad[i]).toBeCloseTo((f(up, x) - f(down, x)) / (2 * h), 6);
      }
      for (let i = 0; i < 3; i++) {
        const up = [...x];
        const down = [...x];
        up[i] = up[i]! + h;
        down[i] = down[i]! - h;
        const fd = (f(q, up) - f(q, down)) / (2 * h);
        if ((!brandOn && i === 0) || (!marketOn && i === 1)) expect(out[i] === 0).toBe(true);
        else expect(out[i]).toBeCloseTo(fd, 6);
      }
      for (let g = 0; g < G; g++) {
        const up = guideMean.slice();
        const down = guideMean.slice();
        up[g * C] = up[g * C]! + h;
        down[g * C] = down[g * C]! - h;
        expect(meanGrad[g * C]).toBeCloseTo((f(q, x, up) - f(q, x, down)) / (2 * h), 6);
      }
    }
  });
});
