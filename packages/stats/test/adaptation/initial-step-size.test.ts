import { describe, expect, it } from "vitest";
import { initialStepSize } from "../../src/adaptation/initial-step-size";
import { scaledGaussianModel } from "../../src/models/examples/scaled-gaussian";
import { createNutsState } from "../../src/nuts/nuts-transition";
import type { DensityModel } from "../../src/model/density-model";
import { createRandomSource } from "../../src/rng/create-random-source";

describe("initial step-size heuristic (Hoffman & Gelman 2014, Algorithm 4)", () => {
  it("halves from 1 for a narrow target and returns a power-of-two multiple of the start", () => {
    const model = scaledGaussianModel({ scales: [0.01, 0.01] });
    const state = createNutsState(2);
    state.position.set([0.005, -0.005]);
    state.logDensity = model.logDensityGradient(state.position, state.gradient);
    const { stepSize, gradientEvaluations } = initialStepSize(model, state, Float64Array.of(1, 1), 1, createRandomSource(1));
    expect(stepSize).toBeLessThan(0.1);
    expect(Math.log2(stepSize)).toBe(Math.round(Math.log2(stepSize)));
    expect(gradientEvaluations).toBeGreaterThan(2);
    expect(Array.from(state.position)).toEqual([0.005, -0.005]);
  });

  it("refuses a flat (improper) density whose step size grows without bound", () => {
    const flat: DensityModel = {
      dimension: 1,
      constrainedNames: ["x"],
      logDensityGradient: (_q, grad) => {
        grad[0] = 0;
        return 0;
      },
      constrain: (q, out) => out.set(q),
    };
    const state = createNutsState(1);
    state.logDensity = 0;
    expect(() => initialStepSize(flat, state, Float64Array.of(1), 1, createRandomSource(2))).toThrow(/improper/);
  });
});
