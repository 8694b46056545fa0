import { describe, expect, it } from "vitest";
import { leapfrog } from "../../src/nuts/integrator";
import { createPhasePoint } from "../../src/nuts/phase-point";
import { scaledGaussianModel } from "../../src/models/examples/scaled-gaussian";

describe("leapfrog", () => {
  const model = scaledGaussianModel({ scales: [1, 2, 0.5] });
  const inverseMetric = Float64Array.from([1, 3, 0.25]);
  const start = () => {
    const z = createPhasePoint(3);
    z.q.set([0.3, -1.2, 0.4]);
    z.p.set([0.5, 0.1, -0.7]);
    z.logDensity = model.logDensityGradient(z.q, z.grad);
    return z;
  };

  it("is time-reversible: L steps forward then L back returns to the start", () => {
    const z = start();
    for (let i = 0; i < 25; i++) leapfrog(model, z, inverseMetric, 0.1);
    for (let i = 0; i < 25; i++) leapfrog(model, z, inverseMetric, -0.1);
    const z0 = start();
    for (let i = 0; i < 3; i++) {
      expect(z.q[i]).toBeCloseTo(z0.q[i]!, 12);
      expect(z.p[i]).toBeCloseTo(z0.p[i]!, 12);
    }
  });

  it("keeps the energy error second order in the step size (Neal 2011, §5.2)", () => {
    const energyError = (epsilon: number): number => {
      const z = start();
      let h0 = -z.logDensity;
      for (let i = 0; i < 3; i++) h0 += 0.5 * z.p[i]! * z.p[i]! * inverseMetric[i]!;
      const steps = Math.round(1 / epsilon);
      let worst = 0;
      for (let s = 0; s < steps; s++) {
        leapfrog(model, z, inverseMetric, epsilon);
        worst = Math.max(worst, Math.abs(z.kinetic - z.logDensity - h0));
      }
      return worst;
    };
    const ratio = energyError(0.02) / energyError(0.01);
    expect(ratio).toBeGreaterThan(3.5);
    expect(ratio).toBeLessThan(4.5);
  });

  it("refreshes velocity and kinetic energy", () => {
    const z = start();
    leapfrog(model, z, inverseMetric, 0.1);
    let kinetic = 0;
    for (let i = 0; i < 3; i++) {
      expect(z.v[i]).toBeCloseTo(inverseMetric[i]! * z.p[i]!, 14);
      kinetic += 0.5 * z.p[i]! * z.v[i]!;
    }
    expect(z.kinetic).toBeCloseTo(kinetic, 14);
  });
});
