/**
 * Pooling factor of one level of a multilevel model (Gelman & Pardoe 2006, Technometrics
 * 48(2), eq. 6): λ = 1 − Var_j(E[ε_j]) / E[Var_j(ε_j)], where ε_j are the level's
 * deviations, E is over posterior draws and Var over the level's units (both with the
 * J − 1 denominator). λ near 1: strong pooling; near 0: little pooling.
 * `deviations` is row-major draws × units. NaN with fewer than two units or no spread.
 */
export function poolingFactor(deviations: Float64Array, drawCount: number, units: number): number {
  if (!Number.isInteger(drawCount) || !Number.isInteger(units) || drawCount < 1 || units < 0 || deviations.length !== drawCount * units) {
    throw new RangeError("poolingFactor: deviations must be drawCount × units values");
  }
  if (units < 2) return NaN;
  const unitMeans = new Float64Array(units);
  let meanOfVariances = 0;
  for (let d = 0; d < drawCount; d++) {
    let mean = 0;
    for (let j = 0; j < units; j++) mean += deviations[d * units + j]!;
    mean /= units;
    let ss = 0;
    for (let j = 0; j < units; j++) {
      const v = deviations[d * units + j]!;
      ss += (v - mean) * (v - mean);
      unitMeans[j] = unitMeans[j]! + v / drawCount;
    }
    meanOfVariances += ss / (units - 1) / drawCount;
  }
  let grand = 0;
  for (let j = 0; j < units; j++) grand += unitMeans[j]!;
  grand /= units;
  let varianceOfMeans = 0;
  for (let j = 0; j < units; j++) varianceOfMeans += (unitMeans[j]! - grand) ** 2;
  varianceOfMeans /= units - 1;
  if (!(meanOfVariances > 0)) return NaN;
  return 1 - varianceOfMeans / meanOfVariances;
}
