/**
 * Generalised No-U-Turn criterion (Betancourt 2017, arXiv:1701.02434, §A.4.2): the
 * trajectory keeps going while both end velocities point along the summed momentum ρ.
 * `extra` is an optional momentum added to ρ (the one-point extensions of Stan's
 * base_nuts checks across subtrees), so no temporary vector is needed.
 */
export function keepsGoing(
  velocityStart: Float64Array,
  velocityEnd: Float64Array,
  rho: Float64Array,
  extra?: Float64Array,
): boolean {
  let dotStart = 0;
  let dotEnd = 0;
  const n = rho.length;
  if (extra === undefined) {
    for (let i = 0; i < n; i++) {
      dotStart += velocityStart[i]! * rho[i]!;
      dotEnd += velocityEnd[i]! * rho[i]!;
    }
  } else {
    for (let i = 0; i < n; i++) {
      const r = rho[i]! + extra[i]!;
      dotStart += velocityStart[i]! * r;
      dotEnd += velocityEnd[i]! * r;
    }
  }
  return dotStart > 0 && dotEnd > 0;
}
