/** Twiddle factors and scratch for in-place radix-2 FFTs of one power-of-two size. */
export interface FftPlan {
  readonly size: number;
  readonly cos: Float64Array;
  readonly sin: Float64Array;
}

export function createFftPlan(size: number): FftPlan {
  if (size < 1 || (size & (size - 1)) !== 0) throw new Error(`FFT length must be a power of two, got ${size}`);
  const half = size >> 1;
  const cos = new Float64Array(half);
  const sin = new Float64Array(half);
  for (let k = 0; k < half; k++) {
    cos[k] = Math.cos((2 * Math.PI * k) / size);
    sin[k] = Math.sin((2 * Math.PI * k) / size);
  }
  return { size, cos, sin };
}

/** In-place iterative radix-2 complex FFT (Cooley & Tukey 1965); unnormalised in both directions. */
export function fft(re: Float64Array, im: Float64Array, inverse = false, plan: FftPlan = createFftPlan(re.length)): void {
  const n = re.length;
  if (plan.size !== n) throw new Error(`FFT plan is for length ${plan.size}, got ${n}`);
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      let t = re[i]!;
      re[i] = re[j]!;
      re[j] = t;
      t = im[i]!;
      im[i] = im[j]!;
      im[j] = t;
    }
  }
  const sign = inverse ? 1 : -1;
  for (let size = 2; size <= n; size <<= 1) {
    const half = size >> 1;
    const stride = n / size;
    for (let k = 0; k < half; k++) {
      const wr = plan.cos[k * stride]!;
      const wi = sign * plan.sin[k * stride]!;
      for (let start = k; start < n; start += size) {
        const b = start + half;
        const xr = re[b]! * wr - im[b]! * wi;
        const xi = re[b]! * wi + im[b]! * wr;
        re[b] = re[start]! - xr;
        im[b] = im[start]! - xi;
        re[start] = re[start]! + xr;
        im[start] = im[start]! + xi;
      }
    }
  }
}
