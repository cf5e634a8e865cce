/**
 * What ageing costs beyond the optics and the media: OUR PROPOSAL, fitted to published norms.
 *
 * - Contrast: sensitivity at low spatial frequencies stays the same through adulthood while at
 *   middle and high ones it falls from about 40–50 years (Owsley, Sekuler & Siemsen 1983; no change
 *   beyond 0.1 log unit from 21 to 50, Harrison et al. 1993). The part the eye's optics do not explain
 *   is a transfer t + (1 − t)·exp(−f²/(2·σ_f²)), σ_f = 2 cpd, with t = 10^−β(A) and β growing by
 *   NEURAL_CONTRAST_LOG_PER_YEAR after NEURAL_CONTRAST_ONSET_YEARS: detail finer than a few cpd keeps
 *   t of its contrast, coarse structure all of it. In the image it is a blend of the picture with a
 *   Gaussian blur of it (σ = 1/(2π·σ_f) = 4.8′). With the optics the loss at 10 cpd at 70 against 25 years is
 *   about 0.3 log units (Owsley et al. 1983, from memory; older observers 0.3 log units below younger
 *   ones on average, Ashraf et al. 2020).
 * - Acuity: the retina's cutoff is scaled by a factor by age (neural-ageing-table.ts, fitted by
 *   scripts/fit-neural-ageing.ts) so that a best-corrected viewer's foveal letter matches Elliott,
 *   Yang & Whitaker (1995) once optics, media and contrast loss are counted — the share of the decline
 *   they leave to the retina and brain (ganglion-cell loss with age is its usual explanation).
 */
import { NEURAL_ACUITY_AGES_YEARS, NEURAL_ACUITY_FACTORS } from './neural-ageing-table.js';

export const NEURAL_CONTRAST_ONSET_YEARS = 40;
export const NEURAL_CONTRAST_LOG_PER_YEAR = 0.0083;
/** Gaussian width (cpd) of the coarse structure that keeps its contrast with age. */
export const NEURAL_CONTRAST_KEPT_SIGMA_CPD = 2;

/** log10 of the neural contrast loss at an age, at high frequencies. */
export function neuralContrastLogLoss(ageYears: number): number {
  return NEURAL_CONTRAST_LOG_PER_YEAR * Math.max(0, ageYears - NEURAL_CONTRAST_ONSET_YEARS);
}

/** The neural contrast transfer at an age and frequency (1 at young ages and low frequencies). */
export function neuralContrastTransfer(ageYears: number, frequencyCpd: number): number {
  const beta = neuralContrastLogLoss(ageYears);
  if (beta === 0) return 1;
  const t = 10 ** -beta;
  return t + (1 - t) * Math.exp(-(frequencyCpd * frequencyCpd) / (2 * NEURAL_CONTRAST_KEPT_SIGMA_CPD ** 2));
}

/** Reach (deg) of the blur inside the neural contrast transfer: three standard deviations. */
export const NEURAL_CONTRAST_REACH_DEG = 3 / (2 * Math.PI * NEURAL_CONTRAST_KEPT_SIGMA_CPD);

/** The factor on the retina's cutoff at an age (1 for the young fovea the letter rule is fitted to). */
export function neuralAcuityFactor(ageYears: number): number {
  const ages = NEURAL_ACUITY_AGES_YEARS;
  const f = NEURAL_ACUITY_FACTORS;
  if (ageYears <= ages[0]) return f[0];
  if (ageYears >= ages[ages.length - 1]) return f[f.length - 1];
  let i = 0;
  while (ageYears > ages[i + 1]) i++;
  const t = (ageYears - ages[i]) / (ages[i + 1] - ages[i]);
  return f[i] + t * (f[i + 1] - f[i]);
}

/**
 * Best-corrected foveal letter acuity by age (Elliott, Yang & Whitaker 1995, abstract): −0.13 at
 * 18–24, −0.16 at 25–29, −0.02 above 75; between 27 and 78 years linear between those group means
 * (the abstract's "gradual" decline; the per-decade table was not available to check).
 */
export function elliottLogMar(ageYears: number): number {
  if (ageYears <= 21) return -0.13;
  if (ageYears <= 27) return -0.13 - (0.03 * (ageYears - 21)) / 6;
  if (ageYears >= 78) return -0.02;
  return -0.16 + (0.14 * (ageYears - 27)) / 51;
}
