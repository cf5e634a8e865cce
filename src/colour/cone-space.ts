/**
 * Cone excitations and opponent channels. The pipeline works in an opponent space built on the
 * Smith & Pokorny cone fundamentals, where L + M equals luminance Y, so the achromatic channel is
 * exactly the luminance of the frame.
 */
import { LINEAR_SRGB_TO_XYZ } from './srgb.js';
import { apply3, invert3, multiply3, type Matrix3 } from './matrix3.js';

/**
 * Smith & Pokorny (1975) fundamentals from Judd–Vos XYZ (checked). Applied here to CIE 1931 XYZ of
 * sRGB colours, a close approximation for display primaries.
 */
export const SMITH_POKORNY_XYZ_TO_LMS: Matrix3 = [
  [0.15514, 0.54312, -0.03286],
  [-0.15514, 0.45684, 0.03286],
  [0, 0, 0.01608],
];

/** Hunt–Pointer–Estévez, D65-normalised (checked); kept for reference and tests: D65 → equal LMS. */
export const HPE_D65_XYZ_TO_LMS: Matrix3 = [
  [0.4002, 0.7076, -0.0808],
  [-0.2263, 1.1653, 0.0457],
  [0, 0, 0.9182],
];

export const LINEAR_SRGB_TO_LMS = multiply3(SMITH_POKORNY_XYZ_TO_LMS, LINEAR_SRGB_TO_XYZ);

const whiteLms = apply3(LINEAR_SRGB_TO_LMS, [1, 1, 1]);

/**
 * Opponent channels (our stated design choice of weights): achromatic A = L + M (= Y);
 * red–green RG = L − (L_w/M_w)·M; blue–yellow BY = S − (S_w/(L_w + M_w))·(L + M), with w the display
 * white (D65), so that white and greys have RG = BY = 0.
 */
export const LMS_TO_OPPONENT: Matrix3 = [
  [1, 1, 0],
  [1, -whiteLms[0] / whiteLms[1], 0],
  [-whiteLms[2] / (whiteLms[0] + whiteLms[1]), -whiteLms[2] / (whiteLms[0] + whiteLms[1]), 1],
];

export const LINEAR_SRGB_TO_OPPONENT = multiply3(LMS_TO_OPPONENT, LINEAR_SRGB_TO_LMS);
export const OPPONENT_TO_LINEAR_SRGB = invert3(LINEAR_SRGB_TO_OPPONENT);
