/**
 * Longitudinal chromatic aberration of the eye, the "chromatic eye" model of Thibos, Ye, Zhang &
 * Bradley (1992), Applied Optics 31(19): refractive error Rx(λ) = p − q/(λ − c) D, λ in µm. Short
 * wavelengths focus in front of the retina (more myopic).
 */

/** Thibos et al. (1992) constants: q and c checked; p from memory (it only sets where Rx = 0). */
export const LCA_P = 1.68524;
export const LCA_Q = 0.63346;
export const LCA_C_UM = 0.2141;

export function chromaticRefractionD(wavelengthNm: number): number {
  return LCA_P - LCA_Q / (wavelengthNm / 1000 - LCA_C_UM);
}

/**
 * Wavelength the eye focuses for (our proposal): 570 nm, between the photopic peak (555 nm) and
 * where the model's Rx is zero (about 589 nm).
 */
export const FOCUS_WAVELENGTH_NM = 570;

/**
 * Wavelengths (nm) and weights across each display primary's band (our proposal for a typical
 * sRGB panel, three samples per primary, weighted by a rough emission × V(λ) shape).
 */
export const PRIMARY_BANDS: readonly (readonly { wavelengthNm: number; weight: number }[])[] = [
  [{ wavelengthNm: 600, weight: 0.45 }, { wavelengthNm: 615, weight: 0.35 }, { wavelengthNm: 635, weight: 0.2 }],
  [{ wavelengthNm: 520, weight: 0.3 }, { wavelengthNm: 545, weight: 0.4 }, { wavelengthNm: 565, weight: 0.3 }],
  [{ wavelengthNm: 445, weight: 0.3 }, { wavelengthNm: 460, weight: 0.4 }, { wavelengthNm: 475, weight: 0.3 }],
];
