/**
 * The part of the eye's image spread that a typical wavefront does not hold — small-angle scatter in
 * the media, tear film and retina, eye movements during fixation, the spread of eyes about the mean.
 * It takes the form of the short-angle term of IJspeert, van den Berg & Spekreijse (1993), Vision
 * Res 33(1):15: a PSF β/(2π(θ² + β²)^{3/2}) whose transfer is exp(−2πβν) (ν in cycles/rad), i.e.
 * exp(−f/f_s) with f in cycles/deg and f_s = 1/(360·β). Its width is OUR FIT: with the typical
 * wavefront (Salmon & van de Pol 2006), the eye's chromatic aberration over the display's primaries
 * (Thibos et al. 1992), focus where the luminance image is best and the CIE veil beyond 1°, the
 * white-light luminance MTF of the default eye then lies within 0.07 of Rovamo, Kukkonen & Mustonen
 * (1998, JOSA A 15(9):2504) from 2 to 30 cpd at 2, 3, 4 and 6 mm pupils (scripts/calibrate-eye.ts
 * prints the table; tests/optics/white-light-mtf.test.ts checks it end to end).
 *
 * With age the width grows as IJspeert et al.'s short-angle width, β ∝ 1/b with b = 9000 − 936·√AF
 * and age factor AF = 1 + (age/70)⁴.
 */

/** Frequency scale of the scatter transfer at age 25, cycles/deg (our fit; see above). */
export const SCATTER_SCALE_CPD_AT_25 = 30.5;
/** Reference age of the fit, years. */
export const SCATTER_REFERENCE_AGE_YEARS = 25;

/** IJspeert et al. (1993) age factor of long-angle scatter: 1 + (age/70)⁴. */
export function ijspeertAgeFactor(ageYears: number): number {
  return 1 + (ageYears / 70) ** 4;
}

/** IJspeert et al. (1993) b (mm⁻¹), which sets the short-angle width: 9000 − 936·√AF. */
export function ijspeertB(ageYears: number): number {
  return 9000 - 936 * Math.sqrt(ijspeertAgeFactor(ageYears));
}

/** Frequency scale f_s (cpd) of the scatter at an age. */
export function scatterScaleCpd(ageYears: number): number {
  return SCATTER_SCALE_CPD_AT_25 * (ijspeertB(ageYears) / ijspeertB(SCATTER_REFERENCE_AGE_YEARS));
}

/** Transfer of the scatter at f (cpd): exp(−f/f_s). */
export function scatterTransfer(frequencyCpd: number, scaleCpd: number): number {
  return Math.exp(-Math.abs(frequencyCpd) / scaleCpd);
}
