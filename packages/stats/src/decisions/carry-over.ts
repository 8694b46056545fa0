import { cellChannelAt, checkCellChannel, type DrawSet } from "./draw-set";

/**
 * Carry-over profile per draw: the normalised geometric adstock weight of spend l weeks
 * ago, α^l / Σ_{k=0}^{L−1} α^k for l = 0..L−1 (the weights sum to 1). Row-major draws × L.
 */
export function carryOverWeights(set: DrawSet, g: number, c: number): Float64Array {
  checkCellChannel(set, g, c);
  const L = set.maxLag;
  const out = new Float64Array(set.drawCount * L);
  for (let d = 0; d < set.drawCount; d++) {
    const alpha = set.alpha[cellChannelAt(set, d, g, c)]!;
    let power = 1;
    let sum = 0;
    for (let l = 0; l < L; l++) {
      out[d * L + l] = power;
      sum += power;
      power *= alpha;
    }
    for (let l = 0; l < L; l++) out[d * L + l] = out[d * L + l]! / sum;
  }
  return out;
}
