/** Conversions at the edge: complex response (re, im) to magnitude in dB and phase in degrees. */

/**
 * Writes 20·log10|H| (dB) and arg H (degrees, wrapped to (−180, 180]) for each point. Points that are not
 * finite or exactly zero get NaN in both (typed arrays cannot hold null; callers map NaN to null).
 */
export function toMagnitudePhase(
  re: Float64Array,
  im: Float64Array,
  magDb: Float64Array = new Float64Array(re.length),
  phaseDeg: Float64Array = new Float64Array(re.length),
): { magDb: Float64Array; phaseDeg: Float64Array } {
  for (let k = 0; k < re.length; k++) {
    const m = Math.hypot(re[k], im[k]);
    if (!Number.isFinite(m) || m === 0) {
      magDb[k] = NaN;
      phaseDeg[k] = NaN;
      continue;
    }
    magDb[k] = 20 * Math.log10(m);
    const d = (Math.atan2(im[k], re[k]) * 180) / Math.PI;
    phaseDeg[k] = d <= -180 ? d + 360 : d;
  }
  return { magDb, phaseDeg };
}
