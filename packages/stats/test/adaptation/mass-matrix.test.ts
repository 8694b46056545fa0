import { describe, expect, it } from "vitest";
import { diagonalMassMatrix } from "../../src/adaptation/mass-matrix";

describe("diagonal mass-matrix window", () => {
  it("gives Stan's regularised sample variance (n/(n+5))·s² + 1e-3·5/(n+5) (hand-computed)", () => {
    const state = diagonalMassMatrix.init(2);
    const rows = [
      [1, 10],
      [2, 20],
      [3, 30],
      [4, 40],
      [5, 50],
    ];
    for (const r of rows) diagonalMassMatrix.update(state, Float64Array.from(r));
    const out = new Float64Array(2);
    diagonalMassMatrix.final(state, out);
    // Sample variances 2.5 and 250 with n = 5: weight 5/10, prior 1e-3·5/10.
    expect(out[0]).toBeCloseTo(0.5 * 2.5 + 0.0005, 12);
    expect(out[1]).toBeCloseTo(0.5 * 250 + 0.0005, 10);
    expect(state.count).toBe(0);
  });

  it("is stable for values with a large common offset (Welford)", () => {
    const state = diagonalMassMatrix.init(1);
    for (const x of [1e9 + 4, 1e9 + 7, 1e9 + 13, 1e9 + 16]) diagonalMassMatrix.update(state, Float64Array.of(x));
    const out = new Float64Array(1);
    diagonalMassMatrix.final(state, out);
    // Sample variance of 4, 7, 13, 16 is 30; n = 4.
    expect(out[0]).toBeCloseTo((4 / 9) * 30 + 1e-3 * (5 / 9), 6);
  });

  it("refuses a window with fewer than two draws", () => {
    const state = diagonalMassMatrix.init(1);
    diagonalMassMatrix.update(state, Float64Array.of(1));
    expect(() => diagonalMassMatrix.final(state, new Float64Array(1))).toThrow(/at least 2/);
  });
});
