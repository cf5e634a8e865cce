/** Pupil diameter from light, field size, age and number of eyes. */

/** Ages over which Watson & Yellott (2012) fitted the age term; outside it the age is clamped. */
export const PUPIL_AGE_RANGE_YEARS: readonly [number, number] = [20, 83];

export interface PupilInput {
  luminanceCdM2: number;
  fieldDiameterDeg: number;
  ageYears: number;
  eyes: 1 | 2;
}

/** Stanley & Davies (1995) pupil diameter (mm) from corneal flux density F (cd/m² · deg²). */
export function stanleyDaviesPupilMm(fluxCdM2Deg2: number): number {
  const x = Math.pow(fluxCdM2Deg2 / 846, 0.41);
  return 7.75 - 5.75 * (x / (x + 2));
}

/**
 * Unified pupil formula, Watson & Yellott (2012), J Vision 12(10):12: F = L·a·M(e), with a the
 * adapting field area (deg²) and M(1) = 0.1, M(2) = 1 the effect of one or two eyes; the age term
 * is referred to 28.58 years (some copies wrongly use 30).
 */
export function watsonYellottPupilMm(input: PupilInput): { pupilDiameterMm: number; ageClamped: boolean } {
  const areaDeg2 = Math.PI * (input.fieldDiameterDeg / 2) ** 2;
  const eyesFactor = input.eyes === 2 ? 1 : 0.1;
  const dSD = stanleyDaviesPupilMm(input.luminanceCdM2 * areaDeg2 * eyesFactor);
  const [lo, hi] = PUPIL_AGE_RANGE_YEARS;
  const age = Math.min(hi, Math.max(lo, input.ageYears));
  return { pupilDiameterMm: dSD + (age - 28.58) * (0.02132 - 0.009562 * dSD), ageClamped: age !== input.ageYears };
}
