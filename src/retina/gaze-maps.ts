/**
 * The per-pixel maps of one gaze: the retina's cutoffs and filter variances, and the smallest legible
 * letter. Everything that depends only on eccentricity is tabulated once per gaze over eccentricity
 * (spaced in √e like the cutoff map) and looked up per pixel; the per-pixel work is arithmetic. The
 * direct formulas (chromaticCutoffCpd, rodCutoffCpd, offAxisVarianceDeg2, letterSizeAt) stay the
 * reference the tests compare against.
 */
import { CYCLES_PER_LETTER, FRAME_MIN_LETTER_PX, LETTER_LIMITS, OPTICAL_CYCLES_PER_LETTER, opticalCutoffAt, type LetterLimits } from '../analysis/letter-size.js';
import type { Eyes } from '../config/setup.js';
import type { ViewMap } from '../geometry/view-map.js';
import { offAxisVarianceDeg2 } from '../optics/off-axis.js';
import type { AcuityModel } from './acuity-model.js';
import { blindSpotCentreDeg, blindSpotDistance } from './blind-spot.js';
import { chromaticCutoffCpd, type ColourLossParams } from './colour-loss.js';
import { computeCutoffMap } from './cutoff-map.js';
import { ROD_FREE_CUTOFF_CPD, ROD_FREE_DIAMETER_DEG, ROD_PEAK_CUTOFF_CPD } from './rod-vision.js';

export interface GazeMapsInput {
  viewMap: ViewMap;
  model: AcuityModel;
  eyes: Eyes;
  colourLoss: ColourLossParams;
  /** Same-display percept: colour losses relative to the reference viewer's fovea, without the S-cone-free dip. */
  sameDisplay: boolean;
  /** Share of cone vision (CIE 191 m). */
  coneShare: number;
  limits: LetterLimits;
}

export interface GazeMaps {
  achromaticLog2: Float32Array;
  offAxisVariancePx2: Float32Array;
  redGreenVariancePx2: Float32Array;
  blueYellowVariancePx2: Float32Array;
  rodVariancePx2?: Float32Array;
  /** Retinal cutoff (cones and rods mixed by the light), cpd. */
  cutoffCpd: Float32Array;
  smallestLetterPx: Float32Array;
  letterLimitIndex: Uint8Array;
  /** 1 where the retina has information, 0 in the blind spot (one eye only). */
  seen?: Float32Array;
}

const ECCENTRICITY_STEPS = 1024;
/** ln 20 / (2π²): a Gaussian of variance K/f² keeps 5 % at f. */
const GAUSSIAN_K = Math.log(20) / (2 * Math.PI * Math.PI);
const OFF_AXIS_ECC_STEPS = 256;
const OFF_AXIS_LOG2_MIN = -3;
const OFF_AXIS_LOG2_MAX = 8;
const OFF_AXIS_STEPS_PER_OCTAVE = 8;

/** The maps of one gaze; `into`: maps of an earlier gaze of the same frame whose arrays are reused. */
export function computeGazeMaps(input: GazeMapsInput, into?: GazeMaps): GazeMaps {
  const { viewMap, model, eyes, colourLoss, sameDisplay, coneShare, limits } = input;
  const n = viewMap.eccentricityDeg.length;
  const ecc = viewMap.eccentricityDeg;
  const arcmin = viewMap.arcminPerPx;
  let maxEcc = 1e-3;
  for (let i = 0; i < n; i++) if (ecc[i] > maxEcc) maxEcc = ecc[i];
  const eccAt = (j: number, steps: number): number => maxEcc * (j / (steps - 1)) ** 2;

  // Eccentricity tables: the colour channels' own cutoffs (before the luminance cutoff caps them),
  // the optical cutoff of the letter rule.
  const rgTable = new Float64Array(ECCENTRICITY_STEPS);
  const byTable = new Float64Array(ECCENTRICITY_STEPS);
  const opticalTable = new Float64Array(ECCENTRICITY_STEPS);
  for (let j = 0; j < ECCENTRICITY_STEPS; j++) {
    const e = eccAt(j, ECCENTRICITY_STEPS);
    rgTable[j] = chromaticCutoffCpd('red-green', e, colourLoss, Infinity);
    byTable[j] = chromaticCutoffCpd('blue-yellow', e, colourLoss, Infinity, !sameDisplay);
    opticalTable[j] = opticalCutoffAt(limits, e);
  }
  // Off-axis optics: variance (deg²) by eccentricity and log2 of the frequency it is matched at.
  const matchSteps = (OFF_AXIS_LOG2_MAX - OFF_AXIS_LOG2_MIN) * OFF_AXIS_STEPS_PER_OCTAVE + 1;
  const offAxisTable = new Float64Array(OFF_AXIS_ECC_STEPS * matchSteps);
  for (let j = 0; j < OFF_AXIS_ECC_STEPS; j++) {
    const e = eccAt(j, OFF_AXIS_ECC_STEPS);
    for (let s = 0; s < matchSteps; s++) offAxisTable[j * matchSteps + s] = offAxisVarianceDeg2(e, 2 ** (OFF_AXIS_LOG2_MIN + s / OFF_AXIS_STEPS_PER_OCTAVE));
  }
  const fovealRg = chromaticCutoffCpd('red-green', 0, colourLoss, Infinity);
  const fovealBy = colourLoss.blueYellowFovealCutoffCpd;
  const lessRg = sameDisplay ? 1 / (fovealRg * fovealRg) : 0;
  const lessBy = sameDisplay ? 1 / (fovealBy * fovealBy) : 0;

  const cone = computeCutoffMap(viewMap, model, eyes, new Float32Array(n));
  const reuse = into && into.cutoffCpd.length === n;
  const plane = (old: Float32Array | undefined): Float32Array => (reuse && old ? old : new Float32Array(n));
  const blindCentre = blindSpotCentreDeg(eyes);
  const maps: GazeMaps = {
    achromaticLog2: plane(into?.achromaticLog2), offAxisVariancePx2: plane(into?.offAxisVariancePx2),
    redGreenVariancePx2: plane(into?.redGreenVariancePx2), blueYellowVariancePx2: plane(into?.blueYellowVariancePx2),
    ...(coneShare < 1 ? { rodVariancePx2: plane(into?.rodVariancePx2) } : {}),
    cutoffCpd: plane(into?.cutoffCpd), smallestLetterPx: plane(into?.smallestLetterPx),
    letterLimitIndex: reuse && into ? into.letterLimitIndex : new Uint8Array(n),
    ...(blindCentre ? { seen: plane(into?.seen) } : {}),
  };
  const rodRadius = ROD_FREE_DIAMETER_DEG / 2;
  const rodDominated = coneShare < 0.5;
  const index = Object.fromEntries(LETTER_LIMITS.map((name, k) => [name, k])) as Record<(typeof LETTER_LIMITS)[number], number>;
  const neuralFactor = (CYCLES_PER_LETTER * 60) / limits.letterFactor;
  const opticalFactor = OPTICAL_CYCLES_PER_LETTER * 60;

  const { achromaticLog2, offAxisVariancePx2, redGreenVariancePx2, blueYellowVariancePx2, rodVariancePx2, cutoffCpd, smallestLetterPx, letterLimitIndex, seen } = maps;
  const meridian = viewMap.meridianDeg;
  const invMaxEcc = 1 / maxEcc;
  const eccScale = ECCENTRICITY_STEPS - 1;
  const offScale = OFF_AXIS_ECC_STEPS - 1;
  const displayPixels = index['display pixels'];
  const minLetterPx = limits.minLetterPx ?? FRAME_MIN_LETTER_PX;
  const opticalIndex = limits.defocusLimited ? index.defocus : index.optics;
  const retinaIndex = rodDominated ? index['rod vision'] : index.retina;
  for (let i = 0; i < n; i++) {
    const e = ecc[i];
    const c = cone[i];
    const a = arcmin[i];
    const root = Math.sqrt(e * invMaxEcc);
    const u = root * eccScale;
    const j = Math.min(ECCENTRICITY_STEPS - 2, Math.floor(u));
    const t = u - j;
    // Frame px² per (1/cpd)²: a Gaussian of variance K/f² deg² is K·3600/(f²·a²) px².
    const invA2 = 1 / (a * a);
    const pxScale = GAUSSIAN_K * 3600 * invA2;
    achromaticLog2[i] = Math.log2((c * a) / 60);

    const rgOwn = rgTable[j] + t * (rgTable[j + 1] - rgTable[j]);
    const byOwn = byTable[j] + t * (byTable[j + 1] - byTable[j]);
    const rg = rgOwn < c ? rgOwn : c;
    const by = byOwn < c ? byOwn : c;
    const vr = pxScale * (1 / (rg * rg) - lessRg);
    const vb = pxScale * (1 / (by * by) - lessBy);
    redGreenVariancePx2[i] = vr > 0 ? vr : 0;
    blueYellowVariancePx2[i] = vb > 0 ? vb : 0;

    // The eye's off-axis optics, as a blur matched at half the local cutoff (never finer than the frame holds).
    const limitCpd = 30 / a;
    const match = (c < limitCpd ? c : limitCpd) / 2;
    const ou = root * offScale;
    const oj = Math.min(OFF_AXIS_ECC_STEPS - 2, Math.floor(ou));
    const ot = ou - oj;
    const ms = Math.min(matchSteps - 1.001, Math.max(0, (Math.log2(match) - OFF_AXIS_LOG2_MIN) * OFF_AXIS_STEPS_PER_OCTAVE));
    const mk = Math.floor(ms);
    const mt = ms - mk;
    const row0 = oj * matchSteps + mk;
    const row1 = row0 + matchSteps;
    const v0 = offAxisTable[row0] + mt * (offAxisTable[row0 + 1] - offAxisTable[row0]);
    const v1 = offAxisTable[row1] + mt * (offAxisTable[row1 + 1] - offAxisTable[row1]);
    offAxisVariancePx2[i] = (v0 + ot * (v1 - v0)) * 3600 * invA2;

    // Rods (dim light): the rod-free centre blends into the rods' own cutoff.
    let retinal = c;
    if (rodVariancePx2) {
      const rt = Math.min(1, Math.max(0, (e - rodRadius) / rodRadius));
      const rod = ROD_FREE_CUTOFF_CPD + rt * (Math.min(ROD_PEAK_CUTOFF_CPD, c) - ROD_FREE_CUTOFF_CPD);
      rodVariancePx2[i] = pxScale / (rod * rod);
      retinal = coneShare * c + (1 - coneShare) * rod;
    }
    cutoffCpd[i] = retinal;

    // The smallest letter: neural and optical limits in quadrature (letter-size.ts), in frame px.
    const optical = opticalTable[j] + t * (opticalTable[j + 1] - opticalTable[j]);
    const neuralArcmin = neuralFactor / retinal;
    const opticalArcmin = opticalFactor / optical;
    const eyePx = Math.sqrt(neuralArcmin * neuralArcmin + opticalArcmin * opticalArcmin) / a;
    if (eyePx < minLetterPx) {
      smallestLetterPx[i] = minLetterPx;
      letterLimitIndex[i] = displayPixels;
    } else {
      smallestLetterPx[i] = eyePx;
      letterLimitIndex[i] = opticalArcmin > neuralArcmin ? opticalIndex : retinaIndex;
    }

    if (seen && blindCentre) {
      // Soft edge over ±5 % of the ellipse so the fill blends in.
      const d = blindSpotDistance(e, meridian[i], blindCentre);
      seen[i] = Math.min(1, Math.max(0, (d - 0.95) / 0.1));
      if (d < 1) {
        smallestLetterPx[i] = Infinity;
        letterLimitIndex[i] = index['blind spot'];
      }
    }
  }
  return maps;
}
