import { describe, expect, it } from "vitest";
import { keepsGoing, mergeKeepsGoing } from "../../src/nuts/termination";

const v = (...xs: number[]) => Float64Array.from(xs);

describe("generalised U-turn criterion", () => {
  it("continues while both end velocities point along ρ and stops otherwise (hand-computed)", () => {
    expect(keepsGoing(v(1, 0), v(1, 1), v(2, 1))).toBe(true); // dots 2 and 3
    expect(keepsGoing(v(1, 0), v(-1, 0), v(2, 1))).toBe(false); // end velocity reversed
    expect(keepsGoing(v(0, 1), v(1, 0), v(1, -1))).toBe(false); // start dot −1
  });

  it("merges ρ and applies the whole-trajectory check", () => {
    const rho = new Float64Array(2);
    const ok = mergeKeepsGoing(v(1, 0), v(1, 1), rho, v(1, 0), v(1, 0), v(1, 0), v(1, 0), v(0, 1), v(0, 1), false);
    expect(Array.from(rho)).toEqual([2, 1]);
    expect(ok).toBe(true);
  });

  it("catches a U-turn that only shows across the two halves (Stan's extra checks)", () => {
    // Init half moves right (ρ_init = (3, 0)); final half starts by moving sharply left.
    // The merged ρ = (3, 0) + (−1, 0.2) still points right for both outer velocities, but
    // init extended by the final half's first point, ρ = (3,0) + (−4, 0), does not.
    const rho = new Float64Array(2);
    const args = [v(3, 0), v(-1, 0.2), rho, v(1, 0), v(1, 0.1), v(1, 0), v(1, 0), v(-4, 0), v(-4, 0)] as const;
    expect(mergeKeepsGoing(...args, false)).toBe(true);
    expect(mergeKeepsGoing(...args, true)).toBe(false);
  });

  it("allows the output to be one of the inputs", () => {
    const rhoInit = v(1, 2);
    mergeKeepsGoing(rhoInit, v(3, 4), rhoInit, v(1, 1), v(1, 1), v(0, 0), v(0, 0), v(0, 0), v(0, 0), true);
    expect(Array.from(rhoInit)).toEqual([4, 6]);
  });
});
