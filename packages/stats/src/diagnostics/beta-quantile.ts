/**
 * Regularised incomplete beta function and its inverse, for the quantile MCSE.
 * I_x(a, b) by Lentz's continued fraction (Press et al., Numerical Recipes 3rd ed. §6.4);
 * the inverse by safeguarded Newton steps inside a shrinking bracket.
 */
export function logGamma(x: number): number {
  // Lanczos approximation, g = 7, n = 9 (Press et al. §6.1), reflected below 0.5.
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  const c = [
    0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905,
    -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
  ];
  const z = x - 1;
  let sum = c[0]!;
  for (let i = 1; i < 9; i++) sum += c[i]! / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

export function incompleteBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const logFront = a * Math.log(x) + b * Math.log1p(-x) - (logGamma(a) + logGamma(b) - logGamma(a + b));
  if (x < (a + 1) / (a + b + 2)) return (Math.exp(logFront) * betaContinuedFraction(x, a, b)) / a;
  return 1 - (Math.exp(logFront) * betaContinuedFraction(1 - x, b, a)) / b;
}

function betaContinuedFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 100_000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return h;
}

/** x with I_x(a, b) = p. */
export function betaQuantile(p: number, a: number, b: number): number {
  if (!(a > 0 && b > 0) || !(p >= 0 && p <= 1)) return Number.NaN;
  if (p === 0) return 0;
  if (p === 1) return 1;
  const logBeta = logGamma(a) + logGamma(b) - logGamma(a + b);
  let lo = 0;
  let hi = 1;
  let x = a / (a + b);
  for (let iteration = 0; iteration < 200; iteration++) {
    const f = incompleteBeta(x, a, b) - p;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const density = Math.exp((a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - logBeta);
    let nextX = x - f / density;
    if (!(nextX > lo && nextX < hi) || !Number.isFinite(nextX)) nextX = 0.5 * (lo + hi);
    if (Math.abs(nextX - x) <= 1e-15 * Math.max(1e-300, Math.abs(x)) || hi - lo < 1e-16) return nextX;
    x = nextX;
  }
  return x;
}
