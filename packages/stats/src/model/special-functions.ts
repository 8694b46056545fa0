/** Log-gamma, digamma and friends for the Student-t likelihood and the ν prior. */

const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** log Γ(x) for x > 0; Lanczos (1964) approximation with g = 7, n = 9 (relative error ~1e-15). */
export function logGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  const z = x - 1;
  let sum = LANCZOS[0]!;
  for (let i = 1; i < LANCZOS_G + 2; i++) sum += LANCZOS[i]! / (z + i);
  const t = z + LANCZOS_G + 0.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

/** ψ(x) = d/dx log Γ(x) for x > 0: recurrence up to x ≥ 6, then the asymptotic series (Abramowitz & Stegun 6.3.18). */
export function digamma(x: number): number {
  let result = 0;
  let v = x;
  while (v < 6) {
    result -= 1 / v;
    v += 1;
  }
  const inv = 1 / v;
  const inv2 = inv * inv;
  return (
    result +
    Math.log(v) -
    0.5 * inv -
    inv2 * (1 / 12 - inv2 * (1 / 120 - inv2 * (1 / 252 - inv2 * (1 / 240 - inv2 * (1 / 132)))))
  );
}
