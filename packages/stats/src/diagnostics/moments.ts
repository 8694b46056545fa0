/** Mean with a second-pass correction (as R's mean), so long chains lose no precision. */
export function mean(values: ArrayLike<number>): number {
  const n = values.length;
  let sum = 0;
  for (let i = 0; i < n; i++) sum += values[i]!;
  const first = sum / n;
  let correction = 0;
  for (let i = 0; i < n; i++) correction += values[i]! - first;
  return first + correction / n;
}

/** Sample variance with denominator n − 1 (two-pass). */
export function variance(values: ArrayLike<number>): number {
  const n = values.length;
  if (n < 2) return Number.NaN;
  const m = mean(values);
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const d = values[i]! - m;
    sum += d * d;
  }
  return sum / (n - 1);
}

export function pooled(chains: readonly ArrayLike<number>[]): Float64Array {
  let total = 0;
  for (const c of chains) total += c.length;
  const out = new Float64Array(total);
  let offset = 0;
  for (const c of chains) {
    for (let i = 0; i < c.length; i++) out[offset + i] = c[i]!;
    offset += c.length;
  }
  return out;
}

/** NaN for input that the convergence diagnostics cannot judge: non-finite or constant draws (as R's posterior). */
export function isDegenerate(chains: readonly ArrayLike<number>[]): boolean {
  let min = Number.POSITIVE_INFINITY;
  let max = Number.NEGATIVE_INFINITY;
  for (const c of chains) {
    for (let i = 0; i < c.length; i++) {
      const v = c[i]!;
      if (!Number.isFinite(v)) return true;
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  return !(Math.abs(max - min) >= Number.EPSILON);
}
