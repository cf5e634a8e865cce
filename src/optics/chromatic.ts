/**
 * Longitudinal chromatic aberration of the eye, the "chromatic eye" model of Thibos, Ye, Zhang &
 * Bradley (1992), Applied Optics 31(19): refractive error Rx(λ) = p − q/(λ − c) D, λ in µm. Short
 * wavelengths focus in front of the retina (more myopic). Only differences of Rx enter the optics:
 * where the eye focuses is computed (eye-optics.ts), not fixed at a wavelength.
 */

/** Thibos et al. (1992) constants: q and c checked; p from memory (it only sets where Rx = 0). */
export const LCA_P = 1.68524;
export const LCA_Q = 0.63346;
export const LCA_C_UM = 0.2141;

export function chromaticRefractionD(wavelengthNm: number): number {
  return LCA_P - LCA_Q / (wavelengthNm / 1000 - LCA_C_UM);
}
