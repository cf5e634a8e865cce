/**
 * Midget retinal ganglion cell density and the sampling limit it sets, Watson (2014),
 * "A formula for human retinal ganglion cell receptive field density as a function of visual field
 * location", J Vision 14(7):15. Meridians are of the visual field.
 */
import type { Eyes } from '../config/setup.js';

/** Peak cone density at the foveal centre, cones/deg² (Watson 2014, from Curcio et al. 1990). */
export const PEAK_CONE_DENSITY_PER_DEG2 = 14804.6;
/** Scale of the decline of the midget fraction with eccentricity, deg (Watson 2014). */
export const MIDGET_FRACTION_SCALE_DEG = 41.03;

export type FieldMeridian = 'temporal' | 'superior' | 'nasal' | 'inferior';

/** Per-meridian constants a_k, r2_k (deg), re_k (deg), Watson (2014) Table 1. */
export const WATSON_MERIDIANS: Record<FieldMeridian, { a: number; r2Deg: number; reDeg: number }> = {
  temporal: { a: 0.9851, r2Deg: 1.058, reDeg: 22.14 },
  superior: { a: 0.9935, r2Deg: 1.035, reDeg: 16.35 },
  nasal: { a: 0.9729, r2Deg: 1.084, reDeg: 7.633 },
  inferior: { a: 0.996, r2Deg: 0.9932, reDeg: 12.13 },
};

/** Density of midget RGCs (ON and OFF together) along a meridian, cells/deg² (Watson 2014, Eq. 8). */
export function midgetRgcDensityPerDeg2(eccentricityDeg: number, meridian: FieldMeridian): number {
  const { a, r2Deg, reDeg } = WATSON_MERIDIANS[meridian];
  const r = eccentricityDeg;
  return 2 * PEAK_CONE_DENSITY_PER_DEG2 * (1 + r / MIDGET_FRACTION_SCALE_DEG) ** -1 * (a * (1 + r / r2Deg) ** -2 + (1 - a) * Math.exp(-r / reDeg));
}

/**
 * Spacing of one class (ON or OFF) of midget RGCs on a hexagonal lattice, deg:
 * s = sqrt(2 / (√3·d)) with d = d_mf / 2 (Watson 2014, Eq. 9).
 */
export function midgetSpacingDeg(eccentricityDeg: number, meridian: FieldMeridian): number {
  const d = midgetRgcDensityPerDeg2(eccentricityDeg, meridian) / 2;
  return Math.sqrt(2 / (Math.sqrt(3) * d));
}

/** Nyquist frequency of a hexagonal lattice of spacing s: 1/(√3·s), cycles/deg. */
export function hexNyquistCpd(spacingDeg: number): number {
  return 1 / (Math.sqrt(3) * spacingDeg);
}

/**
 * Which retinal meridian of one eye a field direction falls on. Field right of fixation is
 * temporal for the right eye and nasal for the left; up is superior.
 */
export function fieldMeridians(meridianDeg: number, eye: 'right' | 'left'): { horizontal: FieldMeridian; vertical: FieldMeridian } {
  const rad = (meridianDeg * Math.PI) / 180;
  const right = Math.cos(rad) >= 0;
  const horizontal: FieldMeridian = right === (eye === 'right') ? 'temporal' : 'nasal';
  return { horizontal, vertical: Math.sin(rad) >= 0 ? 'superior' : 'inferior' };
}

/**
 * Spacing of one midget class at any field location: s = (1/r)·sqrt(x²·s_h² + y²·s_v²), with s_h
 * and s_v the spacings on the horizontal and vertical meridians of that quadrant (Watson 2014, Eq. 10).
 */
export function midgetSpacingAtDeg(eccentricityDeg: number, meridianDeg: number, eye: 'right' | 'left'): number {
  const { horizontal, vertical } = fieldMeridians(meridianDeg, eye);
  const rad = (meridianDeg * Math.PI) / 180;
  const sh = midgetSpacingDeg(eccentricityDeg, horizontal);
  const sv = midgetSpacingDeg(eccentricityDeg, vertical);
  return Math.sqrt((Math.cos(rad) * sh) ** 2 + (Math.sin(rad) * sv) ** 2);
}

/** Sampling-limited cutoff, cpd. With both eyes open the better-sampled eye sets the limit. */
export function rgcNyquistCpd(eccentricityDeg: number, meridianDeg: number, eyes: Eyes): number {
  if (eyes !== 'both') return hexNyquistCpd(midgetSpacingAtDeg(eccentricityDeg, meridianDeg, eyes));
  const spacing = Math.min(midgetSpacingAtDeg(eccentricityDeg, meridianDeg, 'right'), midgetSpacingAtDeg(eccentricityDeg, meridianDeg, 'left'));
  return hexNyquistCpd(spacing);
}
