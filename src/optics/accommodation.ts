/** Accommodation and the defocus it leaves. */

/**
 * Mean amplitude of accommodation (D) by age, Hofstetter (1950): 18.5 − 0.30·age, floored at 0.
 * (Hofstetter's minimum is 15 − 0.25·age and maximum 25 − 0.40·age.)
 */
export function hofstetterAmplitudeD(ageYears: number, which: 'min' | 'mean' | 'max' = 'mean'): number {
  const [a, b] = which === 'min' ? [15, 0.25] : which === 'max' ? [25, 0.4] : [18.5, 0.3];
  return Math.max(0, a - b * ageYears);
}

export interface AccommodationState {
  /** Accommodation the target asks for: vergence of the target plus the uncorrected error, D. */
  demandD: number;
  /** Accommodation the eye supplies, within 0 … amplitude, D. */
  accommodationD: number;
  /**
   * Defocus left over, D: positive when the eye cannot accommodate enough (target too near for the
   * amplitude), negative when the target is beyond a myope's far point.
   */
  defocusD: number;
}

/**
 * Our proposal on standard optics: demand A_req = 1/d + E (E the uncorrected spherical equivalent,
 * + for hyperopia). In sustained viewing people use only part of their amplitude — common practice
 * keeps a third to a half in reserve — so the eye supplies A = clamp(A_req, 0, (1 − reserve)·amplitude);
 * the residual is A_req − A. Where the eye focuses within that range is left to the optics (the best
 * white-light image), not a fixed lag.
 */
export function accommodationFor(targetDistanceM: number, sphericalEquivalentD: number, amplitudeD: number, reserve = 0): AccommodationState {
  const demandD = 1 / targetDistanceM + sphericalEquivalentD;
  const accommodationD = Math.min((1 - reserve) * amplitudeD, Math.max(0, demandD));
  return { demandD, accommodationD, defocusD: demandD - accommodationD };
}

/** Angular diameter of the geometric blur circle, radians: pupil diameter (m) × |defocus| (D). */
export function blurCircleRad(pupilDiameterMm: number, defocusD: number): number {
  return (pupilDiameterMm / 1000) * Math.abs(defocusD);
}
