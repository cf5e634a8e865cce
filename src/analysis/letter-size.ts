/**
 * Smallest legible letter height from the eye's limits. Our proposal, built on:
 * - a letter is 5 strokes high and a stroke is half a cycle, so a letter needs 2.5 cycles per letter
 *   height (common practice: the 5′ 20/20 letter ↔ 30 cpd);
 * - the finest frequency is the lower of the retina's cutoff and the frequency where the mean optical
 *   MTF (Watson 2013) falls to OPTICAL_THRESHOLD;
 * - residual defocus adds in quadrature a letter of 5 × MAR, MAR = 0.65 × pupil (mm) × blur (D) arcmin
 *   (Smith 1982, from memory).
 */
import { frequencyAtTransfer, MEAN_MTF_PUPIL_RANGE_MM, watsonMeanMtf } from '../optics/mean-mtf.js';

/** Cycles per letter height: 5 strokes of half a cycle each (common practice). */
export const CYCLES_PER_LETTER = 2.5;
/** Optical modulation below which fine detail is taken as lost (our proposal). */
export const OPTICAL_THRESHOLD = 0.1;
/** Minimum angle of resolution per mm of pupil per diopter of defocus, arcmin (Smith 1982, from memory). */
export const DEFOCUS_MAR_ARCMIN_PER_MM_D = 0.65;
/** Letter height in units of the minimum angle of resolution (common practice). */
export const LETTER_HEIGHT_IN_MAR = 5;
/** Fluent reading needs print about twice the threshold size (Whittaker & Lovie-Kitchin 1993). */
export const READING_RESERVE = 2;

export function clampPupilForMeanMtf(pupilDiameterMm: number): number {
  const [lo, hi] = MEAN_MTF_PUPIL_RANGE_MM;
  return Math.min(hi, Math.max(lo, pupilDiameterMm));
}

/** Frequency (cpd) where the mean optical MTF of a corrected eye falls to OPTICAL_THRESHOLD. */
export function opticalCutoffCpd(pupilDiameterMm: number): number {
  const d = clampPupilForMeanMtf(pupilDiameterMm);
  return frequencyAtTransfer((f) => watsonMeanMtf(f, d), OPTICAL_THRESHOLD);
}

export interface LetterLimits {
  opticalCutoffCpd: number;
  /** Letter height that defocus alone allows, arcmin. */
  defocusLetterArcmin: number;
}

export function letterLimits(pupilDiameterMm: number, blurStrengthD: number): LetterLimits {
  return {
    opticalCutoffCpd: opticalCutoffCpd(pupilDiameterMm),
    defocusLetterArcmin: LETTER_HEIGHT_IN_MAR * DEFOCUS_MAR_ARCMIN_PER_MM_D * pupilDiameterMm * Math.abs(blurStrengthD),
  };
}

/** Smallest legible letter height, arcmin, where the retina resolves `retinalCutoffCpd`. */
export function smallestLetterArcmin(retinalCutoffCpd: number, limits: LetterLimits): number {
  const finestCpd = Math.min(retinalCutoffCpd, limits.opticalCutoffCpd);
  const sharpLetter = (CYCLES_PER_LETTER * 60) / finestCpd;
  return Math.hypot(sharpLetter, limits.defocusLetterArcmin);
}

/**
 * The frame itself cannot carry a letter smaller than 2.5 cycles at its Nyquist frequency of
 * 0.5 cycles/px: 5 px of capital height (the same letter rule, applied to the pixel grid).
 */
export const FRAME_MIN_LETTER_PX = CYCLES_PER_LETTER / 0.5;

export const LETTER_LIMITS = ['retina', 'optics', 'defocus', 'display pixels', 'rod vision', 'blind spot'] as const;
export type LetterLimit = (typeof LETTER_LIMITS)[number];

export interface LetterSize {
  /** Smallest legible capital height the eye allows, arcmin. */
  eyeArcmin: number;
  /** Smallest legible capital height on this frame, px: the eye's limit, but not below FRAME_MIN_LETTER_PX. */
  px: number;
  limitedBy: LetterLimit;
}

/** `rodDominated`: the retinal cutoff is mostly that of rods (dim light), named as such. */
export function letterSizeAt(retinalCutoffCpd: number, limits: LetterLimits, arcminPerPx: number, rodDominated = false): LetterSize {
  const eyeArcmin = smallestLetterArcmin(retinalCutoffCpd, limits);
  const eyePx = eyeArcmin / arcminPerPx;
  const sharpLetter = (CYCLES_PER_LETTER * 60) / Math.min(retinalCutoffCpd, limits.opticalCutoffCpd);
  const limitedBy: LetterLimit = eyePx < FRAME_MIN_LETTER_PX ? 'display pixels'
    : limits.defocusLetterArcmin > sharpLetter ? 'defocus'
      : limits.opticalCutoffCpd < retinalCutoffCpd ? 'optics' : rodDominated ? 'rod vision' : 'retina';
  return { eyeArcmin, px: Math.max(eyePx, FRAME_MIN_LETTER_PX), limitedBy };
}
