/**
 * The main job as one call for every front end: frame bytes and a setup in, output files and the
 * report out. No argv, exit codes or HTTP here.
 */
import type { Setup } from './config/setup.js';
import { InputError } from './errors.js';
import { checkFramePixels, DEFAULT_MAX_FRAME_PIXELS, probeImage, decodeFrame } from './io/decode-frame.js';
import { encodeRgba8Png, linearToRgba8 } from './io/encode-png.js';
import type { OutputFile } from './io/write-outputs.js';
import { frameFitsDisplay, runProof, type ProofResult, type StageListener } from './pipeline.js';
import { renderCompare } from './render/compare.js';
import { renderDetailMap } from './render/detail-map.js';
import { renderPsfPicture } from './render/psf-picture.js';
import { projectionFor } from './geometry/projection.js';
import { proofReport } from './report/build-report.js';
import { FRAME_MIN_LETTER_PX } from './analysis/letter-size.js';
import { parseLabels } from './io/read-labels.js';
import { decodeDepthMap, type DepthUnit } from './io/decode-depth.js';
import { CAUTION_SHORT } from './report/cautions.js';

export const PROOF_OUTPUT_NAMES = ['percept.png', 'detail-map.png', 'compare.png', 'psf.png', 'report.json'] as const;

export interface ProofOutputs {
  files: OutputFile[];
  report: Record<string, unknown>;
  result: ProofResult;
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
}

export interface DepthInput {
  file: string;
  bytes: Uint8Array;
  unit: DepthUnit;
}

export async function proofFrame(frameBytes: Uint8Array, frameFile: string, setup: Setup, setupSource: string, onStage: StageListener = () => {}, labelsInput?: LabelsInput, depthInput?: DepthInput, maxPixels = DEFAULT_MAX_FRAME_PIXELS): Promise<ProofOutputs> {
  onStage('decoding frame');
  // The header first: size and aspect are checked before the pixels are decoded.
  const probe = await probeImage(frameBytes, frameFile);
  checkFramePixels(probe.width, probe.height, frameFile, maxPixels);
  if (!frameFitsDisplay(setup.display, probe.width, probe.height)) {
    const [w, h] = setup.display.resolutionPx;
    throw new InputError(frameFile, `is ${probe.width}×${probe.height} px but the display is ${w}×${h} px (aspect ratios differ by more than 1 %)`,
      `Export the frame at ${w}×${h} (or the same aspect ratio), or give display.resolutionPx the frame's size in the setup.`);
  }
  const { image, info } = await decodeFrame(frameBytes, frameFile, setup.frame.backgroundRgb, maxPixels);
  const labels = labelsInput ? parseLabels(labelsInput.text, labelsInput.file, image.width, image.height) : undefined;
  const depthM = depthInput ? await decodeDepthMap(depthInput.bytes, depthInput.file, depthInput.unit, image.width, image.height) : undefined;
  const result = runProof(image, setup, setupSource, { onStage, labels, depthM });

  onStage('rendering outputs');
  const caption = setupCaption(setup, result);
  const { width, height } = image;
  const frameRgba = linearToRgba8(image);
  const perceptRgba = linearToRgba8(result.percept);
  const percept = await encodeRgba8Png(perceptRgba, width, height);
  const detail = renderDetailMap({
    width, height, frameRgba, smallestLetterPx: result.smallestLetterPx, gazePx: result.numbers.gazePx,
    arcminPerPxAtGaze: result.numbers.display.arcminPerFramePxAtGaze, frameMinLetterPx: FRAME_MIN_LETTER_PX, labels: result.labels, title: `Smallest legible letter height — ${caption.split(' · ')[1] ?? ''}`,
  });
  const compare = renderCompare({
    width, height, frameRgba, perceptRgba, projection: projectionFor(setup.display, width, height),
    gazePx: result.numbers.gazePx, caption, blindSpot: result.numbers.blindSpot,
    perceptTitle: setup.percept.mode === 'same-display'
      ? `What this viewer resolves, for the ${setup.percept.referenceViewerName ?? 'custom'} reference viewer on this screen (gaze fixed at the ring)`
      : 'What this viewer resolves, on the retina (gaze fixed at the ring)', caution: `eyeproof · rings at 2°, 5°, 10°, 20°, 30° from the gaze · ${CAUTION_SHORT}`,
  });
  const f = result.optics.figures;
  const psf = renderPsfPicture(result.optics.channelPsfs, result.optics.grid, f,
    `pupil ${result.numbers.eye.pupilDiameterMm.toFixed(1)} mm · white-light MTF at 10/30 cpd ${f.mtfAt10Cpd.toFixed(2)}/${f.mtfAt30Cpd.toFixed(2)} · Strehl at 555 nm ${f.strehlRatio.toFixed(3)} · 50/80 % of the light within ${f.encircledEnergy50DiameterArcmin.toFixed(1)}′/${f.encircledEnergy80DiameterArcmin.toFixed(1)}′ · in focus: ${f.focusWavelengthNm.toFixed(0)} nm`);
  const report = proofReport(setup, result, { file: frameFile, info }, [...PROOF_OUTPUT_NAMES], labelsInput?.file, depthInput ? { file: depthInput.file, unit: depthInput.unit } : undefined);
  const files: OutputFile[] = [
    { name: 'percept.png', bytes: percept },
    { name: 'detail-map.png', bytes: await encodeRgba8Png(detail.rgba, detail.width, detail.height) },
    { name: 'compare.png', bytes: await encodeRgba8Png(compare.rgba, compare.width, compare.height) },
    { name: 'psf.png', bytes: await encodeRgba8Png(psf.rgba, psf.width, psf.height) },
    { name: 'report.json', bytes: `${JSON.stringify(report, null, 2)}\n` },
  ];
  return { files, report, result };
}
