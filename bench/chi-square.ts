// The upper tail of the chi-square distribution, for the benchmarks' goodness-of-fit checks.
import { logGamma } from "../packages/stats/src/model/special-functions";

/** Upper tail of the chi-square distribution: Q(k/2, x/2) by series or continued fraction (Press et al., Numerical Recipes §6.2). */
export function chiSquareUpperTail(x: number, df: number): number {
  const a = df / 2;
  const z = x / 2;
  if (z <= 0) return 1;
  const logGammaA = logGamma(a);
  if (z < a + 1) {
    let sum = 1 / a;
    let term = sum;
    for (let n = 1; n < 500; n++) {
      term *= z / (a + n);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * 1e-15) break;
    }
    return 1 - sum * Math.exp(-z + a * Math.log(z) - logGammaA);
  }
  let b = z + 1 - a;
  let c = 1 / 1e-300;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 500; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < 1e-300) d = 1e-300;
    c = b + an / c;
    if (Math.abs(c) < 1e-300) c = 1e-300;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-15) break;
  }
  return Math.exp(-z + a * Math.log(z) - logGammaA) * h;
}

