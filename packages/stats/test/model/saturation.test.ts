import { describe, expect, it } from "vitest";
import {
  hillShare,
  saturationExponential,
  saturationExponentialSlope,
  saturationExponentialThetaDerivative,
  saturationHill,
  saturationHillWithDerivatives,
  steadyStateResponse,
} from "../../src/model/saturation";

describe("exponential saturation", () => {
  it("has slope 1 at zero and approaches θ", () => {
    expect(saturationExponential(0, 500)).toBe(0);
    expect(saturationExponentialSlope(0, 500)).toBe(1);
    expect(saturationExponential(1e7, 500)).toBeCloseTo(500, 8);
    // hand-worked: θ(1 − e^{−1}) at a = θ
    expect(saturationExponential(500, 500)).toBeCloseTo(500 * (1 - Math.exp(-1)), 10);
  });

  it("has the right derivatives (finite differences)", () => {
    const h = 1e-4;
    for (const [a, theta] of [[10, 400], [300, 400], [2000, 400], [0.5, 3]] as const) {
      const dA = (saturationExponential(a + h, theta) - saturationExponential(a - h, theta)) / (2 * h);
      const dTheta = (saturationExponential(a, theta + h) - saturationExponential(a, theta - h)) / (2 * h);
      expect(saturationExponentialSlope(a, theta)).toBeCloseTo(dA, 7);
      expect(saturationExponentialThetaDerivative(a, theta)).toBeCloseTo(dTheta, 7);
    }
  });
});

describe("Hill saturation", () => {
  it("gives exactly one half at the half-saturation point", () => {
    // Jin et al. (2017), Hill function: a^k / (a^k + h^k) = 1/2 at a = h.
    expect(hillShare(250, 250, 1)).toBe(0.5);
    expect(hillShare(250, 250, 2.7)).toBe(0.5);
    expect(saturationHill(80, 80, 0.6)).toBe(40);
  });

  it("has slope 1 at zero for shape 1", () => {
    expect((saturationHill(1e-6, 100, 1) - 0) / 1e-6).toBeCloseTo(1, 6);
  });

  it("has the right derivatives (finite differences)", () => {
    const out = new Float64Array(4);
    const h = 1e-5;
    for (const [a, theta, k] of [[50, 200, 1], [300, 200, 2.2], [20, 200, 0.7]] as const) {
      saturationHillWithDerivatives(a, theta, k, out);
      expect(out[0]).toBeCloseTo(saturationHill(a, theta, k), 12);
      expect(out[1]).toBeCloseTo((saturationHill(a + h, theta, k) - saturationHill(a - h, theta, k)) / (2 * h), 6);
      expect(out[2]).toBeCloseTo((saturationHill(a, theta + h, k) - saturationHill(a, theta - h, k)) / (2 * h), 6);
      expect(out[3]).toBeCloseTo((saturationHill(a, theta, k + h) - saturationHill(a, theta, k - h)) / (2 * h), 5);
    }
  });
});

describe("steadyStateResponse", () => {
  it("is β·θ·(1 − exp(−s/θ)) for the exponential form", () => {
    expect(steadyStateResponse("exponential", 1000, 0.02, 800)).toBeCloseTo(0.02 * 800 * (1 - Math.exp(-1.25)), 12);
    expect(steadyStateResponse("hill", 800, 0.02, 800, 3)).toBeCloseTo(0.02 * 400, 12);
  });
});
