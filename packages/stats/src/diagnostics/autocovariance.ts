import { createFftPlan, fft, type FftPlan } from "./fft";
import { mean } from "./moments";

/** Reusable buffers for the autocovariances of many series of one length. */
export interface AutocovarianceWorkspace {
  readonly length: number;
  readonly plan: FftPlan;
  readonly re: Float64Array;
  readonly im: Float64Array;
}

export function createAutocovarianceWorkspace(length: number): AutocovarianceWorkspace {
  let size = 1;
  while (size < 2 * length) size <<= 1;
  return { length, plan: createFftPlan(size), re: new Float64Array(size), im: new Float64Array(size) };
}

/**
 * Autocovariances at lags 0..N−1 by FFT (biased estimate, divisor N, as Geyer 1992
 * recommends), scaled by M/N where M is the next 2-3-5-smooth size ≥ N: R's posterior
 * normalises its padded transform that way, and its ESS values depend on it.
 */
export function autocovariance(values: ArrayLike<number>, workspace: AutocovarianceWorkspace = createAutocovarianceWorkspace(values.length)): Float64Array {
  const n = values.length;
  if (workspace.length !== n) throw new Error(`autocovariance workspace is for length ${workspace.length}, got ${n}`);
  const { re, im, plan } = workspace;
  const size = plan.size;
  re.fill(0);
  im.fill(0);
  const m = mean(values);
  for (let i = 0; i < n; i++) re[i] = values[i]! - m;
  fft(re, im, false, plan);
  for (let i = 0; i < size; i++) {
    re[i] = re[i]! * re[i]! + im[i]! * im[i]!;
    im[i] = 0;
  }
  fft(re, im, true, plan);
  const scale = nextSmoothSize(n) / (n * n * size);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = re[i]! * scale;
  return out;
}

/** Smallest integer ≥ n with no prime factor other than 2, 3 and 5 (posterior's fft_next_good_size). */
export function nextSmoothSize(n: number): number {
  if (n <= 2) return 2;
  for (let candidate = n; ; candidate++) {
    let m = candidate;
    while (m % 2 === 0) m /= 2;
    while (m % 3 === 0) m /= 3;
    while (m % 5 === 0) m /= 5;
    if (m <= 1) return candidate;
  }
}
