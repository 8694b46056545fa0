import type { RandomSource } from "./random-source";

/**
 * xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number generators",
 * ACM TOMS 47(4), 2021): a fast 32-bit generator with 128 bits of state.
 * Uniform doubles use 53 random bits; normals come from the polar method (Marsaglia &
 * Bray 1964), whose spare value is part of the saved state.
 */
export class Xoshiro128StarStar implements RandomSource {
  // Int32 words keep every operation in 32-bit integer arithmetic (no boxed doubles).
  private readonly s = new Int32Array(4);
  private hasSpare = false;
  private spare = 0;
  private readonly spareBits = new Float64Array(1);
  private readonly spareWords = new Uint32Array(this.spareBits.buffer);

  constructor(state: ArrayLike<number>) {
    if (state.length < 4) throw new Error("xoshiro128** needs a state of at least 4 words");
    for (let i = 0; i < 4; i++) this.s[i] = state[i]! | 0;
    if ((this.s[0]! | this.s[1]! | this.s[2]! | this.s[3]!) === 0) throw new Error("xoshiro128** state must not be all zero");
    if (state.length >= 7 && state[4] === 1) {
      this.spareWords[0] = state[5]! >>> 0;
      this.spareWords[1] = state[6]! >>> 0;
      this.hasSpare = true;
      this.spare = this.spareBits[0]!;
    }
  }

  /** Next 32-bit unsigned integer. */
  nextUint32(): number {
    const s = this.s;
    const s0 = s[0]!;
    const s1 = s[1]!;
    const s2 = s[2]! ^ s0;
    const s3 = s[3]! ^ s1;
    const m = Math.imul(s1, 5);
    const result = Math.imul((m << 7) | (m >>> 25), 9) >>> 0;
    s[1] = s1 ^ s2;
    s[0] = s0 ^ s3;
    s[2] = s2 ^ (s1 << 9);
    s[3] = (s3 << 11) | (s3 >>> 21);
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
    let r2 = 0;
    do {
      u = 2 * this.uniform() - 1;
      v = 2 * this.uniform() - 1;
      r2 = u * u + v * v;
    } while (r2 >= 1 || r2 === 0);
    const factor = Math.sqrt((-2 * Math.log(r2)) / r2);
    this.spare = v * factor;
    this.hasSpare = true;
    return u * factor;
  }

  saveState(): Uint32Array {
    this.spareBits[0] = this.spare;
    const s = this.s;
    return Uint32Array.of(s[0]! >>> 0, s[1]! >>> 0, s[2]! >>> 0, s[3]! >>> 0, this.hasSpare ? 1 : 0, this.spareWords[0]!, this.spareWords[1]!);
  }
}
