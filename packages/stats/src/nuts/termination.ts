/**
 * Generalised No-U-Turn criterion (Betancourt 2017, arXiv:1701.02434, §A.4.2): the
 * trajectory keeps going while both end velocities point along the summed momentum ρ.
 */
export function keepsGoing(velocityStart: Float64Array, velocityEnd: Float64Array, rho: Float64Array): boolean {
  let dotStart = 0;
  let dotEnd = 0;
  for (let i = 0; i < rho.length; i++) {
    dotStart += velocityStart[i]! * rho[i]!;
    dotEnd += velocityEnd[i]! * rho[i]!;
  }
  return dotStart > 0 && dotEnd > 0;
}

/**
 * Merges two adjacent sub-trajectories, "init" (first..initEnd) then "final"
 * (finalBegin..end), writing ρ = ρ_init + ρ_final into `rho` (which may be `rhoInit`), and
 * applies the three checks of Stan's base_nuts in one sweep: the merged trajectory, init
 * extended by finalBegin, and final extended by initEnd. With `extraChecks` false only
 * the merged check runs (for two single points the extensions are the same check).
 */
export function mergeKeepsGoing(
  rhoInit: Float64Array,
  rhoFinal: Float64Array,
  rho: Float64Array,
  vBegin: Float64Array,
  vEnd: Float64Array,
  pInitEnd: Float64Array,
  vInitEnd: Float64Array,
  pFinalBegin: Float64Array,
  vFinalBegin: Float64Array,
  extraChecks: boolean,
): boolean {
  const n = rho.length;
  let begin = 0;
  let end = 0;
  if (!extraChecks) {
    for (let i = 0; i < n; i++) {
      const r = rhoInit[i]! + rhoFinal[i]!;
      rho[i] = r;
      begin += vBegin[i]! * r;
      end += vEnd[i]! * r;
    }
    return begin > 0 && end > 0;
  }
  let initBegin = 0;
  let initExtended = 0;
  let finalExtended = 0;
  let finalEnd = 0;
  for (let i = 0; i < n; i++) {
    const a = rhoInit[i]!;
    const b = rhoFinal[i]!;
    const r = a + b;
    rho[i] = r;
    const vb = vBegin[i]!;
    const ve = vEnd[i]!;
    begin += vb * r;
    end += ve * r;
    const initPlus = a + pFinalBegin[i]!;
    initBegin += vb * initPlus;
    initExtended += vFinalBegin[i]! * initPlus;
    const finalPlus = b + pInitEnd[i]!;
    finalExtended += vInitEnd[i]! * finalPlus;
    finalEnd += ve * finalPlus;
  }
  return begin > 0 && end > 0 && initBegin > 0 && initExtended > 0 && finalExtended > 0 && finalEnd > 0;
}
