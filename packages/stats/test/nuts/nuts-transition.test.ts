import { describe, expect, it } from "vitest";
import { scaledGaussianModel } from "../../src/models/examples/scaled-gaussian";
import { createNutsInfo, createNutsState, NutsWorkspace, nutsTransition, type NutsState } from "../../src/nuts/nuts-transition";
import { createRandomSource } from "../../src/rng/create-random-source";

describe("NUTS transition", () => {
  const model = scaledGaussianModel({ scales: [1, 1, 1, 1] });
  const settings = { stepSize: 0.4, inverseMetric: new Float64Array(4).fill(1), maxTreeDepth: 10 };
  const startState = (): NutsState => {
    const s = createNutsState(4);
    s.position.set([0.5, -0.5, 1, 0]);
    s.logDensity = model.logDensityGradient(s.position, s.gradient);
    return s;
  };

  it("is a pure step: same state and seed give the same next state; the input is not modified", () => {
    const run = () => {
      const workspace = new NutsWorkspace(model, 10);
      const state = startState();
      const next = createNutsState(4);
      const info = createNutsInfo();
      nutsTransition(workspace, state, createRandomSource(3), settings, next, info);
      expect(Array.from(state.position)).toEqual([0.5, -0.5, 1, 0]);
      return { position: Array.from(next.position), info: { ...info } };
    };
    expect(run()).toEqual(run());
  });

  it("reports consistent diagnostics: 2^depth − 1 ≤ steps ≤ 2^(depth+1) − 1 (a rejected last subtree still costs its steps), accept stat in [0, 1], energy of the draw", () => {
    const workspace = new NutsWorkspace(model, 10);
    let state = startState();
    let next = createNutsState(4);
    const info = createNutsInfo();
    const rng = createRandomSource(11);
    for (let i = 0; i < 200; i++) {
      nutsTransition(workspace, state, rng, settings, next, info);
      expect(info.leapfrogSteps).toBeGreaterThanOrEqual(2 ** info.treeDepth - 1);
      expect(info.leapfrogSteps).toBeLessThanOrEqual(2 ** (info.treeDepth + 1) - 1);
      expect(info.acceptStat).toBeGreaterThanOrEqual(0);
      expect(info.acceptStat).toBeLessThanOrEqual(1);
      expect(info.divergent).toBe(false);
      expect(next.logDensity).toBeCloseTo(model.logDensityGradient(next.position, new Float64Array(4)), 12);
      expect(info.energy).toBeGreaterThanOrEqual(-next.logDensity);
      [state, next] = [next, state];
    }
  });

  it("allows the next state to be the input state", () => {
    const a = startState();
    const b = startState();
    const out = createNutsState(4);
    nutsTransition(new NutsWorkspace(model, 10), a, createRandomSource(4), settings, a, createNutsInfo());
    nutsTransition(new NutsWorkspace(model, 10), b, createRandomSource(4), settings, out, createNutsInfo());
    expect(Array.from(a.position)).toEqual(Array.from(out.position));
  });

  it("stops at the maximum tree depth with a tiny step size", () => {
    const info = createNutsInfo();
    nutsTransition(new NutsWorkspace(model, 3), startState(), createRandomSource(1), { ...settings, stepSize: 1e-4, maxTreeDepth: 3 }, createNutsState(4), info);
    expect(info.treeDepth).toBe(3);
    expect(info.leapfrogSteps).toBe(7);
  });

  it("flags a divergence when the energy error exceeds the limit", () => {
    const info = createNutsInfo();
    nutsTransition(new NutsWorkspace(model, 10), startState(), createRandomSource(1), { ...settings, stepSize: 50 }, createNutsState(4), info);
    expect(info.divergent).toBe(true);
  });

  it("rejects a maximum tree depth outside 1..30", () => {
    expect(() => new NutsWorkspace(model, 0)).toThrow(/maxTreeDepth/);
  });
});
