/**
 * The main job as one call for every front end: frame bytes and a setup in, output files and the
 * report out. No argv, exit codes or HTTP here.
 */
import sharp from 'sharp';
import type { Setup } from './config/setup.js';
import { ConfigError, InputError } from './errors.js';
import { checkFramePixels, DEFAULT_MAX_FRAME_PIXELS, probeImage, decodeFrame } from './io/decode-frame.js';
import { encodeRgba8Png, linearToRgba8 } from './io/encode-png.js';
import type { OutputFile } from './io/write-outputs.js';
import { audienceCurves, frameFitsDisplay, frameScaleFor, lookAt, prepareProof, type ProofResult, type StageListener } from './pipeline.js';
import { renderCompare } from './render/compare.js';
import { renderDetailMap } from './render/detail-map.js';
import { renderPsfPicture } from './render/psf-picture.js';
import { projectionFor } from './geometry/projection.js';
import { describeVerdicts, LABEL_RULE, proofReport } from './report/build-report.js';
import { FRAME_MIN_LETTER_PX, READING_RESERVE } from './analysis/letter-size.js';
import { AUDIENCE_SOURCES } from './analysis/audience.js';
import { renderAudienceChart, renderReach } from './render/answers.js';
import { parseLabels } from './io/read-labels.js';
import { labelsFromSvg } from './io/read-svg-text.js';
import { decodeDepthMap, type DepthUnit } from './io/decode-depth.js';
import { CAUTION_SHORT, CAUTIONS } from './report/cautions.js';
import { renderReviewPage, type ReviewImage, type ReviewInput } from './render/review-page.js';
import { basename } from 'node:path';
import { EYEPROOF_VERSION } from './version.js';
import { resolveGazeSpec, type ResolvedGaze } from './geometry/gaze-spec.js';
import { countedJudgement, type Label, type LabelVerdict } from './analysis/labels.js';
import { detectTextRuns, type DetectedRun } from './analysis/detect-text.js';

export const PROOF_OUTPUT_NAMES = ['percept.png', 'detail-map.png', 'compare.png', 'compare-slide.png', 'reach.png', 'audience.png', 'psf.png', 'report.json', 'review.html'] as const;

/** Widest slide image, px (a 1080p slide). */
export const SLIDE_WIDTH_PX = 1920;

export interface ProofOutputs {
  files: OutputFile[];
  report: Record<string, unknown>;
  result: ProofResult;
  fixations?: FixationResult[];
  /** With several fixations: each one's percept, at most 960 px wide, as JPEG. */
  fixationPictures?: { given: string; jpeg: Uint8Array }[];
}

/** One line describing the setup and viewer, for captions. */
export function setupCaption(setup: Setup, result: ProofResult): string {
  const d = setup.display;
  const { eye, gazePx, display } = result.numbers;
  const where = d.kind === 'screen'
    ? `${(Math.hypot(d.widthMm, d.heightMm) / 25.4).toFixed(1)}″ ${d.resolutionPx.join('×')} screen at ${d.viewingDistanceMm} mm`
    : `headset ${d.fieldOfViewDeg.join('°×')}° ${d.resolutionPx.join('×')}, image at ${d.focalDistanceM.toFixed(2)} m`;
  const v = setup.viewer;
  const refraction = v.glasses === 'display' ? ', glasses for the display'
    : v.refraction.sphereD || v.refraction.cylinderD ? `, uncorrected ${v.refraction.sphereD.toFixed(2)} / ${v.refraction.cylinderD.toFixed(2)} × ${v.refraction.axisDeg}°` : '';
  const mode = setup.percept.mode === 'same-display'
    ? `shown for the reference viewer (${setup.percept.referenceViewerName ?? 'custom'}) on this display`
    : 'image on the retina';
  return `${setup.presetNames.display ?? 'custom display'}: ${where}, ${display.framePixelsPerDegreeAtGaze.toFixed(1)} px/° at gaze · viewer ${setup.presetNames.viewer ?? 'custom'}: ${v.ageYears} y${refraction}, ${v.eyes === 'both' ? 'both eyes' : `${v.eyes} eye`} · pupil ${eye.pupilDiameterMm.toFixed(1)} mm, defocus ${eye.defocusD.toFixed(2)} D, blur ${eye.blurCircleArcmin.toFixed(1)}′ · gaze (${gazePx[0]}, ${gazePx[1]}) px · ${mode}`;
}

export interface LabelsInput {
  file: string;
  text: string;
  /** For an SVG export: capital height per em by font family (lower case), for faces not bundled. */
  capHeightRatios?: Record<string, number>;
}

/** Labels from a labels file, or from the text of an SVG export (by the file's extension). */
export function readLabelsInput(input: LabelsInput, widthPx: number, heightPx: number): Label[] {
  return /\.svg$/i.test(input.file)
    ? labelsFromSvg(input.text, input.file, widthPx, heightPx, input.capHeightRatios ? { capHeightRatios: input.capHeightRatios } : {}).map(({ measured: _m, ...l }) => l)
    : parseLabels(input.text, input.file, widthPx, heightPx);
}

export interface DepthInput {
  file: string;
  bytes: Uint8Array;
  unit: DepthUnit;
}

export interface ProofInputs {
  onStage?: StageListener;
  /** Said once, on stderr by the command line: rescaling and other things the user should know. */
  onNote?: (note: string) => void;
  labels?: LabelsInput;
  depth?: DepthInput;
  maxPixels?: number;
  /** Where the viewer looks, in any of the forms of gaze-spec.ts; a list gives verdicts per fixation. */
  gaze?: string;
  /** Without a labels file, find the text runs in the frame (detect-text.ts) and judge those. */
  detectLabels?: boolean;
}

/** The verdicts at one fixation of a list. */
export interface FixationResult {
  given: string;
  gazePx: [number, number];
  outsideFrame: boolean;
  labels?: LabelVerdict[];
}

export async function proofFrame(frameBytes: Uint8Array, frameFile: string, givenSetup: Setup, setupSource: string, inputs: ProofInputs = {}): Promise<ProofOutputs> {
  const { onStage = () => {}, onNote = () => {}, labels: labelsInput, depth: depthInput, maxPixels = DEFAULT_MAX_FRAME_PIXELS } = inputs;
  let setup = givenSetup;
  onStage('decoding frame');
  // The header first: size and aspect are checked before the pixels are decoded.
  const probe = await probeImage(frameBytes, frameFile);
  checkFramePixels(probe.width, probe.height, frameFile, maxPixels);
  const placement = setup.frame.placementPx;
  if (placement) {
    const [dw, dh] = setup.display.resolutionPx;
    if (placement[0] + placement[2] > dw || placement[1] + placement[3] > dh || placement[2] < 1 || placement[3] < 1) {
      throw new ConfigError(setupSource, [{ path: 'frame.placementPx', received: placement, expected: `[x, y, width, height] inside the ${dw}×${dh} px display, with a width and height of at least 1 px` }]);
    }
  }
  if (!frameFitsDisplay(setup.display, probe.width, probe.height, placement)) {
    const [w, h] = placement ? [placement[2], placement[3]] : setup.display.resolutionPx;
    const what = placement ? `its placement (frame.placementPx) is ${w}×${h} display px` : `the display is ${w}×${h} px`;
    throw new InputError(frameFile, `is ${probe.width}×${probe.height} px but ${what} (aspect ratios differ by more than 1 %)`,
      placement ? 'Give frame.placementPx the size the frame takes on the display, or export the frame at that aspect ratio.'
        : `Export the frame at ${w}×${h} (or the same aspect ratio), give display.resolutionPx the frame's size, or place a crop with frame.placementPx.`);
  }
  const scale = frameScaleFor(setup, probe.width, probe.height);
  if (scale.note) onNote(scale.note);
  const { image, info } = await decodeFrame(frameBytes, frameFile, setup.frame.backgroundRgb, maxPixels);
  // The frame as 8-bit sRGB: text is found in it, and every picture shows it.
  const frameRgba = linearToRgba8(image);
  let labels: Label[] | undefined = labelsInput ? readLabelsInput(labelsInput, image.width, image.height) : undefined;
  let detected: DetectedRun[] | undefined;
  if (!labels && inputs.detectLabels) {
    onStage('finding text in the frame');
    detected = detectTextRuns(frameRgba, image.width, image.height);
    labels = detected;
    onNote(`no labels file, so ${detected.length} text runs found in the frame are judged (as "look" labels; text is not read back). Write them with \`eyeproof labels ${frameFile}\`, correct them and give roles, then pass the file with --labels.`);
  }
  const depthM = depthInput ? await decodeDepthMap(depthInput.bytes, depthInput.file, depthInput.unit, image.width, image.height) : undefined;
  let fixations: ResolvedGaze[] | undefined;
  if (inputs.gaze !== undefined) {
    const projection = projectionFor(setup.display, image.width, image.height, setup.frame.placementPx);
    const [dw, dh] = setup.display.resolutionPx;
    const displayCentrePx: [number, number] = [(dw / 2 - scale.placementPx[0]) * scale.framePxPerDisplayPx - 0.5, (dh / 2 - scale.placementPx[1]) * scale.framePxPerDisplayPx - 0.5];
    fixations = resolveGazeSpec(inputs.gaze, { frameSizePx: [image.width, image.height], projection, displayCentrePx, labels });
    const first = fixations[0].gazePx;
    setup = { ...setup, gaze: { ...setup.gaze, xPx: Math.round(first[0]), yPx: Math.round(first[1]) } };
    for (const f of fixations) if (f.outsideFrame) onNote(`the gaze ${f.given} (${Math.round(f.gazePx[0])},${Math.round(f.gazePx[1])} px) is outside the frame, on the display plane; the eye focuses ${setup.gaze?.focusDistanceM !== undefined ? `at ${setup.gaze.focusDistanceM} m (gaze.focusDistanceM)` : 'on that plane (set gaze.focusDistanceM for a road or a far scene)'}.`);
  }
  const prepared = prepareProof(image, setup, setupSource, { onStage, labels, depthM });
  const result = lookAt(prepared, { labels, onStage });

  onStage('rendering outputs');
  const caption = setupCaption(setup, result);
  const { width, height } = image;
  const perceptRgba = linearToRgba8(result.percept);
  const percept = await encodeRgba8Png(perceptRgba, width, height);
  const detail = renderDetailMap({
    width, height, frameRgba, smallestLetterPx: result.smallestLetterPx, arcminPerPx: result.viewMap.arcminPerPx, gazePx: result.numbers.gazePx,
    arcminPerPxAtGaze: result.numbers.display.arcminPerFramePxAtGaze, frameMinLetterPx: prepared.model.limits.minLetterPx ?? FRAME_MIN_LETTER_PX, labels: result.labels, title: `Smallest legible letter height — ${caption.split(' · ')[1] ?? ''}`,
  });
  const compare = renderCompare({
    width, height, frameRgba, perceptRgba, projection: projectionFor(setup.display, width, height, setup.frame.placementPx),
    gazePx: result.numbers.gazePx, caption, blindSpot: result.numbers.blindSpot, ...(result.labels ? { labels: result.labels } : {}),
    perceptTitle: setup.percept.mode === 'same-display'
      ? `What this viewer resolves, for the ${setup.percept.referenceViewerName ?? 'custom'} reference viewer on this screen (gaze fixed at the ring)`
      : 'What this viewer resolves, on the retina (gaze fixed at the ring)', caution: `eyeproof · rings at 2°, 5°, 10°, 20°, 30° from the gaze · ${CAUTION_SHORT}`,
  });
  const reach = renderReach({ width, height, frameRgba, gazePx: result.numbers.gazePx, labels: result.labels, caption, caution: `eyeproof · ${CAUTION_SHORT}` });
  const curves = audienceCurves(prepared);
  const audienceChart = renderAudienceChart({
    curves: curves.curves.map((c) => ({ name: c.kind === 'corrected' ? 'with distance glasses' : 'without glasses', points: [[0, 0], ...c.points, [Math.max(...c.points.map((p) => p[0])) * 1.15, 1]] as [number, number][] })),
    labels: (result.labels ?? []).filter((l) => l.role !== 'decorative').map((l) => ({ id: l.id, px: l.letterHeightPx })),
    arcminPerPx: curves.arcminPerPx,
    title: 'Share of the audience that reads text when looking at it, by capital height',
    caption: `${caption.split(' · ')[0]}. Audience: ${AUDIENCE_SOURCES}. Reading: ${READING_RESERVE}× the smallest legible letter; crowding and contrast aside. Nobody reads below ${READING_RESERVE * (prepared.model.limits.minLetterPx ?? FRAME_MIN_LETTER_PX)} px: there the display's pixels, not the eye, are the limit.`,
    caution: CAUTION_SHORT,
  });
  const f = result.optics.figures;
  const psf = renderPsfPicture(result.optics.channelPsfs, result.optics.grid, f,
    `pupil ${result.numbers.eye.pupilDiameterMm.toFixed(1)} mm · white-light MTF at 10/30 cpd ${f.mtfAt10Cpd.toFixed(2)}/${f.mtfAt30Cpd.toFixed(2)} · Strehl at 555 nm ${f.strehlRatio.toFixed(3)} · 50/80 % of the light within ${f.encircledEnergy50DiameterArcmin.toFixed(1)}′/${f.encircledEnergy80DiameterArcmin.toFixed(1)}′ · in focus: ${f.focusWavelengthNm.toFixed(0)} nm`);
  // Each further fixation is one cheap gaze step on the prepared proof (its arrays reused); with
  // several, each percept is kept small for the review page to step through.
  let fixationResults: FixationResult[] | undefined;
  const fixationPictures: { given: string; jpeg: Uint8Array }[] = [];
  if (fixations) {
    fixationResults = [];
    let scratch: ProofResult | undefined;
    for (const [i, f] of fixations.entries()) {
      const gazePx: [number, number] = [Math.round(f.gazePx[0]), Math.round(f.gazePx[1])];
      const look = i === 0 ? result : (scratch = lookAt(prepared, { ...(labels ? { labels } : {}), gazePx, ...(scratch ? { reuse: scratch } : {}) }));
      fixationResults.push({ given: f.given, gazePx, outsideFrame: f.outsideFrame, ...(look.labels ? { labels: look.labels } : {}) });
      if (fixations.length > 1) fixationPictures.push({ given: f.given, jpeg: await smallJpeg(i === 0 ? perceptRgba : linearToRgba8(look.percept), width, height) });
    }
  }
  const report = proofReport(setup, result, { file: frameFile, info }, [...PROOF_OUTPUT_NAMES], {
    labelsFile: labelsInput?.file ?? (detected ? '(found in the frame: eyeproof labels)' : undefined), ...(depthInput ? { depthFile: { file: depthInput.file, unit: depthInput.unit } } : {}), frameScale: scale,
    ...(fixationResults ? { fixations: fixationResults } : {}),
  });
  const comparePng = await encodeRgba8Png(compare.rgba, compare.width, compare.height);
  const detailPng = await encodeRgba8Png(detail.rgba, detail.width, detail.height);
  const reachPng = await encodeRgba8Png(reach.rgba, reach.width, reach.height);
  const audiencePng = await encodeRgba8Png(audienceChart.rgba, audienceChart.width, audienceChart.height);
  const compareSlide = await slideSized(compare);
  const review = renderReviewPage({
    title: `eyeproof review — ${basename(frameFile)}`,
    caption,
    frame: { png: await encodeRgba8Png(frameRgba, width, height), width, height },
    percept: { png: percept, width, height },
    perceptTitle: setup.percept.mode === 'same-display' ? `what this viewer resolves, shown for the ${setup.percept.referenceViewerName ?? 'custom'} reference viewer` : 'what this viewer resolves, on the retina',
    detailMap: await slideSized(detail),
    reach: await slideSized(reach),
    audience: { png: audiencePng, width: audienceChart.width, height: audienceChart.height },
    compare: compareSlide,
    ...(result.labels ? reviewLabels(result.labels) : {}),
    ...(fixationResults && fixationResults.length > 1 ? { fixations: fixationResults.map((f, i) => ({ given: f.given, gazePx: f.gazePx, summary: f.labels ? describeVerdicts(f.labels) : '', ...(fixationPictures[i] ? { jpeg: fixationPictures[i].jpeg } : {}) })) } : {}),
    facts: reviewFacts(setup, result),
    models: ((report.models ?? []) as { stage: string; name: string; source: string }[]).map((m) => ({ stage: m.stage, name: m.name, source: m.source })),
    cautions: CAUTIONS,
    generatedBy: `eyeproof ${EYEPROOF_VERSION} · ${basename(frameFile)} · ${setupSource}`,
  });
  const files: OutputFile[] = [
    { name: 'percept.png', bytes: percept },
    { name: 'detail-map.png', bytes: detailPng },
    { name: 'compare.png', bytes: comparePng },
    { name: 'compare-slide.png', bytes: compareSlide.png },
    { name: 'reach.png', bytes: reachPng },
    { name: 'audience.png', bytes: audiencePng },
    { name: 'psf.png', bytes: await encodeRgba8Png(psf.rgba, psf.width, psf.height) },
    { name: 'report.json', bytes: `${JSON.stringify(report, null, 2)}\n` },
    { name: 'review.html', bytes: review },
  ];
  return { files, report, result, ...(fixationResults ? { fixations: fixationResults } : {}), ...(fixationPictures.length ? { fixationPictures } : {}) };
}

/** The text runs of a frame (detect-text.ts), decoded and checked as a proof would. */
export async function detectLabelsInFrame(bytes: Uint8Array, file: string, maxPixels = DEFAULT_MAX_FRAME_PIXELS): Promise<{ runs: DetectedRun[]; width: number; height: number }> {
  const probe = await probeImage(bytes, file);
  checkFramePixels(probe.width, probe.height, file, maxPixels);
  const { image } = await decodeFrame(bytes, file, [0, 0, 0], maxPixels);
  return { runs: detectTextRuns(linearToRgba8(image), image.width, image.height), width: image.width, height: image.height };
}

/** A picture scaled down (never up) to at most SLIDE_WIDTH_PX wide, for slides, as PNG with its size. */
async function slideSized(picture: { rgba: Uint8ClampedArray; width: number; height: number }): Promise<ReviewImage> {
  const width = Math.min(SLIDE_WIDTH_PX, picture.width);
  const { data, info } = await sharp(Buffer.from(picture.rgba.buffer, picture.rgba.byteOffset, picture.rgba.byteLength), { raw: { width: picture.width, height: picture.height, channels: 4 } })
    .resize({ width, kernel: 'lanczos3' }).removeAlpha().png({ compressionLevel: 6 }).toBuffer({ resolveWithObject: true });
  return { png: new Uint8Array(data), width: info.width, height: info.height };
}


/** The label table of the review page: the same verdicts as the report, worst first. */
function reviewLabels(verdicts: readonly LabelVerdict[]): Pick<ReviewInput, 'labels' | 'labelRule' | 'labelSummary'> {
  const order = { 'not legible': 0, legible: 1, readable: 2, 'not judged': 3 } as const;
  const pct = (v: number): string => `${Math.round(100 * v)} %`;
  return {
    labelSummary: `${verdicts.length} labels, each judged by its role: ${describeVerdicts(verdicts)}.`,
    labelRule: LABEL_RULE,
    labels: [...verdicts].sort((a, b) => order[a.verdict] - order[b.verdict]).map((v) => {
      const j = countedJudgement(v);
      return {
        id: v.id, text: v.text, role: v.role, verdict: v.verdict,
        limitedBy: v.role === 'decorative' ? '' : j.limitedBy === 'size' ? `size (${j.sizeLimitedBy})` : j.limitedBy,
        margins: v.role === 'decorative' ? '' : j.limits.map((l) => `${l.name} ${l.margin.toFixed(2)}`).join(', '),
        fix: v.fix?.summary ?? '',
        audience: v.audience ? `${pct(v.audience.uncorrected)} without glasses, ${pct(v.audience.corrected)} with distance glasses` : '',
      };
    }),
  };
}

/** Setup and viewer facts for the review page. */
function reviewFacts(setup: Setup, result: ProofResult): [string, string][] {
  const n = result.numbers;
  const d = setup.display;
  const v = setup.viewer;
  return [
    ['display', d.kind === 'screen' ? `${setup.presetNames.display ?? 'custom'}: ${d.resolutionPx.join('×')} px, ${d.widthMm.toFixed(0)} × ${d.heightMm.toFixed(0)} mm at ${d.viewingDistanceMm} mm` : `${setup.presetNames.display ?? 'custom'}: headset ${d.fieldOfViewDeg.join('° × ')}°, ${d.resolutionPx.join('×')} px per eye, image at ${d.focalDistanceM.toFixed(2)} m`],
    ['pixels per degree at the gaze', `${n.display.pixelsPerDegreeAtGaze.toFixed(1)} (display), ${n.display.framePixelsPerDegreeAtGaze.toFixed(1)} (frame)`],
    ['viewer', `${setup.presetNames.viewer ?? 'custom'}: ${v.ageYears} years, ${v.eyes === 'both' ? 'both eyes' : `${v.eyes} eye`}, refraction ${v.refraction.sphereD.toFixed(2)} / ${v.refraction.cylinderD.toFixed(2)} × ${v.refraction.axisDeg}°${v.glasses === 'display' ? ', glasses for the display' : ''}`],
    ['gaze', `${n.gazePx.join(', ')} px of the frame`],
    ['light', `${n.light.adaptingLuminanceCdM2.toFixed(1)} cd/m² (${n.light.adaptingLuminanceFrom}), ${n.light.regime}`],
    ['eye', `pupil ${n.eye.pupilDiameterMm.toFixed(1)} mm, defocus ${n.eye.defocusD.toFixed(2)} D, accommodation ${n.eye.accommodationAmplitudeD.toFixed(1)} D, smallest letter at the gaze ${n.eye.smallestLetterArcminAtGaze.toFixed(1)}′`],
    ['optics', `MTF ${n.optics.mtfAt10Cpd.toFixed(2)} at 10 cpd, ${n.optics.mtfAt30Cpd.toFixed(2)} at 30 cpd; Strehl ${n.optics.strehlRatio.toFixed(3)}; ${(100 * n.optics.scatteredFraction1To100Deg).toFixed(1)} % stray light beyond 1°`],
    ['percept', setup.percept.mode === 'same-display' ? `shown on this display for the ${setup.percept.referenceViewerName ?? 'custom'} reference viewer` : 'the image on the retina'],
  ];
}

/** A percept (8-bit RGBA) at most 960 px wide as JPEG, for pages that step through fixations. */
async function smallJpeg(rgba: Uint8ClampedArray, width: number, height: number): Promise<Uint8Array> {
  return new Uint8Array(await sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width, height, channels: 4 } })
    .resize({ width: Math.min(960, width), kernel: 'lanczos3' }).removeAlpha().jpeg({ quality: 85 }).toBuffer());
}
