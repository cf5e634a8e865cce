/**
 * Contrast-threshold model of Geisler & Perry (1998), "A real-time foveated multiresolution system
 * for low-bandwidth video communication", Proc SPIE 3299: CT(f, e) = CT0·exp(α·f·(e + e2)/e2).
 */

/** Spatial-frequency decay constant α (Geisler & Perry 1998). */
export const GP_ALPHA = 0.106;
/** Half-resolution eccentricity e2, deg (Geisler & Perry 1998). */
export const GP_E2_DEG = 2.3;
/** Minimum contrast threshold CT0 (Geisler & Perry 1998). */
export const GP_CT0 = 1 / 64;

export function geislerPerryThreshold(frequencyCpd: number, eccentricityDeg: number): number {
  return GP_CT0 * Math.exp((GP_ALPHA * frequencyCpd * (eccentricityDeg + GP_E2_DEG)) / GP_E2_DEG);
}

/** Frequency at which the threshold reaches contrast 1: f_c(e) = e2·ln(1/CT0) / (α·(e + e2)), cpd. */
export function geislerPerryCutoffCpd(eccentricityDeg: number): number {
  return (GP_E2_DEG * Math.log(1 / GP_CT0)) / (GP_ALPHA * (eccentricityDeg + GP_E2_DEG));
}
