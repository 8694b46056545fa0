import { describe, expect, it } from "vitest";
import { quantileSorted } from "../../src/diagnostics/quantile";
import { selectQuantiles } from "../../src/prior-check/select-quantiles";
import { testRandomSource } from "../model/test-random-source";

describe("selectQuantiles", () => {
  it("gives R's type-7 quantiles, like a full sort, for sizes with and without ties", () => {
    const rng = testRandomSource(17);
    for (const n of [1, 2, 3, 5, 10, 199, 200, 1001]) {
      for (const ties of [false, true]) {
        const values = Float64Array.from({ length: n }, () => (ties ? Math.floor(rng.uniform() * 4) : rng.normal()));
        const sorted = Float64Array.from(values).sort();
        const q = selectQuantiles(Float64Array.from(values));
        expect([q.q05, q.q25, q.q50, q.q75, q.q95]).toEqual([0.05, 0.25, 0.5, 0.75, 0.95].map((p) => quantileSorted(sorted, p)));
      }
    }
  });

  it("matches hand-computed values: 1..10 has type-7 quantiles 1.45, 3.25, 5.5, 7.75, 9.55", () => {
    // type 7: index (n − 1)p, e.g. 9·0.05 = 0.45 → 1 + 0.45·(2 − 1) = 1.45
    const q = selectQuantiles(Float64Array.from([7, 3, 10, 1, 9, 2, 8, 5, 4, 6]));
    expect(q.q05).toBeCloseTo(1.45, 12);
    expect(q.q25).toBeCloseTo(3.25, 12);
    expect(q.q50).toBeCloseTo(5.5, 12);
    expect(q.q75).toBeCloseTo(7.75, 12);
    expect(q.q95).toBeCloseTo(9.55, 12);
  });

  it("uses only the first n values and gives NaN for none", () => {
    expect(selectQuantiles(Float64Array.from([1, 2, 3, 100, 100]), 3).q50).toBe(2);
    expect(selectQuantiles(new Float64Array(0)).q50).toBeNaN();
  });
});
