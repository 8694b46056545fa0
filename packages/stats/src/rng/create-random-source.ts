import type { RandomSource } from "./random-source";
import { Xoshiro128StarStar } from "./xoshiro128";

/**
 * A seeded generator for one stream (e.g. one chain) of a run. Different streams of the
 * same seed are decorrelated by hashing (seed, stream) through SplitMix32 (Steele, Lea &
 * Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014), so chain k of
 * a run gives the same draws whichever thread runs it.
 */
export function createRandomSource(seed: number, stream = 0): Xoshiro128StarStar {
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) {
    throw new Error(`seed must be an integer between 0 and 4294967295, got ${String(seed)}`);
  }
  if (!Number.isInteger(stream) || stream < 0 || stream > 0xffffffff) {
    throw new Error(`stream must be an integer between 0 and 4294967295, got ${String(stream)}`);
  }
  let x = mix32((seed ^ 0x9e3779b9) >>> 0);
  x = mix32((x ^ Math.imul(stream + 1, 0x85ebca6b)) >>> 0);
  const words = new Uint32Array(4);
  for (let i = 0; i < 4; i++) {
    x = (x + 0x9e3779b9) >>> 0;
    words[i] = mix32(x);
  }
  if ((words[0]! | words[1]! | words[2]! | words[3]!) === 0) words[0] = 1;
  return new Xoshiro128StarStar(words);
}

/** Rebuilds a generator from `saveState()`, continuing exactly where it stopped. */
export function restoreRandomSource(state: Uint32Array): RandomSource {
  return new Xoshiro128StarStar(state);
}

function mix32(z: number): number {
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
  return (z ^ (z >>> 16)) >>> 0;
}
