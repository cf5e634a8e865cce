/**
 * Smallest legible letter height from the eye's limits. Our proposal, built on:
 * - a letter is 5 strokes high and a stroke is half a cycle, so sharp letters need 2.5 cycles per
 *   letter height (common practice: the 5′ 20/20 letter ↔ 30 cpd);
 * - two limits that add like blurs, in quadrature (the standard equivalent-blur model of acuity,
 *   MAR = MAR0·sqrt(1 + (σ/σ_int)²)):
 *   neural — 2.5 cycles per letter at a share (the acuity model's letter factor) of the retina's
 *   cutoff; optical — N cycles per letter at the frequency where the computed white-light luminance
 *   MTF of this eye (with its defocus, stray light and, off the fovea, the off-axis loss of Navarro
 *   et al. 1993) falls to a threshold modulation T. Blurred letters are read from their coarse
 *   structure, so N is well below 2.5.
 * T, N and the letter factors are fitted (scripts/fit-letter-rule.ts) to a young eye's foveal acuity,
 * logMAR −0.16 (Elliott, Yang & Whitaker 1995), and to unaided acuity under defocus b,
 * MAR ∝ 1 + b² (Blendowske 2015). The periphery is then within 0.05 log units of Song, Levi &
 * Pelli (2014) Eq. 13 from 2 to 30°, which was not fitted.
 */
import { offAxisRatio } from '../optics/off-axis.js';

/** Cycles per letter height of a sharp letter: 5 strokes of half a cycle each (common practice). */
export const CYCLES_PER_LETTER = 2.5;
/** Modulation of the eye's MTF that sets the optical limit (fitted, see the file's comment). */
export const OPTICAL_THRESHOLD_MODULATION = 0.15;
/** Cycles per letter height a blurred letter needs at that limit (fitted). */
export const OPTICAL_CYCLES_PER_LETTER = 0.76;
/** Fluent reading needs print about twice the threshold size (Whittaker & Lovie-Kitchin 1993). */
export const READING_RESERVE = 2;
/** Blur strength (D) from which an optical limit is named after defocus. */
export const DEFOCUS_NAMED_FROM_D = 0.25;

const ECCENTRICITY_STEP_DEG = 0.5;
const ECCENTRICITY_MAX_DEG = 90;

export interface LetterLimits {
  /** Optical limit (cpd, where the MTF falls to OPTICAL_THRESHOLD_MODULATION) every 0.5° from 0 to 90°. */
  opticalCutoffCpdByEccentricity: Float32Array;
  /** Share of the retinal cutoff at which a sharp letter's 2.5 cycles lie (the acuity model's letter factor). */
  letterFactor: number;
  /** The eye's residual blur strength is large enough to name defocus as the optical limit. */
  defocusLimited: boolean;
  /**
   * Smallest letter the picture can carry, frame px: FRAME_MIN_LETTER_PX of the coarser of the
   * frame's and the display's pixels (a 2× export shown on its display is limited by the display).
   */
  minLetterPx?: number;
}

/**
 * Lowest frequency (cpd) at which a transfer function falls to `threshold`, by bisection after a
 * coarse scan; `upperCpd` when it never does below that.
 */
export function frequencyAtTransfer(transfer: (fCpd: number) => number, threshold: number, upperCpd = 200): number {
  const step = 0.25;
  let lo = 0;
  for (let f = step; f <= upperCpd; f += step) {
    if (transfer(f) <= threshold) {
      let hi = f;
      for (let i = 0; i < 40; i++) {
        const mid = (lo + hi) / 2;
        if (transfer(mid) <= threshold) hi = mid;
        else lo = mid;
      }
      return (lo + hi) / 2;
    }
    lo = f;
  }
  return upperCpd;
}

/**
 * The limits of one eye: `luminanceMtf` is its white-light luminance MTF on axis (cpd → modulation),
 * `coreFraction` the share of light its stray light leaves in the image's core, `letterFactor` the
 * acuity model's.
 */
export function letterLimits(luminanceMtf: (fCpd: number) => number, coreFraction: number, blurStrengthD: number, letterFactor: number): LetterLimits {
  const steps = Math.round(ECCENTRICITY_MAX_DEG / ECCENTRICITY_STEP_DEG) + 1;
  const cutoffs = new Float32Array(steps);
  for (let s = 0; s < steps; s++) {
    const e = s * ECCENTRICITY_STEP_DEG;
    cutoffs[s] = frequencyAtTransfer((f) => coreFraction * luminanceMtf(f) * offAxisRatio(e, f), OPTICAL_THRESHOLD_MODULATION);
  }
  return { opticalCutoffCpdByEccentricity: cutoffs, letterFactor, defocusLimited: Math.abs(blurStrengthD) >= DEFOCUS_NAMED_FROM_D };
}

/** Optical cutoff (cpd) at an eccentricity, linear between the tabulated ones. */
export function opticalCutoffAt(limits: LetterLimits, eccentricityDeg: number): number {
  const t = limits.opticalCutoffCpdByEccentricity;
  const u = Math.min(t.length - 1, Math.max(0, eccentricityDeg / ECCENTRICITY_STEP_DEG));
  const i = Math.min(t.length - 2, Math.floor(u));
  return t[i] + (t[i + 1] - t[i]) * (u - i);
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
export function letterSizeAt(retinalCutoffCpd: number, limits: LetterLimits, eccentricityDeg: number, arcminPerPx: number, rodDominated = false): LetterSize {
  const neuralArcmin = (CYCLES_PER_LETTER * 60) / (limits.letterFactor * retinalCutoffCpd);
  const opticalArcmin = (OPTICAL_CYCLES_PER_LETTER * 60) / opticalCutoffAt(limits, eccentricityDeg);
  const eyeArcmin = Math.hypot(neuralArcmin, opticalArcmin);
  const eyePx = eyeArcmin / arcminPerPx;
  const floor = limits.minLetterPx ?? FRAME_MIN_LETTER_PX;
  const limitedBy: LetterLimit = eyePx < floor ? 'display pixels'
    : opticalArcmin > neuralArcmin ? (limits.defocusLimited ? 'defocus' : 'optics')
      : rodDominated ? 'rod vision' : 'retina';
  return { eyeArcmin, px: Math.max(eyePx, floor), limitedBy };
}

/** logMAR of a letter height: the 5′ letter is logMAR 0 (common practice). */
export function letterLogMar(letterArcmin: number): number {
  return Math.log10(letterArcmin / 5);
}
