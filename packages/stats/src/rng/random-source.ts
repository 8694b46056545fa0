/**
 * A seeded source of randomness. Every random quantity in this package comes from one;
 * the platform's unseeded generator is never used, so a run with the same seed gives the same draws.
 */
export interface RandomSource {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Standard normal. */
  normal(): number;
  /** The generator's full state, so a chain can be stopped and resumed exactly. */
  saveState(): Uint32Array;
}
