import type { RandomSource } from "../../src/rng/random-source";

/** A small seeded generator (xoshiro128**, Box–Muller) for tests of this folder only. */
export function testRandomSource(seed: number): RandomSource {
  const s = new Uint32Array(4);
  let x = seed >>> 0 || 1;
  for (let i = 0; i < 4; i++) {
    // splitmix32 to spread the seed over the state
    x = (x + 0x9e3779b9) >>> 0;
    let z = x;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    s[i] = (z ^ (z >>> 16)) >>> 0;
  }
  const next = (): number => {
    const result = Math.imul(((Math.imul(s[1]!, 5) << 7) | (Math.imul(s[1]!, 5) >>> 25)) >>> 0, 9) >>> 0;
    const t = (s[1]! << 9) >>> 0;
    s[2]! ^= s[0]!;
    s[3]! ^= s[1]!;
    s[1]! ^= s[2]!;
    s[0]! ^= s[3]!;
    s[2]! ^= t;
    s[3] = ((s[3]! << 11) | (s[3]! >>> 21)) >>> 0;
    return result;
  };
  let spare: number | undefined;
  return {
    uniform: () => next() / 4294967296,
    normal: () => {
      if (spare !== undefined) {
        const v = spare;
        spare = undefined;
        return v;
      }
      let u = 0;
      while (u === 0) u = next() / 4294967296;
      const v = next() / 4294967296;
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      return r * Math.cos(2 * Math.PI * v);
    },
    saveState: () => new Uint32Array(s),
  };
}
