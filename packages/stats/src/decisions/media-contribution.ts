import { adstockGeometricUnchecked } from "../model/adstock";
import { cellChannelAt, type DrawSet } from "./draw-set";

/**
 * Writes the contribution β·r(a[t]) of channel c in cell g under draw d for a spend
 * series (the adstock starts from zero before its first week) into `out`.
 * `adstockBuffer` has at least the series' length.
 */
export function contributionSeries(
  set: DrawSet,
  d: number,
  g: number,
  c: number,
  spend: Float64Array,
  out: Float64Array,
  adstockBuffer: Float64Array,
): void {
  const at = cellChannelAt(set, d, g, c);
  const beta = set.beta[at]!;
  const theta = set.theta[at]!;
  adstockGeometricUnchecked(spend, spend.length, set.alpha[at]!, set.maxLag, adstockBuffer, undefined);
  if (set.saturation === "exponential") {
    for (let t = 0; t < spend.length; t++) out[t] = -beta * theta * Math.expm1(-adstockBuffer[t]! / theta);
  } else {
    const shape = set.hillShape[at]!;
    for (let t = 0; t < spend.length; t++) {
      const a = adstockBuffer[t]!;
      const u = a > 0 ? Math.pow(a / theta, shape) : 0;
      out[t] = (beta * theta * u) / (1 + u);
    }
  }
}

/** The baseline without media in week t of cell g under draw d (t may run past the data; controls then sit at their mean). */
export function baselineAt(set: DrawSet, d: number, g: number, t: number): number {
  const cell = set.cells[g]!;
  const G = set.cells.length;
  const J = set.seasonalityOrder;
  const K = set.controls.length;
  const train = cell.trainWeeks;
  let value = set.baselineLevel[d * G + g]! + (set.beta1[d * G + g]! * (t - (train - 1) / 2)) / 52;
  const w = cell.firstAbsoluteWeek + t;
  for (let j = 1; j <= J; j++) {
    const arg = (2 * Math.PI * j * w) / 52.1775;
    value += set.gamma[(d * G + g) * J + j - 1]! * (Math.sin(arg) - cell.seasonalMean[2 * (j - 1)]!);
    value += set.delta[(d * G + g) * J + j - 1]! * (Math.cos(arg) - cell.seasonalMean[2 * (j - 1) + 1]!);
  }
  if (t < cell.weeks) for (let k = 0; k < K; k++) value += set.controlCoef[(d * G + g) * K + k]! * cell.controlsStandardised[k]![t]!;
  return value;
}
