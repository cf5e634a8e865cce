/**
 * The schedule: the only place that knows the order of stages. Stage functions hold the maths; this
 * file decides what is computed, in which order, and which buffers are reused.
 *
 * A proof has two steps. `prepareProof` does everything that depends on the frame and the viewer —
 * the eye's state and optics, the front-of-eye blurs, stray light, the retinal image and its ladders.
 * `lookAt` does what depends on the gaze — the view geometry, the retina's cutoffs, the percept, the
 * letter-size maps and the label verdicts — and is the cheap step a sweep or a live preview repeats.
 */
import { luminancePlaneCdM2, relativeLuminance } from './colour/luminance.js';
import { transformPlanes, type Matrix3 } from './colour/matrix3.js';
import { scotopicOfLinearSrgb } from './colour/scotopic.js';
import { checkGazeInFrame } from './config/validate.js';
import type { Display, Setup, Viewer } from './config/setup.js';
import { FRAME_MIN_LETTER_PX, LETTER_LIMITS, letterLimits, letterSizeAt, opticalCutoffAt, type LetterLimit, type LetterLimits, READING_RESERVE } from './analysis/letter-size.js';
import { criticalSpacingDeg, designLength, judgeLabel, type DesignLength, type DesignUnits, type Label, type LabelMaps, type LabelVerdict } from './analysis/labels.js';
import { offAxisRatio } from './optics/off-axis.js';
import { audienceEyes, audienceLetters, audienceShareFor, letterForShare, readingSizeDistribution, type AudienceEye } from './analysis/audience.js';
import { projectionFor, pixelToTan, type Projection } from './geometry/projection.js';
import { arcminPerPxAt, computeViewMap, fieldOfViewDeg, isInsideFrame, pixelAtFieldPoint, type ViewMap } from './geometry/view-map.js';
import { buildLadder, createLadderSums, createLadderWorkspace, evaluateLadder, mapPyramid } from './image/ladder-pyramid.js';
import { channelPlane, createLinearRgb, type LinearRgb } from './image/plane.js';
import { applyOtf, otfGridFromKernel, relativeOtfGrid, scaleByRadialTransfer, type OtfGrid } from './optics/apply-otf.js';
import { computeEyeOptics, luminanceMtfAt, typicalAberrationsAt5Mm, type EyeOptics, type EyeOpticsFigures, type EyeOpticsInput } from './optics/eye-optics.js';
import { addVeil, viewerVeilAt, type VeilResult } from './optics/veil.js';
import { headsetLensSigmaPx } from './optics/headset-lens.js';
import { depthBlurSigmaPx } from './optics/depth-blur.js';
import { kernelScales, scaleWeights } from './optics/scale-blend.js';
import { GLARE_MAX_DEG, scatteredFraction, VEIL_FROM_DEG } from './optics/stray-light.js';
import { computeEyeState, type EyeState } from './optics/eye-state.js';
import { acuityModels, type AcuityModel } from './retina/acuity-model.js';
import { fieldMeridians } from './retina/watson-rgc.js';
import { computeGazeMaps, type GazeMaps } from './retina/gaze-maps.js';
import { elliottLogMar, NEURAL_CONTRAST_REACH_DEG, neuralAcuityFactor, neuralContrastTransfer } from './retina/neural-ageing.js';
import { scatterScaleCpd } from './optics/ocular-scatter.js';
import { lensColourMatrix, primaryTransmission, STANDARD_OBSERVER_AGE_YEARS } from './optics/ocular-media.js';
import { BLIND_SPOT, blindSpotCentreDeg } from './retina/blind-spot.js';
import { lightState, type LightState } from './retina/light-level.js';
import { prepareRetina, renderPercept, type PreparedRetina } from './retina/percept.js';
import { gaussianLadderCoefficients } from './retina/sharp-lowpass.js';
import { ROD_PEAK_CUTOFF_CPD, rodCutoffCpd, SCOTOPIC_PER_PHOTOPIC_WHITE } from './retina/rod-vision.js';

/** Eccentricities listed in the acuity table, deg. */
export const ACUITY_TABLE_ECCENTRICITIES_DEG = [0, 2, 5, 10, 20, 30, 40] as const;

/** Without a frame, 'auto' adaptation assumes an 18 % grey frame (common practice: the mid-grey card). */
export const ASSUMED_MEAN_REFLECTANCE = 0.18;

export interface AcuityRow {
  eccentricityDeg: number;
  /** Field meridian: 'temporal' or 'nasal' for one eye; 'horizontal' for both (the better eye). */
  meridian: string;
  cutoffCpd: number;
  /** Finest frequency the eye's optics deliver above the letter threshold there, cpd. */
  opticalCutoffCpd: number;
  /** Smallest legible capital height the eye allows, arcmin. */
  smallestLetterArcmin: number;
  /** Smallest legible capital height on this frame, px (never below the frame's own 5 px limit). */
  smallestLetterPx: number;
  /** Capital height for fluent reading (2× threshold, Whittaker & Lovie-Kitchin 1993), frame px. */
  readingLetterPx: number;
  /** What sets the smallest letter here. */
  limitedBy: LetterLimit;
}

export interface PerceptNumbers {
  mode: Setup['percept']['mode'];
  modeFrom: Setup['percept']['modeFrom'];
  /** The reference viewer of a same-display percept, and its pupil and defocus in the same light. */
  referenceViewer?: { name?: string; ageYears: number; pupilDiameterMm: number; defocusD: number };
  /** True when the simulated eye's optics equal the reference eye's, so none are applied. */
  opticsCancel?: boolean;
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
    surroundLuminanceCdM2: number;
  } & LightState;
  /** The blind spot of the viewing eye in the field around the gaze; absent with both eyes. */
  blindSpot?: { eye: 'right' | 'left'; centreFieldDeg: [number, number]; widthDeg: number; heightDeg: number; centrePx?: [number, number] };
  eye: EyeState & { opticalCutoffCpdAtGaze: number; smallestLetterArcminAtGaze: number };
  /** Figures of the eye's optics: Strehl ratio, white-light MTF, encircled energy, defocus per channel, stray light. */
  optics: EyeOpticsFigures & { scatteredFraction1To100Deg: number };
  percept: PerceptNumbers;
  /** Every quantity that depends on the viewer's age, with its value and source. */
  ageing: AgeingEntry[];
  acuity: AcuityRow[];
}

export interface AgeingEntry {
  quantity: string;
  value: number;
  unit: string;
  source: string;
}

/** The age-dependent quantities of a viewer in a given eye state. */
function ageingEntries(viewer: Viewer, eye: EyeState): AgeingEntry[] {
  const age = viewer.ageYears;
  const hoa = typicalAberrationsAt5Mm(age);
  const lens = primaryTransmission(age);
  return [
    { quantity: 'accommodation amplitude', value: eye.accommodationAmplitudeD, unit: 'D', source: 'Hofstetter (1950), mean: 18.5 − 0.30·age' },
    { quantity: 'pupil diameter', value: eye.pupilDiameterMm, unit: 'mm', source: eye.pupilSource === 'setup' ? 'setup' : 'Watson & Yellott (2012), with age' },
    { quantity: 'higher-order aberration RMS over 5 mm (typical eye)', value: Math.hypot(hoa.sphericalUm, hoa.restUm), unit: 'µm', source: viewer.wavefront ? 'not used: measured wavefront given' : 'Salmon & van de Pol (2006); growth with age Berrio, Tabernero & Artal (2010)' },
    { quantity: 'spherical aberration over 5 mm (typical eye)', value: hoa.sphericalUm, unit: 'µm', source: viewer.wavefront ? 'not used: measured wavefront given' : 'Berrio, Tabernero & Artal (2010)' },
    { quantity: 'short-angle scatter scale', value: scatterScaleCpd(age), unit: 'cpd', source: 'IJspeert, van den Berg & Spekreijse (1993) age term on our fitted scale' },
    { quantity: 'wide-angle stray light age factor 1 + (A/62.5)⁴', value: 1 + (age / 62.5) ** 4, unit: '', source: 'CIE 180:2010' },
    { quantity: 'lens density at 450 nm', value: lens.lensDensityAt450Nm, unit: '', source: 'Pokorny, Smith & Lutze (1987)' },
    { quantity: 'red primary luminance reaching the cones, over a 32-year-old’s', value: lens.luminance.red, unit: '', source: 'Pokorny et al. (1987) on CIE 170-1:2006 2° fundamentals' },
    { quantity: 'green primary luminance reaching the cones, over a 32-year-old’s', value: lens.luminance.green, unit: '', source: 'Pokorny et al. (1987) on CIE 170-1:2006 2° fundamentals' },
    { quantity: 'blue primary luminance reaching the cones, over a 32-year-old’s', value: lens.luminance.blue, unit: '', source: 'Pokorny et al. (1987) on CIE 170-1:2006 2° fundamentals' },
    { quantity: 'blue primary S-cone signal, over a 32-year-old’s', value: lens.blueToSCones, unit: '', source: 'Pokorny et al. (1987) on CIE 170-1:2006 2° fundamentals' },
    { quantity: 'neural contrast kept at 10 cpd', value: neuralContrastTransfer(age, 10), unit: '', source: 'our proposal, fitted to Owsley, Sekuler & Siemsen (1983), Ashraf et al. (2020)' },
    { quantity: 'neural factor on the retina’s cutoff', value: neuralAcuityFactor(age), unit: '', source: 'our proposal, fitted to Elliott, Yang & Whitaker (1995)' },
    { quantity: 'best-corrected foveal acuity norm', value: elliottLogMar(age), unit: 'logMAR', source: 'Elliott, Yang & Whitaker (1995)' },
  ];
}

interface Context {
  setup: Setup;
  projection: Projection;
  gazePx: [number, number];
  model: AcuityModel;
  /** Distance of what is seen at the gaze, from a depth map, when there is one (m). */
  gazeDepthM?: number;
}

function contextFor(setup: Setup, frameSizePx: [number, number], gazePx?: [number, number]): Context {
  const projection = projectionFor(setup.display, frameSizePx[0], frameSizePx[1], setup.frame.placementPx);
  const gaze: [number, number] = gazePx ?? (setup.gaze ? [setup.gaze.xPx, setup.gaze.yPx] : [Math.floor(frameSizePx[0] / 2), Math.floor(frameSizePx[1] / 2)]);
  return { setup, projection, gazePx: gaze, model: agedAcuityModel(acuityModels[setup.models.acuity], setup.viewer.ageYears) };
}

/** The acuity model with the retina's cutoff scaled by the neural factor for the viewer's age (neural-ageing.ts). */
function agedAcuityModel(model: AcuityModel, ageYears: number): AcuityModel {
  const factor = neuralAcuityFactor(ageYears);
  if (factor === 1) return model;
  return { ...model, variant: `neural factor ${factor}`, cutoffCpd: (e, m, eyes) => factor * model.cutoffCpd(e, m, eyes) };
}

/** Distance from the eye to what it focuses on: the screen point at the gaze, or a headset's virtual image. */
function focalDistanceM(ctx: Context): number {
  if (ctx.gazeDepthM !== undefined) return ctx.gazeDepthM;
  if (ctx.setup.gaze?.focusDistanceM !== undefined) return ctx.setup.gaze.focusDistanceM;
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
      const letter = letterSizeAt(cutoffCpd, limits, e, arcminAtPixel(ctx, at[0], at[1]), coneShare < 0.5);
      rows.push({
        eccentricityDeg: e, meridian: name, cutoffCpd, opticalCutoffCpd: opticalCutoffAt(limits, e), smallestLetterArcmin: letter.eyeArcmin,
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

const opticsCache = new Map<string, EyeOptics>();
const OPTICS_CACHE_SIZE = 16;

/** The eye's optics for a state, cached: sweeps and batches meet the same eyes again and again. */
function opticsFor(input: EyeOpticsInput): EyeOptics {
  const key = JSON.stringify(input);
  const hit = opticsCache.get(key);
  if (hit) {
    opticsCache.delete(key);
    opticsCache.set(key, hit);
    return hit;
  }
  const optics = computeEyeOptics(input);
  opticsCache.set(key, optics);
  if (opticsCache.size > OPTICS_CACHE_SIZE) opticsCache.delete(opticsCache.keys().next().value as string);
  return optics;
}

function opticsInput(viewer: Viewer, eye: EyeState, pixelArcmin: number): EyeOpticsInput {
  return {
    pupilDiameterMm: eye.pupilDiameterMm, defocusD: eye.defocusD, cylinderD: uncorrectedCylinderD(viewer), axisDeg: viewer.refraction.axisDeg,
    pixelArcmin, ageYears: viewer.ageYears, ...(viewer.wavefront ? { measured: viewer.wavefront } : {}),
  };
}

/** The cylinder left while viewing: none through glasses for the display. */
function uncorrectedCylinderD(viewer: Viewer): number {
  return viewer.glasses === 'display' ? 0 : viewer.refraction.cylinderD;
}

/** Share of a point's light the eye's stray light leaves in the image's core (CIE glare beyond 1°). */
function coreFraction(viewer: Viewer): number {
  return 1 - scatteredFraction(VEIL_FROM_DEG, GLARE_MAX_DEG, viewer.ageYears, viewer.eyePigmentation);
}

interface EyeModel {
  eye: EyeState;
  refEye: EyeState;
  optics: EyeOptics;
  limits: LetterLimits;
  light: LightState;
  /** Pixel scale the optics were computed at, arcmin. */
  pixelArcmin: number;
}

function eyeModel(ctx: Context, adapting: Adapting, scotopicRatio: number, pixelArcmin: number): EyeModel {
  const { setup } = ctx;
  const stateFor = (viewer: Viewer): EyeState => computeEyeState({
    viewer, adaptingLuminanceCdM2: adapting.adaptingLuminanceCdM2, adaptingFieldDeg: setup.light.adaptingFieldDeg,
    focalDistanceM: focalDistanceM(ctx), accommodationReserve: setup.models.accommodationReserve,
  });
  const eye = stateFor(setup.viewer);
  const optics = opticsFor(opticsInput(setup.viewer, eye, pixelArcmin));
  // High-contrast letters are limited by resolution; the neural contrast loss of age enters the letter
  // rule through the retina's cutoff (neural-ageing.ts), not a second time through the optics.
  const limits: LetterLimits = {
    ...letterLimits((f) => luminanceMtfAt(optics, f), coreFraction(setup.viewer), eye.blurStrengthD, ctx.model.letterFactor),
    minLetterPx: FRAME_MIN_LETTER_PX * Math.max(1, ctx.projection.widthPx / (setup.frame.placementPx?.[2] ?? setup.display.resolutionPx[0])),
  };
  return { eye, refEye: stateFor(setup.percept.referenceViewer), optics, limits, light: lightState(adapting.adaptingLuminanceCdM2, scotopicRatio), pixelArcmin };
}

function surroundCdM2(setup: Setup): number {
  return setup.light.surroundLuminanceCdM2 ?? setup.display.blackLuminanceCdM2;
}

/** True when two eyes in one light have the same optics (the same-display percept needs none). */
function sameOptics(a: Viewer, b: Viewer, ea: EyeState, eb: EyeState): boolean {
  return a.ageYears === b.ageYears && ea.pupilDiameterMm === eb.pupilDiameterMm && ea.defocusD === eb.defocusD
    && uncorrectedCylinderD(a) === uncorrectedCylinderD(b) && a.refraction.axisDeg === b.refraction.axisDeg
    && JSON.stringify(a.wavefront ?? null) === JSON.stringify(b.wavefront ?? null);
}

function numbersFrom(ctx: Context, frameSizePx: [number, number], adapting: Adapting, model: EyeModel): DerivedNumbers {
  const { setup } = ctx;
  const arcminPerFramePx = arcminAtPixel(ctx, ctx.gazePx[0] + 0.5, ctx.gazePx[1] + 0.5);
  const framePpd = 60 / arcminPerFramePx;
  const { eye, refEye, optics, limits, light } = model;
  const sameDisplay = setup.percept.mode === 'same-display';
  const fovealCutoff = mixedCutoffCpd(ctx.model.cutoffCpd(0, 0, setup.viewer.eyes), 0, light.mesopicFactorM);
  const atGaze = letterSizeAt(fovealCutoff, limits, 0, arcminPerFramePx, light.mesopicFactorM < 0.5);
  return {
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
    light: { ...adapting, surroundLuminanceCdM2: surroundCdM2(setup), ...light },
    ...(blindSpotFor(ctx) ? { blindSpot: blindSpotFor(ctx) } : {}),
    eye: { ...eye, opticalCutoffCpdAtGaze: opticalCutoffAt(limits, 0), smallestLetterArcminAtGaze: atGaze.eyeArcmin },
    optics: { ...optics.figures, scatteredFraction1To100Deg: 1 - coreFraction(setup.viewer) },
    percept: {
      mode: setup.percept.mode,
      modeFrom: setup.percept.modeFrom,
      ...(sameDisplay ? {
        referenceViewer: { name: setup.percept.referenceViewerName, ageYears: setup.percept.referenceViewer.ageYears, pupilDiameterMm: refEye.pupilDiameterMm, defocusD: refEye.defocusD },
        opticsCancel: sameOptics(setup.viewer, setup.percept.referenceViewer, eye, refEye),
      } : {}),
    },
    ageing: ageingEntries(setup.viewer, eye),
    acuity: acuityTable(ctx, limits, light.mesopicFactorM),
  };
}

/** The adapting light without a frame: the setup's, or that of an 18 % grey frame on the display. */
function adaptingWithoutFrame(setup: Setup): Adapting {
  const { display } = setup;
  const given = setup.light.adaptingLuminanceCdM2;
  return given === 'auto'
    ? { adaptingLuminanceCdM2: ASSUMED_MEAN_REFLECTANCE * (display.peakLuminanceCdM2 - display.blackLuminanceCdM2) + display.blackLuminanceCdM2, adaptingLuminanceFrom: 'assumed 18 % grey frame' }
    : { adaptingLuminanceCdM2: given, adaptingLuminanceFrom: 'setup' };
}

/** The derived figures of a setup without a frame (the frame is taken to be the display's resolution). */
export function computeNumbers(setup: Setup): DerivedNumbers {
  const size = setup.display.resolutionPx;
  const ctx = contextFor(setup, [size[0], size[1]]);
  const adapting = adaptingWithoutFrame(setup);
  const arcmin = arcminAtPixel(ctx, ctx.gazePx[0] + 0.5, ctx.gazePx[1] + 0.5);
  // Without a frame the light is taken to have the colour of the display's white (D65).
  return numbersFrom(ctx, [size[0], size[1]], adapting, eyeModel(ctx, adapting, SCOTOPIC_PER_PHOTOPIC_WHITE, arcmin));
}

/** Eccentricities of the size specification, deg. */
export const SIZE_SPEC_ECCENTRICITIES_DEG = [0, 2, 5, 10, 20] as const;

export interface SizeSpecRow {
  eccentricityDeg: number;
  /** Smallest legible capital for the setup's viewer (worse side of the horizontal meridian), and what limits it. */
  thresholdCapHeight: DesignLength;
  limitedBy: LetterLimit;
  /** Capital height for fluent reading (READING_RESERVE× the threshold): the size a type scale needs. */
  capHeight: DesignLength;
  /** Letter advance (centre to centre) that escapes crowding there (Song, Levi & Pelli 2014, Eq. 14). */
  letterAdvance: DesignLength;
  /** With an audience share: the capital height that share of each audience reads. */
  audience?: { share: number; uncorrected: DesignLength; corrected: DesignLength };
}

export interface SizeSpec {
  rows: SizeSpecRow[];
  /** Angular size of one frame px at the gaze, the size every row is converted with. */
  arcminPerPx: number;
  adaptingLuminanceCdM2: number;
  adaptingLuminanceFrom: Adapting['adaptingLuminanceFrom'];
  units: DesignUnits;
}

/**
 * The smallest capital height and letter advance that pass at given distances from the gaze on this
 * display, for the setup's viewer and, with `audienceShare`, for that share of the audience (audience.ts).
 * Without a frame the light is that of an 18 % grey frame (as `numbers`).
 */
export function sizeSpec(setup: Setup, audienceShare?: number): SizeSpec {
  const size: [number, number] = [setup.display.resolutionPx[0] * setup.frame.pixelRatio, setup.display.resolutionPx[1] * setup.frame.pixelRatio].map(Math.round) as [number, number];
  const ctx = contextFor(setup, size);
  const adapting = adaptingWithoutFrame(setup);
  const arcminPerPx = arcminAtPixel(ctx, ctx.gazePx[0] + 0.5, ctx.gazePx[1] + 0.5);
  const model = eyeModel(ctx, adapting, SCOTOPIC_PER_PHOTOPIC_WHITE, arcminPerPx);
  const coneShare = model.light.mesopicFactorM;
  const { eyes } = setup.viewer;
  const units = designUnitsFor(setup, size[0]);
  const base = acuityModels[setup.models.acuity];
  const audience = audienceShare !== undefined ? audienceEyes({
    focalDistanceM: focalDistanceM(ctx), adaptingLuminanceCdM2: adapting.adaptingLuminanceCdM2, adaptingFieldDeg: setup.light.adaptingFieldDeg, eyes, accommodationReserve: setup.models.accommodationReserve,
  }) : undefined;
  const rows = SIZE_SPEC_ECCENTRICITIES_DEG.map((e): SizeSpecRow => {
    // The worse side of the horizontal meridian (one eye differs nasally and temporally).
    const letters = [0, 180].map((m) => letterSizeAt(mixedCutoffCpd(ctx.model.cutoffCpd(e, m, eyes), e, coneShare), model.limits, e, arcminPerPx, coneShare < 0.5));
    const letter = letters[0].px >= letters[1].px ? letters[0] : letters[1];
    const worseMeridian = letters[0].px >= letters[1].px ? 0 : 180;
    const row: SizeSpecRow = {
      eccentricityDeg: e,
      thresholdCapHeight: designLength(letter.px, arcminPerPx, units), limitedBy: letter.limitedBy,
      capHeight: designLength(Math.ceil(READING_RESERVE * letter.px), arcminPerPx, units),
      letterAdvance: designLength(Math.ceil((criticalSpacingDeg(e) * 60) / arcminPerPx), arcminPerPx, units),
    };
    if (audience && audienceShare !== undefined) {
      const cutoff = mixedCutoffCpd(base.cutoffCpd(e, worseMeridian, eyes), e, coneShare);
      const at = (kind: 'uncorrected' | 'corrected'): DesignLength => designLength(Math.ceil(letterForShare(audience, kind, audienceShare / 100, base, cutoff, e, arcminPerPx, model.limits.minLetterPx)), arcminPerPx, units);
      row.audience = { share: audienceShare, uncorrected: at('uncorrected'), corrected: at('corrected') };
    }
    return row;
  });
  return { rows, arcminPerPx, ...adapting, units };
}

export interface ProofResult {
  numbers: DerivedNumbers;
  viewMap: ViewMap;
  /** What reaches the photoreceptors (retinal-image mode) or what the display must show (same-display mode), before the retina. */
  retinalImage: LinearRgb;
  /** What the viewer resolves. */
  percept: LinearRgb;
  /** Retinal cutoff frequency at each pixel, cpd. */
  cutoffCpd: Float32Array;
  /** Smallest legible letter height at each pixel, frame px. */
  smallestLetterPx: Float32Array;
  /** What sets the smallest letter at each pixel: an index into LETTER_LIMITS. */
  letterLimitIndex: Uint8Array;
  /** Every per-pixel map of the gaze (the retina's filters, cutoffs and letter sizes). */
  maps: GazeMaps;
  /** Verdicts for the frame's text labels, when labels were given. */
  labels?: LabelVerdict[];
  /** The eye's point-spread functions and optical figures. */
  optics: EyeOptics;
  /** Stray light as applied. */
  veil: VeilResult;
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

/** Checks that the frame can be shown on the display (or its placement): same aspect ratio within 1 %. */
export function frameFitsDisplay(display: Display, widthPx: number, heightPx: number, placementPx?: readonly number[]): boolean {
  const [w, h] = placementPx ? [placementPx[2], placementPx[3]] : display.resolutionPx;
  return Math.abs(widthPx / heightPx / (w / h) - 1) <= 0.01;
}

/** How the frame's pixels map onto the display's, and what is said about it. */
export interface FrameScale {
  /** Frame pixels per display pixel. */
  framePxPerDisplayPx: number;
  /** The design's pixel ratio (frame.pixelRatio). */
  pixelRatio: number;
  /** Where the frame sits on the display, display px. */
  placementPx: [number, number, number, number];
  /** A sentence when the frame is scaled other than the pixel ratio says. */
  note?: string;
}

export function frameScaleFor(setup: Setup, widthPx: number, heightPx: number): FrameScale {
  const [dw, dh] = setup.display.resolutionPx;
  const placementPx = setup.frame.placementPx ?? [0, 0, dw, dh];
  const scale = widthPx / placementPx[2];
  const { pixelRatio } = setup.frame;
  const where = setup.frame.placementPx ? `its placement of ${placementPx[2]}×${placementPx[3]} display px` : `the ${dw}×${dh} px display`;
  let note: string | undefined;
  if (Math.abs(scale / pixelRatio - 1) > 0.01) {
    const ratioHint = Math.abs(scale - Math.round(scale)) < 0.01 && Math.round(scale) >= 2 ? ` For an @${Math.round(scale)}x export set frame.pixelRatio to ${Math.round(scale)}.` : '';
    note = `the ${widthPx}×${heightPx} px frame is scaled to fill ${where}: ${scale.toFixed(3)} frame px per display px, while frame.pixelRatio is ${pixelRatio}.${ratioHint}`;
  }
  return { framePxPerDisplayPx: scale, pixelRatio, placementPx: [...placementPx] as [number, number, number, number], ...(note ? { note } : {}) };
}

/** Everything that depends on the frame and the viewer, ready for looks at any gaze. */
export interface PreparedProof {
  frame: LinearRgb;
  setup: Setup;
  ctx: Context;
  adapting: Adapting;
  model: EyeModel;
  retinalImage: LinearRgb;
  retina: PreparedRetina;
  veil: VeilResult;
  depth?: ProofResult['depth'];
  /** Smallest arcmin per frame pixel over the frame. */
  minArcminPerPx: number;
}

/** Largest cutoff, in cycles per pixel, a coarser signal is asked to carry (below its 0.5 Nyquist limit). */
const COARSE_SIGNAL_MAX_CYCLES_PER_PX = 0.45;

/** How many times a signal whose finest detail is `maxCpd` can be halved on this frame. */
function coarseLevel(maxCpd: number, minArcminPerPx: number): number {
  let level = 0;
  while (maxCpd * ((minArcminPerPx * 2 ** (level + 1)) / 60) <= COARSE_SIGNAL_MAX_CYCLES_PER_PX && level < 6) level++;
  return level;
}

/** Runs everything that does not depend on the gaze (the eye's state is taken at the setup's gaze). */
export function prepareProof(frame: LinearRgb, setup: Setup, source: string, options: ProofOptions = {}): PreparedProof {
  const { onStage = () => {}, depthM } = options;
  const size: [number, number] = [frame.width, frame.height];
  checkGazeInFrame(setup, frame.width, frame.height, source);
  const ctx = contextFor(setup, size);
  const gazeInFrame = ctx.gazePx[0] >= 0 && ctx.gazePx[1] >= 0 && ctx.gazePx[0] < frame.width && ctx.gazePx[1] < frame.height;
  if (depthM && gazeInFrame) {
    const atGaze = depthM[Math.floor(ctx.gazePx[1]) * frame.width + Math.floor(ctx.gazePx[0])];
    if (atGaze > 0) ctx.gazeDepthM = atGaze;
  }

  onStage('geometry');
  const viewMap = computeViewMap(ctx.projection, ctx.gazePx);
  let minArcminPerPx = Infinity;
  for (const v of viewMap.arcminPerPx) if (v < minArcminPerPx) minArcminPerPx = v;

  onStage('light and eye state');
  const given = setup.light.adaptingLuminanceCdM2;
  const field = luminanceInField(frame, setup, viewMap);
  const adapting: Adapting = given === 'auto'
    ? { adaptingLuminanceCdM2: field.photopicCdM2, adaptingLuminanceFrom: 'frame' }
    : { adaptingLuminanceCdM2: given, adaptingLuminanceFrom: 'setup' };
  const arcminAtGaze = arcminAtPixel(ctx, ctx.gazePx[0] + 0.5, ctx.gazePx[1] + 0.5);
  const scales = kernelScales(viewMap.arcminPerPx);
  // The optics' figures are taken at the kernel scale nearest the gaze's pixels (one computation serves both).
  const figureScale = scales.reduce((best, v) => (Math.abs(Math.log(v / arcminAtGaze)) < Math.abs(Math.log(best / arcminAtGaze)) ? v : best));
  const model = eyeModel(ctx, adapting, field.scotopicToPhotopic, figureScale);
  const { eye, refEye } = model;
  const sameDisplay = setup.percept.mode === 'same-display';

  // Blurs in front of the eye — the headset lens and depth of field — are Gaussians, so they combine
  // by adding variances and run as one spatially varying pass. On the same display the reference
  // viewer looks through the same headset lens, so only the retinal image carries it.
  let frontVariance: Float32Array | undefined;
  const addSigma = (sigmaPx: Float32Array): void => {
    frontVariance ??= new Float32Array(sigmaPx.length);
    for (let i = 0; i < sigmaPx.length; i++) frontVariance[i] += sigmaPx[i] * sigmaPx[i];
  };
  if (setup.display.kind === 'headset' && setup.display.lensSharpness && !sameDisplay) {
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
  const blurred = frontVariance ? blurPlanes(frame, frontVariance) : frame;
  // The ageing lens (ocular-media.ts): the cone signals of this viewer's age, shown for the reference
  // viewer's eye (same display) or the standard observer's (the retinal image).
  const lensAge = sameDisplay ? setup.percept.referenceViewer.ageYears : STANDARD_OBSERVER_AGE_YEARS;
  const lens = lensColourMatrix(setup.viewer.ageYears, lensAge, setup.models.lensColour);
  const shown = lens ? transformedCopy(blurred, lens) : blurred;

  onStage('optics');
  const retinalImage = createLinearRgb(frame.width, frame.height);
  const cancels = sameDisplay && sameOptics(setup.viewer, setup.percept.referenceViewer, eye, refEye);
  const planes = [0, 1, 2].map((c) => channelPlane(shown, c as 0 | 1 | 2));
  if (cancels) {
    for (let c = 0; c < 3; c++) retinalImage.planes[c].set(shown.planes[c]);
  } else {
    const gridsAt = (pixelArcmin: number): OtfGrid[] => {
      const sim = { kernels: opticsFor(opticsInput(setup.viewer, eye, pixelArcmin)).kernels, ageYears: setup.viewer.ageYears };
      const reference = setup.percept.referenceViewer;
      const ref = sameDisplay ? { kernels: opticsFor(opticsInput(reference, refEye, pixelArcmin)).kernels, ageYears: reference.ageYears } : undefined;
      return channelGrids(frame.width, frame.height, pixelArcmin, sim, ref);
    };
    if (scales.length === 1) {
      applyOtf(planes, retinalImage.planes, gridsAt(scales[0]));
    } else {
      // Kernels for a few pixel scales, blended per pixel (see scale-blend.ts).
      const { lower, upperWeight } = scaleWeights(viewMap.arcminPerPx, scales);
      const scratch = [0, 1, 2].map(() => new Float32Array(frame.width * frame.height));
      scales.forEach((pixelArcmin, k) => {
        applyOtf(planes, scratch, gridsAt(pixelArcmin));
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
  }
  onStage('optics: stray light');
  const veil = addVeil(retinalImage, {
    arcminPerPx: arcminAtGaze,
    eye: { ageYears: setup.viewer.ageYears, pigmentation: setup.viewer.eyePigmentation },
    ...(sameDisplay ? { reference: { ageYears: setup.percept.referenceViewer.ageYears, pigmentation: setup.percept.referenceViewer.eyePigmentation } } : {}),
    peakLuminanceCdM2: setup.display.peakLuminanceCdM2,
    blackLuminanceCdM2: setup.display.blackLuminanceCdM2,
    surroundLuminanceCdM2: surroundCdM2(setup),
  });

  onStage('retina: preparing');
  const coneShare = model.light.mesopicFactorM;
  const colourMaxCpd = Math.max(setup.models.colourLoss.redGreenFovealCutoffCpd, setup.models.colourLoss.blueYellowFovealCutoffCpd);
  const retina = prepareRetina(retinalImage, {
    // At least one reduction: below its own blur the full-size colour is mixed in (percept.ts).
    colourLevel: Math.max(frame.width >= 64 && frame.height >= 64 ? 1 : 0, coarseLevel(colourMaxCpd, minArcminPerPx)),
    ...(coneShare < 1 ? { rodLevel: coarseLevel(ROD_PEAK_CUTOFF_CPD, minArcminPerPx) } : {}),
  });
  return { frame, setup, ctx, adapting, model, retinalImage, retina, veil, ...(depth ? { depth } : {}), minArcminPerPx };
}

export interface LookOptions {
  /** Where the viewer looks, frame px (default: the prepared gaze). */
  gazePx?: [number, number];
  labels?: readonly Label[];
  onStage?: StageListener;
  /**
   * A result of an earlier gaze on the same prepared frame whose arrays this one may overwrite: a
   * live preview or a sweep that moves on from one gaze to the next allocates nothing new.
   */
  reuse?: ProofResult;
}

/** The gaze-dependent step: the percept, maps and verdicts for a gaze (default: the prepared one). */
export function lookAt(prepared: PreparedProof, options: LookOptions = {}): ProofResult {
  const { setup, frame, model } = prepared;
  const onStage = options.onStage ?? (() => {});
  const ctx: Context = { ...prepared.ctx, gazePx: options.gazePx ?? prepared.ctx.gazePx };
  const previous = options.reuse;
  const viewMap = computeViewMap(ctx.projection, ctx.gazePx, previous?.viewMap);
  const numbers = numbersFrom(ctx, [frame.width, frame.height], prepared.adapting, model);

  onStage('retina: cutoffs');
  const coneShare = model.light.mesopicFactorM;
  const maps = computeGazeMaps({
    viewMap, model: ctx.model, eyes: setup.viewer.eyes, colourLoss: setup.models.colourLoss,
    sameDisplay: setup.percept.mode === 'same-display', coneShare, limits: model.limits,
  }, previous?.maps);
  const { cutoffCpd, smallestLetterPx, letterLimitIndex, seen } = maps;
  onStage('retina: percept');
  const percept = renderPercept(prepared.retina, { cutoffs: maps, coneShare, seen }, previous?.percept);

  let verdicts: LabelVerdict[] | undefined;
  const labels = options.labels;
  if (labels) {
    onStage('labels');
    const labelMaps = labelMapsFor(prepared, ctx, viewMap, seen);
    verdicts = labels.map((label) => judgeLabel(label, labelMaps));
    for (const v of verdicts) {
      if (!v.reach) continue;
      const centre: [number, number] = [v.boxPx[0] + v.boxPx[2] / 2, v.boxPx[1] + v.boxPx[3] / 2];
      v.reach.outlinePx = v.reach.radiusDeg.map((r, k) => pixelAtFieldPoint(ctx.projection, [centre[0] - 0.5, centre[1] - 0.5], r, v.reach!.directionsDeg[k]) ?? centre)
        .map(([x, y]) => [Math.round(x * 10) / 10, Math.round(y * 10) / 10]);
    }
  }
  return {
    numbers, viewMap, retinalImage: prepared.retinalImage, percept, cutoffCpd, smallestLetterPx, letterLimitIndex, maps, labels: verdicts,
    optics: model.optics, veil: prepared.veil, ...(prepared.depth ? { depth: prepared.depth } : {}), models: { acuity: ctx.model },
  };
}

/** Relative luminance of the frame (linear sRGB weights), computed once per prepared frame. */
const frameLuminance = new WeakMap<PreparedProof, Float32Array>();

/** Frame pixels per design unit and millimetres per frame pixel, for fixes in designers' units. */
export function designUnitsFor(setup: Setup, frameWidthPx: number): DesignUnits {
  const d = setup.display;
  return { pixelRatio: setup.frame.pixelRatio, ...(d.kind === 'screen' ? { mmPerFramePx: d.widthMm / frameWidthPx } : {}) };
}

/** Everything the label judge needs at one gaze. */
export function labelMapsFor(prepared: PreparedProof, ctx: Context, viewMap: ViewMap, seen?: Float32Array): LabelMaps {
  const { setup, model, frame } = prepared;
  let luminance = frameLuminance.get(prepared);
  if (!luminance) frameLuminance.set(prepared, (luminance = relativeLuminance(frame)));
  const coneShare = model.light.mesopicFactorM;
  const { eyes } = setup.viewer;
  const lettersAt = audienceLetterCache(prepared);
  const referenceOptics = opticsFor(opticsInput(setup.percept.referenceViewer, model.refEye, model.pixelArcmin));
  return {
    ...viewMap, ...(seen ? { seen } : {}), luminance,
    letterAt: (e, m, arcminPerPx) => letterSizeAt(mixedCutoffCpd(ctx.model.cutoffCpd(e, m, eyes), e, coneShare), model.limits, e, arcminPerPx, coneShare < 0.5),
    transferAt: (f, e) => luminanceMtfAt(model.optics, f) * offAxisRatio(e, f),
    referenceTransferAt: (f, e) => luminanceMtfAt(referenceOptics, f) * offAxisRatio(e, f),
    veilAt: (x, y) => viewerVeilAt(prepared.veil, x, y),
    blackShare: setup.display.blackLuminanceCdM2 / setup.display.peakLuminanceCdM2,
    coreFraction: coreFraction(setup.viewer),
    units: designUnitsFor(setup, frame.width),
    audienceAt: (e, m, arcminPerPx, letterPx) => {
      const base = acuityModels[setup.models.acuity];
      const cutoff = mixedCutoffCpd(base.cutoffCpd(e, m, eyes), e, coneShare);
      // The eyes' letters at one place serve every label there (all look labels share the fovea).
      const key = `${e.toFixed(3)}|${cutoff.toFixed(4)}`;
      let letters = lettersAt.get(key);
      if (!letters) {
        letters = audienceLetters(audienceFor(prepared), base, cutoff, e);
        if (lettersAt.size > 256) lettersAt.clear();
        lettersAt.set(key, letters);
      }
      return audienceShareFor(audienceFor(prepared), base, cutoff, e, arcminPerPx, letterPx, model.limits.minLetterPx, letters);
    },
  };
}

/** The audience's reading sizes when looking at text at the gaze (for audience.png), per audience. */
export function audienceCurves(prepared: PreparedProof, gazePx?: [number, number]): { arcminPerPx: number; curves: { kind: 'uncorrected' | 'corrected'; points: [number, number][] }[] } {
  const { setup, model } = prepared;
  const ctx = { ...prepared.ctx, gazePx: gazePx ?? prepared.ctx.gazePx };
  const arcminPerPx = arcminAtPixel(ctx, ctx.gazePx[0] + 0.5, ctx.gazePx[1] + 0.5);
  const base = acuityModels[setup.models.acuity];
  const cutoff = mixedCutoffCpd(base.cutoffCpd(0, 0, setup.viewer.eyes), 0, model.light.mesopicFactorM);
  const eyes = audienceFor(prepared);
  return { arcminPerPx, curves: (['uncorrected', 'corrected'] as const).map((kind) => ({ kind, points: readingSizeDistribution(eyes, kind, base, cutoff, 0, arcminPerPx, model.limits.minLetterPx) })) };
}

const audiences = new WeakMap<PreparedProof, AudienceEye[]>();
const audienceLetterCaches = new WeakMap<PreparedProof, Map<string, Float64Array>>();

function audienceLetterCache(prepared: PreparedProof): Map<string, Float64Array> {
  let cache = audienceLetterCaches.get(prepared);
  if (!cache) audienceLetterCaches.set(prepared, (cache = new Map()));
  return cache;
}

/** The audience's eyes in the proof's light and at its viewing distance, once per prepared frame. */
export function audienceFor(prepared: PreparedProof): AudienceEye[] {
  let eyes = audiences.get(prepared);
  if (!eyes) {
    const { setup } = prepared;
    eyes = audienceEyes({
      focalDistanceM: focalDistanceM(prepared.ctx), adaptingLuminanceCdM2: prepared.adapting.adaptingLuminanceCdM2, adaptingFieldDeg: setup.light.adaptingFieldDeg,
      eyes: setup.viewer.eyes, accommodationReserve: setup.models.accommodationReserve,
    });
    audiences.set(prepared, eyes);
  }
  return eyes;
}

/** Runs the whole proof of one frame for one eye state. `source` names the setup in error messages. */
export function runProof(frame: LinearRgb, setup: Setup, source: string, options: ProofOptions = {}): ProofResult {
  return lookAt(prepareProof(frame, setup, source, options), { labels: options.labels, onStage: options.onStage });
}

/** Every channel through the spatially varying Gaussian blur of a variance map (px²). */
function blurPlanes(image: LinearRgb, variancePx2: Float32Array): LinearRgb {
  const { width, height } = image;
  const ws = createLadderWorkspace(width, height);
  const out = createLinearRgb(width, height);
  image.planes.forEach((p, c) => {
    const ladder = buildLadder(p, width, height, ws);
    evaluateLadder(ladder, gaussianLadderCoefficients(mapPyramid(variancePx2, ladder), ladder.levels), out.planes[c], createLadderSums(ladder), ws);
  });
  return out;
}

/** Transfer grids per channel: the eye's kernels, or their ratio to the reference eye's. */
/**
 * The OTF grids of the simulated eye's kernels (relative to the reference eye's when given), with the
 * neural contrast transfer for each viewer's age folded in (neural-ageing.ts).
 */
function channelGrids(width: number, height: number, pixelArcmin: number, sim: { kernels: EyeOptics['kernels']; ageYears: number }, ref?: { kernels: EyeOptics['kernels']; ageYears: number }): OtfGrid[] {
  const neural = (ageYears: number): ((cyclesPerPx: number) => number) | undefined => (
    neuralContrastTransfer(ageYears, 1e3) < 1 ? (f) => neuralContrastTransfer(ageYears, (f * 60) / pixelArcmin) : undefined
  );
  const simNeural = neural(sim.ageYears);
  const refNeural = ref ? neural(ref.ageYears) : undefined;
  // All channels share one tile size: kernels are padded to the largest, and to the neural blur's reach.
  const reachPx = simNeural || refNeural ? Math.ceil((NEURAL_CONTRAST_REACH_DEG * 60) / pixelArcmin) : 0;
  const largest = Math.max(...sim.kernels.map((k) => k.size), ...(ref?.kernels ?? []).map((k) => k.size), 2 * reachPx + 1);
  const grid = (k: { kernel: Float32Array; size: number }, transfer?: (f: number) => number): OtfGrid => {
    const g = otfGridFromKernel(width, height, padKernel(k.kernel, k.size, largest), largest);
    return transfer ? scaleByRadialTransfer(g, transfer) : g;
  };
  return sim.kernels.map((k, c) => (ref ? relativeOtfGrid(grid(k, simNeural), grid(ref.kernels[c], refNeural)) : grid(k, simNeural)));
}

/** A linear RGB image through a 3 × 3 matrix (a new image). */
function transformedCopy(image: LinearRgb, m: Matrix3): LinearRgb {
  const out = createLinearRgb(image.width, image.height);
  transformPlanes(m, image.planes, out.planes);
  return out;
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
