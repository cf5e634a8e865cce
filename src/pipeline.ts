/**
 * The schedule: the only place that knows the order of stages. Stage functions hold the maths; this
 * file decides what is computed, in which order, and which buffers are reused.
 */
import { luminancePlaneCdM2 } from './colour/luminance.js';
import { checkGazeInFrame } from './config/validate.js';
import type { Display, Setup } from './config/setup.js';
import { LETTER_LIMITS, letterLimits, letterSizeAt, type LetterLimit, type LetterLimits, READING_RESERVE } from './analysis/letter-size.js';
import { judgeLabel, type Label, type LabelVerdict } from './analysis/labels.js';
import { projectionFor, pixelToTan, type Projection } from './geometry/projection.js';
import { arcminPerPxAt, computeViewMap, fieldOfViewDeg, isInsideFrame, pixelAtFieldPoint, type ViewMap } from './geometry/view-map.js';
import { channelPlane, createLinearRgb, type LinearRgb } from './image/plane.js';
import { applyOtf, otfGridFromKernel } from './optics/apply-otf.js';
import { computeEyeOptics, type EyeOptics, type EyeOpticsFigures } from './optics/eye-optics.js';
import { addStrayLight } from './optics/veil.js';
import { headsetLensSigmaPx } from './optics/headset-lens.js';
import { depthBlurSigmaPx } from './optics/depth-blur.js';
import { kernelScales, scaleWeights } from './optics/scale-blend.js';
import { blurVariable, maxPyramidLevels, planLevelBlend } from './retina/variable-blur.js';
import { scatteredFraction, VEIL_FROM_DEG } from './optics/stray-light.js';
import { computeEyeState, type EyeState } from './optics/eye-state.js';
import { acuityModels, type AcuityModel } from './retina/acuity-model.js';
import { fieldMeridians } from './retina/watson-rgc.js';
import { computeCutoffMap } from './retina/cutoff-map.js';
import { chromaticCutoffCpd } from './retina/colour-loss.js';
import { BLIND_SPOT, blindSpotCentreDeg, blindSpotDistance } from './retina/blind-spot.js';
import { lightState, type LightState } from './retina/light-level.js';
import { computePercept } from './retina/percept.js';
import { rodCutoffCpd, SCOTOPIC_PER_PHOTOPIC_WHITE } from './retina/rod-vision.js';
import { scotopicOfLinearSrgb } from './colour/scotopic.js';

/** Eccentricities listed in the acuity table, deg. */
export const ACUITY_TABLE_ECCENTRICITIES_DEG = [0, 2, 5, 10, 20, 30, 40] as const;

/** Without a frame, 'auto' adaptation assumes an 18 % grey frame (common practice: the mid-grey card). */
export const ASSUMED_MEAN_REFLECTANCE = 0.18;

export interface AcuityRow {
  eccentricityDeg: number;
  /** Field meridian: 'temporal' or 'nasal' for one eye; 'horizontal' for both (the better eye). */
  meridian: string;
  cutoffCpd: number;
  /** Smallest legible capital height the eye allows, arcmin. */
  smallestLetterArcmin: number;
  /** Smallest legible capital height on this frame, px (never below the frame's own 5 px limit). */
  smallestLetterPx: number;
  /** Capital height for fluent reading (2× threshold, Whittaker & Lovie-Kitchin 1993), frame px. */
  readingLetterPx: number;
  /** What sets the smallest letter here. */
  limitedBy: LetterLimit;
}

export interface DerivedNumbers {
  display: {
    kind: Display['kind'];
    resolutionPx: [number, number];
    frameSizePx: [number, number];
    pixelsPerDegreeAtGaze: number;
    framePixelsPerDegreeAtGaze: number;
    arcminPerFramePxAtGaze: number;
    fieldOfViewDeg: { horizontal: number; vertical: number };
    focalDistanceM: number;
  };
  gazePx: [number, number];
  light: {
    adaptingLuminanceCdM2: number;
    adaptingLuminanceFrom: 'setup' | 'frame' | 'assumed 18 % grey frame';
  } & LightState;
  /** The blind spot of the viewing eye in the field around the gaze; absent with both eyes. */
  blindSpot?: { eye: 'right' | 'left'; centreFieldDeg: [number, number]; widthDeg: number; heightDeg: number; centrePx?: [number, number] };
  eye: EyeState & { opticalCutoffCpd: number; defocusLetterArcmin: number };
  /** Figures of the eye's optics: Strehl ratio, MTF, encircled energy, defocus per channel, stray light. */
  optics: EyeOpticsFigures & { scatteredFraction1To30Deg: number };
  acuity: AcuityRow[];
}

interface Context {
  setup: Setup;
  projection: Projection;
  gazePx: [number, number];
  model: AcuityModel;
  /** Distance of what is seen at the gaze, from a depth map, when there is one (m). */
  gazeDepthM?: number;
}

function contextFor(setup: Setup, frameSizePx: [number, number]): Context {
  const projection = projectionFor(setup.display, frameSizePx[0], frameSizePx[1]);
  const gazePx: [number, number] = setup.gaze ? [setup.gaze.xPx, setup.gaze.yPx] : [Math.floor(frameSizePx[0] / 2), Math.floor(frameSizePx[1] / 2)];
  return { setup, projection, gazePx, model: acuityModels[setup.models.acuity] };
}

/** Distance from the eye to what it focuses on: the screen point at the gaze, or a headset's virtual image. */
function focalDistanceM(ctx: Context): number {
  if (ctx.gazeDepthM !== undefined) return ctx.gazeDepthM;
  const { display } = ctx.setup;
  if (display.kind === 'headset') return display.focalDistanceM;
  const [a, b] = pixelToTan(ctx.projection, ctx.gazePx[0] + 0.5, ctx.gazePx[1] + 0.5);
  return (ctx.projection.planeDistanceMm * Math.hypot(a, b, 1)) / 1000;
}

function arcminAtPixel(ctx: Context, xPx: number, yPx: number): number {
  const [a, b] = pixelToTan(ctx.projection, xPx, yPx);
  return arcminPerPxAt(ctx.projection, a, b);
}

/** Effective retinal cutoff at a light level: cone and rod cutoffs weighted by the CIE 191 m (our proposal). */
function mixedCutoffCpd(coneCpd: number, eccentricityDeg: number, coneShare: number): number {
  return coneShare >= 1 ? coneCpd : coneShare * coneCpd + (1 - coneShare) * rodCutoffCpd(eccentricityDeg, coneCpd);
}

function acuityTable(ctx: Context, limits: LetterLimits, coneShare: number): AcuityRow[] {
  const rows: AcuityRow[] = [];
  const { eyes } = ctx.setup.viewer;
  for (const e of ACUITY_TABLE_ECCENTRICITIES_DEG) {
    // Both sides of the horizontal meridian that the frame reaches; one side suffices for both eyes
    // (the better eye is symmetric) and at the gaze itself.
    for (const meridianDeg of [0, 180]) {
      const at = pixelAtFieldPoint(ctx.projection, ctx.gazePx, e, meridianDeg);
      if (!isInsideFrame(ctx.projection, at)) continue;
      const name = eyes === 'both' ? 'horizontal' : fieldMeridians(meridianDeg, eyes).horizontal;
      if (rows.some((r) => r.eccentricityDeg === e && (r.meridian === name || e === 0))) continue;
      const cutoffCpd = mixedCutoffCpd(ctx.model.cutoffCpd(e, meridianDeg, eyes), e, coneShare);
      const letter = letterSizeAt(cutoffCpd, limits, arcminAtPixel(ctx, at[0], at[1]), coneShare < 0.5);
      rows.push({
        eccentricityDeg: e, meridian: name, cutoffCpd, smallestLetterArcmin: letter.eyeArcmin,
        smallestLetterPx: letter.px, readingLetterPx: READING_RESERVE * letter.px, limitedBy: letter.limitedBy,
      });
    }
  }
  return rows;
}

type Adapting = Pick<DerivedNumbers['light'], 'adaptingLuminanceCdM2' | 'adaptingLuminanceFrom'>;

function blindSpotFor(ctx: Context): DerivedNumbers['blindSpot'] {
  const { eyes } = ctx.setup.viewer;
  const centre = blindSpotCentreDeg(eyes);
  if (!centre || eyes === 'both') return undefined;
  const ecc = Math.hypot(centre[0], centre[1]);
  const meridian = (Math.atan2(centre[1], centre[0]) * 180) / Math.PI;
  const at = pixelAtFieldPoint(ctx.projection, ctx.gazePx, ecc, meridian);
  return {
    eye: eyes, centreFieldDeg: centre, widthDeg: BLIND_SPOT.widthDeg, heightDeg: BLIND_SPOT.heightDeg,
    ...(isInsideFrame(ctx.projection, at) ? { centrePx: [Math.round(at[0]), Math.round(at[1])] as [number, number] } : {}),
  };
}

function deriveNumbers(ctx: Context, frameSizePx: [number, number], adapting: Adapting, scotopicRatio: number): { numbers: DerivedNumbers; optics: EyeOptics } {
  const { setup } = ctx;
  const eye = computeEyeState({
    viewer: setup.viewer, adaptingLuminanceCdM2: adapting.adaptingLuminanceCdM2,
    adaptingFieldDeg: setup.light.adaptingFieldDeg, focalDistanceM: focalDistanceM(ctx),
  });
  const limits = letterLimits(eye.pupilDiameterMm, eye.blurStrengthD);
  const light = lightState(adapting.adaptingLuminanceCdM2, scotopicRatio);
  const arcminPerFramePx = arcminAtPixel(ctx, ctx.gazePx[0] + 0.5, ctx.gazePx[1] + 0.5);
  const framePpd = 60 / arcminPerFramePx;
  const optics = computeEyeOptics({
    pupilDiameterMm: eye.pupilDiameterMm, defocusD: eye.defocusD,
    cylinderD: setup.viewer.refraction.cylinderD, axisDeg: setup.viewer.refraction.axisDeg, pixelArcmin: arcminPerFramePx,
    ...(setup.viewer.wavefront ? { measured: setup.viewer.wavefront } : {}),
  });
  const numbers: DerivedNumbers = {
    display: {
      kind: setup.display.kind,
      resolutionPx: setup.display.resolutionPx,
      frameSizePx,
      pixelsPerDegreeAtGaze: framePpd * (setup.display.resolutionPx[0] / frameSizePx[0]),
      framePixelsPerDegreeAtGaze: framePpd,
      arcminPerFramePxAtGaze: arcminPerFramePx,
      fieldOfViewDeg: fieldOfViewDeg(ctx.projection),
      focalDistanceM: focalDistanceM(ctx),
    },
    gazePx: ctx.gazePx,
    light: { ...adapting, ...light },
    ...(blindSpotFor(ctx) ? { blindSpot: blindSpotFor(ctx) } : {}),
    eye: { ...eye, ...limits },
    // Share of a point's light the CIE glare equation scatters to 1°–30°, as the veil applies it.
    optics: { ...optics.figures, scatteredFraction1To30Deg: scatteredFraction(VEIL_FROM_DEG, 30, setup.viewer.ageYears, setup.viewer.eyePigmentation) },
    acuity: acuityTable(ctx, limits, light.mesopicFactorM),
  };
  return { numbers, optics };
}

/** The derived figures of a setup without a frame (the frame is taken to be the display's resolution). */
export function computeNumbers(setup: Setup): DerivedNumbers {
  const size = setup.display.resolutionPx;
  const ctx = contextFor(setup, [size[0], size[1]]);
  const { display } = setup;
  const given = setup.light.adaptingLuminanceCdM2;
  const adapting: Adapting = given === 'auto'
    ? { adaptingLuminanceCdM2: ASSUMED_MEAN_REFLECTANCE * (display.peakLuminanceCdM2 - display.blackLuminanceCdM2) + display.blackLuminanceCdM2, adaptingLuminanceFrom: 'assumed 18 % grey frame' }
    : { adaptingLuminanceCdM2: given, adaptingLuminanceFrom: 'setup' };
  // Without a frame the light is taken to have the colour of the display's white (D65).
  return deriveNumbers(ctx, [size[0], size[1]], adapting, SCOTOPIC_PER_PHOTOPIC_WHITE).numbers;
}

export interface ProofResult {
  numbers: DerivedNumbers;
  viewMap: ViewMap;
  /** What reaches the photoreceptors: the frame through the eye's optics. */
  retinalImage: LinearRgb;
  /** What the viewer resolves. */
  percept: LinearRgb;
  /** Retinal cutoff frequency at each pixel, cpd. */
  cutoffCpd: Float32Array;
  /** Smallest legible letter height at each pixel, frame px. */
  smallestLetterPx: Float32Array;
  /** What sets the smallest letter at each pixel: an index into LETTER_LIMITS. */
  letterLimitIndex: Uint8Array;
  /** Verdicts for the frame's text labels, when labels were given. */
  labels?: LabelVerdict[];
  /** The eye's point-spread functions and optical figures. */
  optics: EyeOptics;
  /** With a depth map: where the eye focuses and the range of defocus over the frame. */
  depth?: { focusDistanceM: number; defocusRangeD: [number, number] };
  models: { acuity: AcuityModel };
}

export type StageListener = (stage: string) => void;

export interface ProofOptions {
  onStage?: StageListener;
  /** Text labels to judge. */
  labels?: readonly Label[];
  /** Distance from the eye per frame pixel, m (NaN where unknown), for real or pass-through frames. */
  depthM?: Float32Array;
}

/** Checks that the frame can be shown on the display: same aspect ratio within 1 %. */
export function frameFitsDisplay(display: Display, widthPx: number, heightPx: number): boolean {
  const [w, h] = display.resolutionPx;
  return Math.abs(widthPx / heightPx / (w / h) - 1) <= 0.01;
}

/** Runs the whole proof of one frame for one eye state. `source` names the setup in error messages. */
export function runProof(frame: LinearRgb, setup: Setup, source: string, options: ProofOptions = {}): ProofResult {
  const { onStage = () => {}, labels, depthM } = options;
  const size: [number, number] = [frame.width, frame.height];
  checkGazeInFrame(setup, frame.width, frame.height, source);
  const ctx = contextFor(setup, size);
  if (depthM) {
    const atGaze = depthM[Math.floor(ctx.gazePx[1]) * frame.width + Math.floor(ctx.gazePx[0])];
    if (atGaze > 0) ctx.gazeDepthM = atGaze;
  }

  onStage('geometry');
  const viewMap = computeViewMap(ctx.projection, ctx.gazePx);

  onStage('light and eye state');
  const given = setup.light.adaptingLuminanceCdM2;
  const field = luminanceInField(frame, setup, viewMap);
  const adapting: Adapting = given === 'auto'
    ? { adaptingLuminanceCdM2: field.photopicCdM2, adaptingLuminanceFrom: 'frame' }
    : { adaptingLuminanceCdM2: given, adaptingLuminanceFrom: 'setup' };
  const { numbers, optics } = deriveNumbers(ctx, size, adapting, field.scotopicToPhotopic);
  const { eye } = numbers;

  // Blurs in front of the eye — the headset lens and depth of field — are Gaussians, so they
  // combine by adding variances and run as one spatially varying pass.
  let frontSigma2: Float32Array | undefined;
  const addSigma = (sigmaPx: Float32Array): void => {
    frontSigma2 ??= new Float32Array(sigmaPx.length);
    for (let i = 0; i < sigmaPx.length; i++) frontSigma2[i] += sigmaPx[i] * sigmaPx[i];
  };
  if (setup.display.kind === 'headset' && setup.display.lensSharpness) {
    onStage('optics: headset lens');
    addSigma(headsetLensSigmaPx(setup.display.lensSharpness, ctx.projection, viewMap));
  }
  let depth: ProofResult['depth'];
  if (depthM) {
    onStage('optics: depth of field');
    const focusDistanceM = focalDistanceM(ctx);
    const { sigmaPx, defocusRangeD } = depthBlurSigmaPx({ depthM, focusDistanceM, gazeDefocusD: eye.defocusD, pupilDiameterMm: eye.pupilDiameterMm, arcminPerPx: viewMap.arcminPerPx });
    addSigma(sigmaPx);
    depth = { focusDistanceM, defocusRangeD };
  }
  const shown = frontSigma2 ? blurPlanes(frame, frontSigma2.map(Math.sqrt)) : frame;

  onStage('optics');
  const retinalImage = createLinearRgb(frame.width, frame.height);
  const scales = kernelScales(viewMap.arcminPerPx);
  const opticsInput = {
    pupilDiameterMm: eye.pupilDiameterMm, defocusD: eye.defocusD,
    cylinderD: setup.viewer.refraction.cylinderD, axisDeg: setup.viewer.refraction.axisDeg,
    ...(setup.viewer.wavefront ? { measured: setup.viewer.wavefront } : {}),
  };
  const planes = [0, 1, 2].map((c) => channelPlane(shown, c as 0 | 1 | 2));
  if (scales.length === 1) {
    filterWithKernels(planes, retinalImage.planes, optics.kernels);
  } else {
    // Kernels for a few pixel scales, blended per pixel (see scale-blend.ts).
    const { lower, upperWeight } = scaleWeights(viewMap.arcminPerPx, scales);
    const scratch = [0, 1, 2].map(() => new Float32Array(frame.width * frame.height));
    scales.forEach((pixelArcmin, k) => {
      filterWithKernels(planes, scratch, computeEyeOptics({ ...opticsInput, pixelArcmin }).kernels);
      for (let c = 0; c < 3; c++) {
        const out = retinalImage.planes[c];
        const src = scratch[c];
        for (let i = 0; i < out.length; i++) {
          const w = lower[i] === k ? 1 - upperWeight[i] : lower[i] + 1 === k ? upperWeight[i] : 0;
          if (w !== 0) out[i] += w * src[i];
        }
      }
    });
  }
  onStage('optics: stray light');
  addStrayLight(retinalImage, { arcminPerPx: numbers.display.arcminPerFramePxAtGaze, ageYears: setup.viewer.ageYears, pigmentation: setup.viewer.eyePigmentation });

  onStage('retina: cutoffs');
  const n = frame.width * frame.height;
  const { eyes } = setup.viewer;
  const coneShare = numbers.light.mesopicFactorM;
  const limits = { opticalCutoffCpd: eye.opticalCutoffCpd, defocusLetterArcmin: eye.defocusLetterArcmin };
  const cutoffs = { achromaticCpd: new Float32Array(n), redGreenCpd: new Float32Array(n), blueYellowCpd: new Float32Array(n), rodCpd: new Float32Array(n) };
  computeCutoffMap(viewMap, ctx.model, eyes, cutoffs.achromaticCpd);
  const cutoffCpd = new Float32Array(n);
  const smallestLetterPx = new Float32Array(n);
  const letterLimitIndex = new Uint8Array(n);
  const blindCentre = blindSpotCentreDeg(eyes);
  const seen = blindCentre ? new Float32Array(n) : undefined;
  const colourLoss = setup.models.colourLoss;
  for (let i = 0; i < n; i++) {
    const ecc = viewMap.eccentricityDeg[i];
    const cone = cutoffs.achromaticCpd[i];
    cutoffs.redGreenCpd[i] = chromaticCutoffCpd('red-green', ecc, colourLoss, cone);
    cutoffs.blueYellowCpd[i] = chromaticCutoffCpd('blue-yellow', ecc, colourLoss, cone);
    cutoffs.rodCpd[i] = rodCutoffCpd(ecc, cone);
    cutoffCpd[i] = mixedCutoffCpd(cone, ecc, coneShare);
    const letter = letterSizeAt(cutoffCpd[i], limits, viewMap.arcminPerPx[i], coneShare < 0.5);
    smallestLetterPx[i] = letter.px;
    letterLimitIndex[i] = LETTER_LIMITS.indexOf(letter.limitedBy);
    if (seen && blindCentre) {
      // Soft edge over ±5 % of the ellipse so the fill blends in.
      const d = blindSpotDistance(ecc, viewMap.meridianDeg[i], blindCentre);
      seen[i] = Math.min(1, Math.max(0, (d - 0.95) / 0.1));
      if (d < 1) {
        smallestLetterPx[i] = Infinity;
        letterLimitIndex[i] = LETTER_LIMITS.indexOf('blind spot');
      }
    }
  }
  const percept = computePercept({ retinal: retinalImage, cutoffs, arcminPerPx: viewMap.arcminPerPx, coneShare, seen }, onStage);

  let verdicts: LabelVerdict[] | undefined;
  if (labels) {
    onStage('labels');
    const fovealCutoffCpd = mixedCutoffCpd(ctx.model.cutoffCpd(0, 0, eyes), 0, coneShare);
    const maps = {
      ...viewMap, smallestLetterPx,
      limitAt: (i: number) => LETTER_LIMITS[letterLimitIndex[i]],
      fixated: (arcminPerPx: number) => letterSizeAt(fovealCutoffCpd, limits, arcminPerPx, coneShare < 0.5),
    };
    verdicts = labels.map((label) => judgeLabel(label, maps));
  }
  return { numbers, viewMap, retinalImage, percept, cutoffCpd, smallestLetterPx, letterLimitIndex, labels: verdicts, optics, ...(depth ? { depth } : {}), models: { acuity: ctx.model } };
}

/** Every channel through the spatially varying Gaussian blur of a sigma map (px). */
function blurPlanes(image: LinearRgb, sigmaPx: Float32Array): LinearRgb {
  const blend = planLevelBlend(sigmaPx, maxPyramidLevels(image.width, image.height));
  const out = createLinearRgb(image.width, image.height);
  image.planes.forEach((p, c) => blurVariable({ width: image.width, height: image.height, data: p }, blend, out.planes[c]));
  return out;
}

/** Filters three planes by three kernels (one per channel), sharing one tile size. */
function filterWithKernels(planes: ReturnType<typeof channelPlane>[], outs: Float32Array[], kernels: { kernel: Float32Array; size: number }[]): void {
  // All channels share one tile size: kernels are padded to the largest.
  const largest = Math.max(...kernels.map((k) => k.size));
  const { width, height } = planes[0];
  const grids = kernels.map((k) => otfGridFromKernel(width, height, padKernel(k.kernel, k.size, largest), largest));
  applyOtf(planes, outs, grids);
}

/** Centres an odd-sized kernel in a larger odd size, zero around it. */
function padKernel(kernel: Float32Array, size: number, to: number): Float32Array {
  if (size === to) return kernel;
  const out = new Float32Array(to * to);
  const off = (to - size) / 2;
  for (let y = 0; y < size; y++) out.set(kernel.subarray(y * size, (y + 1) * size), (y + off) * to + off);
  return out;
}

/**
 * Mean photopic luminance (cd/m²) of the frame within the adapting field around the gaze, and its
 * scotopic/photopic ratio (Larson et al. 1997 for the pixels; the black level taken as D65).
 */
function luminanceInField(frame: LinearRgb, setup: Setup, viewMap: ViewMap): { photopicCdM2: number; scotopicToPhotopic: number } {
  const { peakLuminanceCdM2: peak, blackLuminanceCdM2: black } = setup.display;
  const luminance = luminancePlaneCdM2(frame, setup.display).data;
  const [r, g, b] = frame.planes;
  const radiusDeg = setup.light.adaptingFieldDeg / 2;
  let photopic = 0;
  let scotopic = 0;
  let count = 0;
  for (let i = 0; i < luminance.length; i++) {
    if (viewMap.eccentricityDeg[i] > radiusDeg) continue;
    photopic += luminance[i];
    scotopic += scotopicOfLinearSrgb(r[i], g[i], b[i]) * (peak - black) + black * SCOTOPIC_PER_PHOTOPIC_WHITE;
    count++;
  }
  if (count === 0 || photopic <= 0) return { photopicCdM2: black, scotopicToPhotopic: SCOTOPIC_PER_PHOTOPIC_WHITE };
  return { photopicCdM2: photopic / count, scotopicToPhotopic: scotopic / photopic };
}
