/**
 * How the eye's optics degrade away from the fovea, from Navarro, Artal & Williams (1993), JOSA A
 * 10(2):201: the monochromatic MTF (4 mm pupil, natural accommodation) at eccentricities 0–60°,
 * fitted as M(f) = (1 − C)·exp(−A·f) + C·exp(−B·f) with f in cpd. Parameters as tabulated in that
 * paper (checked: quoted alike by two open sources). The eye's own on-axis optics are computed
 * elsewhere; off-axis they are multiplied by the ratio M_e(f)/M_0(f) (our proposal), which
 * oblique astigmatism dominates.
 */

/** Eccentricities (deg) and Navarro et al. (1993) parameters A, B (deg) and C at each. */
export const NAVARRO_ECCENTRICITIES_DEG = [0, 5, 10, 20, 30, 40, 50, 60] as const;
export const NAVARRO_A = [0.172, 0.245, 0.245, 0.328, 0.606, 0.82, 0.93, 1.89] as const;
export const NAVARRO_B = [0.037, 0.041, 0.041, 0.038, 0.064, 0.064, 0.059, 0.108] as const;
export const NAVARRO_C = [0.22, 0.2, 0.2, 0.14, 0.12, 0.09, 0.067, 0.05] as const;

/**
 * Linear between the tabulated eccentricities, except from 0 to 5° where it goes with e² — the way
 * oblique astigmatism grows off-axis (standard optics) — so the fovea itself stays foveal.
 */
function interpolate(values: readonly number[], eccentricityDeg: number): number {
  const e = NAVARRO_ECCENTRICITIES_DEG;
  if (eccentricityDeg <= 0) return values[0];
  if (eccentricityDeg >= e[e.length - 1]) return values[values.length - 1];
  let i = 0;
  while (eccentricityDeg > e[i + 1]) i++;
  let t = (eccentricityDeg - e[i]) / (e[i + 1] - e[i]);
  if (i === 0) t *= t;
  return values[i] + t * (values[i + 1] - values[i]);
}

/** Navarro et al. (1993) MTF at eccentricity e (linear between the tabulated ones) and f cpd. */
export function navarroMtf(eccentricityDeg: number, frequencyCpd: number): number {
  const a = interpolate(NAVARRO_A, eccentricityDeg);
  const b = interpolate(NAVARRO_B, eccentricityDeg);
  const c = interpolate(NAVARRO_C, eccentricityDeg);
  return (1 - c) * Math.exp(-a * frequencyCpd) + c * Math.exp(-b * frequencyCpd);
}

/** The off-axis loss: M_e(f)/M_0(f), at most 1. */
export function offAxisRatio(eccentricityDeg: number, frequencyCpd: number): number {
  return Math.min(1, navarroMtf(eccentricityDeg, frequencyCpd) / navarroMtf(0, frequencyCpd));
}

/**
 * Variance (deg²) of the Gaussian whose transfer equals the off-axis ratio at `matchCpd` — the blur
 * the filters apply as a stand-in for the ratio (our simplification), matched where the percept's
 * detail lies: half the local retinal cutoff.
 */
export function offAxisVarianceDeg2(eccentricityDeg: number, matchCpd: number): number {
  const r = offAxisRatio(eccentricityDeg, matchCpd);
  if (r >= 1 || matchCpd <= 0) return 0;
  // exp(−2π²σ²f²) = r  ⇒  σ² = −ln r / (2π² f²)
  return -Math.log(r) / (2 * Math.PI * Math.PI * matchCpd * matchCpd);
}
