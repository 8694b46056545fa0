// The draw set's wire form: Float64 values survive base64 exactly (Infinity and
// subnormals too), and a wire form whose arrays do not match its sizes is refused.
import { describe, expect, it } from "vitest";
import { DRAW_SET_FORMAT, decodeDrawSet, decodeFloat64, encodeFloat64, type DrawSetWire } from "./draw-set";

describe("Float64 as base64", () => {
  it("round-trips every value bit for bit", () => {
    const values = [0, -0, 1, -1.5, Math.PI, Number.MAX_VALUE, Number.MIN_VALUE, 5e-324, Infinity, -Infinity, 1e300, -2.2250738585072014e-308];
    const back = decodeFloat64(encodeFloat64(values));
    expect(Array.from(back)).toEqual(values);
    expect(Object.is(back[1], -0)).toBe(true);
    expect(Number.isNaN(decodeFloat64(encodeFloat64([NaN]))[0])).toBe(true);
    // Longer than one chunk of the encoder.
    const long = Float64Array.from({ length: 20_000 }, (_, i) => Math.sin(i) * 1e6);
    expect(decodeFloat64(encodeFloat64(long))).toEqual(long);
    // Little-endian: 1.0 is 00 00 00 00 00 00 f0 3f.
    expect(encodeFloat64([1])).toBe(btoa(String.fromCharCode(0, 0, 0, 0, 0, 0, 0xf0, 0x3f)));
  });

  it("refuses bytes that are not whole values", () => {
    expect(() => decodeFloat64(btoa("abc"))).toThrow(/not whole Float64 values/);
  });
});

function wire(drawCount: number): DrawSetWire {
  const e = (n: number) => encodeFloat64(new Float64Array(n).fill(1));
  const G = 1;
  const C = 2;
  return {
    format: DRAW_SET_FORMAT,
    runId: "r",
    publishedAt: "2026-01-05T00:00:00.000Z",
    currency: "EUR",
    model: "pooled",
    saturation: "exponential",
    likelihood: "normal",
    maxLag: 4,
    seasonalityOrder: 1,
    channels: ["search", "social"],
    controls: [],
    cells: [
      { cellId: "c", brandId: "b", marketId: "m", brand: "Kestrova", market: "Veltria", firstWeek: "2025-01-06", firstAbsoluteWeek: 10, weeks: 3, trainWeeks: 3, outcome: e(3), spend: [e(3), e(3)], seasonalMean: e(2), controlsStandardised: [] },
    ],
    drawCount,
    arrays: {
      beta: e(2 * G * C),
      theta: e(2 * G * C),
      alpha: e(2 * G * C),
      hillShape: e(2 * G * C),
      baselineLevel: e(2 * G),
      beta1: e(2 * G),
      gamma: e(2 * G),
      delta: e(2 * G),
      controlCoef: e(0),
      sigma: e(2 * G),
      nu: encodeFloat64([Infinity, Infinity]),
    },
    caution: "model-based",
  };
}

describe("decodeDrawSet", () => {
  it("rebuilds the arrays with their sizes checked", () => {
    const set = decodeDrawSet(wire(2));
    expect(set.version).toBe(1);
    expect(set.beta).toHaveLength(4);
    expect(Array.from(set.nu)).toEqual([Infinity, Infinity]);
    expect(set.cells[0]!.spend).toHaveLength(2);
  });

  it("refuses arrays that do not match the draw count", () => {
    expect(() => decodeDrawSet(wire(3))).toThrow(/beta has 4 values, 6 expected/);
  });
});
