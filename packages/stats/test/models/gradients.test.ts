import { describe, expect, it } from "vitest";
import { buildModel } from "../../src/models/registry";
import { createRandomSource } from "../../src/rng/create-random-source";
import type { ModelSpec } from "../../src/model/density-model";

/** Central finite differences of the log density against the analytic gradient. */
function checkGradient(spec: ModelSpec, points: number, radius: number): void {
  const model = buildModel(spec);
  const n = model.dimension;
  const rng = createRandomSource(2024);
  const q = new Float64Array(n);
  const grad = new Float64Array(n);
  const scratch = new Float64Array(n);
  for (let k = 0; k < points; k++) {
    for (let i = 0; i < n; i++) q[i] = radius * (2 * rng.uniform() - 1);
    model.logDensityGradient(q, grad);
    for (let i = 0; i < n; i++) {
      const h = 1e-5 * Math.max(1, Math.abs(q[i]!));
      const x = q[i]!;
      q[i] = x + h;
      const up = model.logDensityGradient(q, scratch);
      q[i] = x - h;
      const down = model.logDensityGradient(q, scratch);
      q[i] = x;
      const numeric = (up - down) / (2 * h);
      expect(Math.abs(numeric - grad[i]!)).toBeLessThan(1e-6 * Math.max(1, Math.abs(numeric)));
    }
  }
}

describe("finite-difference check of every example model's gradient", () => {
  it("eight schools, non-centred", () =>
    checkGradient({ kind: "eight-schools-noncentred", data: { y: [28, 8, -3, 7, -1, 1, 18, 12], sigma: [15, 10, 16, 11, 9, 11, 10, 18] } }, 20, 2));
  it("normal mean", () => checkGradient({ kind: "normal-mean", data: { y: [1.2, -0.4, 3.1], sigma: 2, priorMean: 0.5, priorSd: 3 } }, 20, 4));
  it("scaled Gaussian", () => checkGradient({ kind: "scaled-gaussian", data: { scales: [0.01, 0.3, 1, 40] } }, 20, 2));
  it("funnel", () => checkGradient({ kind: "funnel-centred", data: { dimension: 5 } }, 20, 2));
});

describe("model registry", () => {
  it("names an unknown kind and lists the known ones", () => {
    expect(() => buildModel({ kind: "no-such-model", data: {} })).toThrow(/unknown model kind "no-such-model".*eight-schools-noncentred/);
  });

  it("gives clear errors for bad data", () => {
    expect(() => buildModel({ kind: "eight-schools-noncentred", data: { y: [1, 2], sigma: [1] } })).toThrow(/same length/);
    expect(() => buildModel({ kind: "eight-schools-noncentred", data: { y: [1], sigma: [-1] } })).toThrow(/sigma\[0\] must be positive/);
    expect(() => buildModel({ kind: "scaled-gaussian", data: { scales: [1, Number.NaN] } })).toThrow(/scales\[1\] must be a finite number/);
    expect(() => buildModel({ kind: "funnel-centred", data: { dimension: 0 } })).toThrow(/dimension must be an integer/);
    expect(() => buildModel({ kind: "normal-mean", data: null })).toThrow(/data must be an object/);
  });

  it("maps eight schools' unconstrained vector to mu, tau, theta, eta", () => {
    const model = buildModel({ kind: "eight-schools-noncentred", data: { y: [1, 2], sigma: [1, 1] } });
    expect(model.constrainedNames).toEqual(["mu", "tau", "theta[1]", "theta[2]", "eta[1]", "eta[2]"]);
    const out = new Float64Array(6);
    model.constrain(Float64Array.of(1, Math.log(2), 0.5, -1), out);
    expect(Array.from(out)).toEqual([1, 2, 2, -1, 0.5, -1]);
  });
});
