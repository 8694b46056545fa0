/**
 * Baseline regressors of a cell, each centred within the cell so that β0 is the cell's
 * mean weekly outcome and nearly uncorrelated with the other coefficients.
 */

/** Seasonal period in weeks (mean Gregorian year / 7). */
export const SEASONAL_PERIOD_WEEKS = 52.1775;

/** Centred trend in years: ť[t] = ((t − 1) − (T − 1)/2) / 52 for t = 1..T (here t is 0-based). */
export function trendCentred(t: number, weeks: number): number {
  return (t - (weeks - 1) / 2) / 52;
}

/** sin(2π j w / 52.1775) for absolute week w. */
export function seasonalSine(j: number, absoluteWeek: number): number {
  return Math.sin((2 * Math.PI * j * absoluteWeek) / SEASONAL_PERIOD_WEEKS);
}

/** cos(2π j w / 52.1775) for absolute week w. */
export function seasonalCosine(j: number, absoluteWeek: number): number {
  return Math.cos((2 * Math.PI * j * absoluteWeek) / SEASONAL_PERIOD_WEEKS);
}

/**
 * Means of the uncentred seasonal columns over a cell's weeks, written as
 * [mean S_1, mean C_1, mean S_2, mean C_2, ...] (length 2J).
 */
export function seasonalMeans(firstAbsoluteWeek: number, weeks: number, order: number): Float64Array {
  const means = new Float64Array(2 * order);
  for (let j = 1; j <= order; j++) {
    let s = 0;
    let c = 0;
    for (let t = 0; t < weeks; t++) {
      s += seasonalSine(j, firstAbsoluteWeek + t);
      c += seasonalCosine(j, firstAbsoluteWeek + t);
    }
    means[2 * (j - 1)] = weeks > 0 ? s / weeks : 0;
    means[2 * (j - 1) + 1] = weeks > 0 ? c / weeks : 0;
  }
  return means;
}

/**
 * The centred seasonal design of a cell, laid out column-major: column 2(j−1) is S_j,
 * column 2(j−1)+1 is C_j, each of length `weeks`, each minus its mean over the cell.
 */
export function seasonalDesignCentred(firstAbsoluteWeek: number, weeks: number, order: number): Float64Array {
  const design = new Float64Array(2 * order * weeks);
  const means = seasonalMeans(firstAbsoluteWeek, weeks, order);
  for (let j = 1; j <= order; j++) {
    const sCol = 2 * (j - 1) * weeks;
    const cCol = sCol + weeks;
    for (let t = 0; t < weeks; t++) {
      design[sCol + t] = seasonalSine(j, firstAbsoluteWeek + t) - means[2 * (j - 1)]!;
      design[cCol + t] = seasonalCosine(j, firstAbsoluteWeek + t) - means[2 * (j - 1) + 1]!;
    }
  }
  return design;
}
