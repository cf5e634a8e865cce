/** Modulation transfer of the eye's optics: diffraction and the mean human MTF. */

/** Wavelength at which the mean MTF is stated, nm (Watson 2013). */
export const MEAN_MTF_WAVELENGTH_NM = 555;
/** Pupil diameters over which Watson (2013) fitted the mean MTF, mm. */
export const MEAN_MTF_PUPIL_RANGE_MM: readonly [number, number] = [2, 6];

/** Incoherent cutoff of a circular pupil, cycles/deg: D/λ cycles/rad (Born & Wolf). */
export function diffractionCutoffCpd(pupilDiameterMm: number, wavelengthNm: number): number {
  return (pupilDiameterMm * 1e-3) / (wavelengthNm * 1e-9) * (Math.PI / 180);
}

/** Diffraction-limited MTF of a circular pupil at normalised frequency ν̂ = f / cutoff (Born & Wolf). */
export function diffractionMtf(normalisedFrequency: number): number {
  const v = Math.abs(normalisedFrequency);
  if (v >= 1) return 0;
  return (2 / Math.PI) * (Math.acos(v) - v * Math.sqrt(1 - v * v));
}

/**
 * Mean optical MTF of refraction-corrected human eyes, Watson (2013), J Vision 13(6):18:
 * u1(d) = 21.95 − 5.512·d + 0.3922·d², M(u, d) = [1 + (u/u1)²]^(−0.62) · sqrt(D(u, d, 555 nm)).
 * Fitted for pupils of 2–6 mm; callers clamp the pupil into that range.
 */
export function watsonMeanMtf(frequencyCpd: number, pupilDiameterMm: number): number {
  const d = pupilDiameterMm;
  const u1 = 21.95 - 5.512 * d + 0.3922 * d * d;
  const u = Math.abs(frequencyCpd);
  const diffraction = diffractionMtf(u / diffractionCutoffCpd(d, MEAN_MTF_WAVELENGTH_NM));
  return Math.pow(1 + (u / u1) ** 2, -0.62) * Math.sqrt(diffraction);
}
