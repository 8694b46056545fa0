import type { RandomSource } from "./random-source";

/**
 * xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number generators",
 * ACM TOMS 47(4), 2021): a fast 32-bit generator with 128 bits of state.
 * Uniform doubles use 53 random bits; normals come from the polar method (Marsaglia &
 * Bray 1964), whose spare value is part of the saved state.
 */
export class Xoshiro128StarStar implements RandomSource {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private hasSpare = false;
  private spare = 0;
  private readonly spareBits = new Float64Array(1);
  private readonly spareWords = new Uint32Array(this.spareBits.buffer);

  constructor(state: ArrayLike<number>) {
    if (state.length < 4) throw new Error("xoshiro128** needs a state of at least 4 words");
    this.s0 = state[0]! >>> 0;
    this.s1 = state[1]! >>> 0;
    this.s2 = state[2]! >>> 0;
    this.s3 = state[3]! >>> 0;
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) throw new Error("xoshiro128** state must not be all zero");
    if (state.length >= 7 && state[4] === 1) {
      this.spareWords[0] = state[5]! >>> 0;
      this.spareWords[1] = state[6]! >>> 0;
      this.hasSpare = true;
      this.spare = this.spareBits[0]!;
    }
  }

  /** Next 32-bit unsigned integer. */
  nextUint32(): number {
    const s1 = this.s1;
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0;
    const t = (s1 << 9) >>> 0;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    this.s0 >>>= 0;
    this.s1 >>>= 0;
    this.s2 >>>= 0;
    return result;
  }

  uniform(): number {
    const hi = this.nextUint32() >>> 5; // 27 bits
    const lo = this.nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    let u = 0;
    let v = 0;
    let s = 0;
    do {
      u = 2 * this.uniform() - 1;
      v = 2 * this.uniform() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const factor = Math.sqrt((-2 * Math.log(s)) / s);
    this.spare = v * factor;
    this.hasSpare = true;
    return u * factor;
  }

  saveState(): Uint32Array {
    this.spareBits[0] = this.spare;
    return Uint32Array.of(this.s0, this.s1, this.s2, this.s3, this.hasSpare ? 1 : 0, this.spareWords[0]!, this.spareWords[1]!);
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
