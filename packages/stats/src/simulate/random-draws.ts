import type { RandomSource } from "../rng/random-source";

/** Gamma(shape, 1) draw; Marsaglia & Tsang (2000), ACM TOMS 26(3), with the shape < 1 boost. */
export function drawGamma(rng: RandomSource, shape: number): number {
  if (!(shape > 0)) throw new RangeError(`gamma shape must be positive, got ${shape}`);
  if (shape < 1) {
    const u = rng.uniform();
    return drawGamma(rng, shape + 1) * Math.pow(u > 0 ? u : Number.MIN_VALUE, 1 / shape);
  }
  const d = shape - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  for (;;) {
    let x: number;
    let v: number;
    do {
      x = rng.normal();
      v = 1 + c * x;
    } while (v <= 0);
    v = v * v * v;
    const u = rng.uniform();
    if (u < 1 - 0.0331 * x * x * x * x) return d * v;
    if (u > 0 && Math.log(u) < 0.5 * x * x + d * (1 - v + Math.log(v))) return d * v;
  }
}

/** Beta(a, b) draw as G_a / (G_a + G_b). */
export function drawBeta(rng: RandomSource, a: number, b: number): number {
  const x = drawGamma(rng, a);
  const y = drawGamma(rng, b);
  return x / (x + y);
}

/** |Normal(0, scale)| draw. */
export function drawHalfNormal(rng: RandomSource, scale: number): number {
  return Math.abs(rng.normal()) * scale;
}

/** Draw from `draw` until it falls in [lo, hi] (a truncated distribution by rejection). */
export function drawWithin(draw: () => number, lo: number, hi: number): number {
  for (let attempt = 0; attempt < 10_000; attempt++) {
    const value = draw();
    if (value >= lo && value <= hi) return value;
  }
  throw new Error(`drawWithin: no draw fell in [${lo}, ${hi}] after 10000 attempts`);
}
