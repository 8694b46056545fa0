import { describe, expect, it } from "vitest";
import { dualAveraging } from "../../src/adaptation/dual-averaging";

describe("dual-averaging step size", () => {
  it("first update follows Hoffman & Gelman (2014) eq. (6) by hand", () => {
    // t = 1, t0 = 10: H̄ = (1/11)(0.8 − 0.3); log ε = μ − √1·H̄/0.05 with μ = log(10·1).
    const s = dualAveraging.update(dualAveraging.init(1), 0.3, { targetAcceptance: 0.8 });
    const hBar = 0.5 / 11;
    expect(s.gradientAverage).toBeCloseTo(hBar, 15);
    expect(Math.log(s.stepSize)).toBeCloseTo(Math.log(10) - hBar / 0.05, 12);
    // x̄ weight t^−κ = 1 at t = 1.
    expect(s.logStepSizeAverage).toBeCloseTo(Math.log(s.stepSize), 12);
  });

  it("finds the step size whose acceptance equals the target", () => {
    // Acceptance falls smoothly with step size: a(ε) = exp(−ε²); target 0.8 ⇒ ε* = √(−log 0.8).
    let s = dualAveraging.init(3);
    for (let i = 0; i < 2000; i++) s = dualAveraging.update(s, Math.exp(-(s.stepSize ** 2)), { targetAcceptance: 0.8 });
    expect(dualAveraging.final(s)).toBeCloseTo(Math.sqrt(-Math.log(0.8)), 2);
  });

  it("caps accept statistics above 1", () => {
    const a = dualAveraging.update(dualAveraging.init(1), 1, { targetAcceptance: 0.8 });
    const b = dualAveraging.update(dualAveraging.init(1), 7, { targetAcceptance: 0.8 });
    expect(b).toEqual(a);
  });
});
