/**
 * From the retinal image to the percept: cone vision through opponent channels, each with its own
 * eccentricity-dependent low-pass; rod vision as a colourless, coarse signal; mixed by the CIE 191
 * mesopic coefficient; the blind spot filled from its surroundings.
 */
import { LINEAR_SRGB_TO_OPPONENT, OPPONENT_TO_LINEAR_SRGB } from '../colour/cone-space.js';
import { transformPlanes } from '../colour/matrix3.js';
import { scotopicOfLinearSrgb } from '../colour/scotopic.js';
import { createLinearRgb, type LinearRgb } from '../image/plane.js';
import { fillFromSurround } from './blind-spot.js';
import { SCOTOPIC_PER_PHOTOPIC_WHITE } from './rod-vision.js';
import { blurVariable, maxPyramidLevels, planLevelBlend, sigmaForCutoffPx } from './variable-blur.js';

/** Achromatic level below which a region is taken as black and given no chromaticity (linear, 1 = white). */
const CHROMA_FLOOR = 1e-4;

export interface RetinaCutoffMaps {
  /** Cone luminance (achromatic) cutoff, cpd. */
  achromaticCpd: Float32Array;
  redGreenCpd: Float32Array;
  blueYellowCpd: Float32Array;
  rodCpd: Float32Array;
}

/** Gaussian sigma (px) per pixel for a cutoff map (cpd) and the pixels' angular size (arcmin). */
export function sigmaMapPx(cutoffCpd: Float32Array, arcminPerPx: Float32Array): Float32Array {
  const out = new Float32Array(cutoffCpd.length);
  for (let i = 0; i < out.length; i++) out[i] = sigmaForCutoffPx((cutoffCpd[i] * arcminPerPx[i]) / 60);
  return out;
}

export interface PerceptInput {
  retinal: LinearRgb;
  cutoffs: RetinaCutoffMaps;
  arcminPerPx: Float32Array;
  /** Share of cone vision (CIE 191 m): 1 photopic, 0 scotopic. */
  coneShare: number;
  /** 1 where the retina has information, 0 in the blind spot; undefined when there is none. */
  seen?: Float32Array;
}

export function computePercept(input: PerceptInput, onStage: (stage: string) => void): LinearRgb {
  const { retinal, cutoffs, arcminPerPx, coneShare } = input;
  const { width, height } = retinal;
  const n = width * height;
  const levels = maxPyramidLevels(width, height);
  const percept = createLinearRgb(width, height);
  const blurWith = (cutoff: Float32Array, src: Float32Array, out: Float32Array): void => {
    blurVariable({ width, height, data: src }, planLevelBlend(sigmaMapPx(cutoff, arcminPerPx), levels), out);
  };

  if (coneShare > 0) {
    onStage('retina: cones');
    const opponent = [new Float32Array(n), new Float32Array(n), new Float32Array(n)];
    transformPlanes(LINEAR_SRGB_TO_OPPONENT, retinal.planes, opponent);
    const filtered = [new Float32Array(n), new Float32Array(n), new Float32Array(n)];
    blurWith(cutoffs.achromaticCpd, opponent[0], filtered[0]);
    // Colour is resolved coarsely but stays attached to the luminance it belongs to: each chromatic
    // channel is blurred as a luminance-weighted chromaticity, blur(C)/blur(A), and put back on the
    // sharper achromatic percept (our proposal). Blurring C alone would smear colour onto dark
    // surroundings as a glow no viewer sees.
    const chroma = new Float32Array(n);
    const weight = new Float32Array(n);
    for (const [c, cutoff] of [[1, cutoffs.redGreenCpd], [2, cutoffs.blueYellowCpd]] as const) {
      blurWith(cutoff, opponent[c], chroma);
      blurWith(cutoff, opponent[0], weight);
      const out = filtered[c];
      for (let i = 0; i < n; i++) out[i] = weight[i] > CHROMA_FLOOR ? (filtered[0][i] * chroma[i]) / weight[i] : 0;
    }
    transformPlanes(OPPONENT_TO_LINEAR_SRGB, filtered, percept.planes);
    if (coneShare < 1) for (const p of percept.planes) for (let i = 0; i < n; i++) p[i] *= coneShare;
  }

  if (coneShare < 1) {
    onStage('retina: rods');
    const [r, g, b] = retinal.planes;
    const rods = new Float32Array(n);
    // Rods see scotopic luminance; dividing by white's ratio keeps white as bright as for cones.
    for (let i = 0; i < n; i++) rods[i] = scotopicOfLinearSrgb(r[i], g[i], b[i]) / SCOTOPIC_PER_PHOTOPIC_WHITE;
    const seenByRods = new Float32Array(n);
    blurWith(cutoffs.rodCpd, rods, seenByRods);
    const rodShare = 1 - coneShare;
    for (const p of percept.planes) for (let i = 0; i < n; i++) p[i] += rodShare * seenByRods[i];
  }

  if (input.seen) {
    onStage('retina: blind spot');
    for (const p of percept.planes) fillFromSurround({ width, height, data: p.slice() }, input.seen, p);
  }
  return percept;
}
