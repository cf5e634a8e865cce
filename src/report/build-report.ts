/** report.json: stable keys with units in their names. */
import type { Setup } from '../config/setup.js';
import type { FrameInfo } from '../io/decode-frame.js';
import { CYCLES_PER_LETTER, DEFOCUS_MAR_ARCMIN_PER_MM_D, OPTICAL_THRESHOLD, READING_RESERVE } from '../analysis/letter-size.js';
import type { DerivedNumbers, ProofResult } from '../pipeline.js';
import { RESPONSE_AT_CUTOFF } from '../retina/variable-blur.js';
import type { LabelVerdict, Verdict } from '../analysis/labels.js';
import { CAUTIONS } from './cautions.js';

export const REPORT_VERSION = 1;

export interface ModelEntry {
  stage: string;
  name: string;
  summary: string;
  source: string;
  status: 'published' | 'proposal';
}

export function modelsUsed(setup: Setup, acuity: { name: string; summary: string; source: string }): ModelEntry[] {
  const pupil: ModelEntry[] = setup.viewer.pupilDiameterMm === 'auto'
    ? [{ stage: 'pupil', name: 'watson-yellott-2012', summary: 'unified pupil diameter from luminance, field area, age and eyes', source: 'Watson & Yellott (2012), J Vision 12(10):12', status: 'published' }]
    : [];
  return [
    ...pupil,
    { stage: 'accommodation', name: 'hofstetter-1950-mean', summary: 'mean amplitude 18.5 − 0.30·age D', source: 'Hofstetter (1950)', status: 'published' },
    { stage: 'defocus', name: 'residual-defocus', summary: 'demand 1/d + spherical equivalent, supplied within 0…amplitude, no lag; cylinder adds as blur strength', source: 'standard optics; blur strength after Thibos et al. (2004)', status: 'proposal' },
    { stage: 'optics', name: 'wavefront-psf', summary: 'PSF = |FFT(P·exp(i2πW/λ))|² from ANSI Zernike terms: the viewer’s residual defocus and cylinder (power vectors), typical higher-order aberrations, 3 wavelengths per primary with the eye’s LCA; binned to frame pixels and applied by tiled FFT at the gaze’s pixel scale', source: 'Goodman (Fourier optics); ANSI Z80.28; Thibos et al. (2004) power vectors; Thibos et al. (1992) chromatic eye; Salmon & van de Pol (2006)', status: 'published' },
    { stage: 'optics', name: 'cie-disability-glare', summary: `stray light beyond 1° as a veil: 10/θ³ + [5/θ² + 0.1p/θ][1 + (A/62.5)⁴] + 0.0025p, convolved at reduced resolution; the scattered fraction comes out of the core (age ${setup.viewer.ageYears}, p = ${setup.viewer.eyePigmentation})`, source: 'CIE 146/147:2002, CIE 180:2010; applied from 1° (our proposal)', status: 'published' },
    ...(setup.display.kind === 'headset' && setup.display.lensSharpness ? [{ stage: 'optics', name: 'headset-lens-blur', summary: 'the lens MTF50 by field angle, interpolated, as a Gaussian blur applied before the eye', source: 'setup; Gaussian form our simplification', status: 'proposal' as const }] : []),
    ...(setup.viewer.wavefront ? [{ stage: 'optics', name: 'measured-wavefront', summary: `the viewer's measured Zernike coefficients over ${setup.viewer.wavefront.pupilDiameterMm} mm replace the typical eye`, source: 'setup (ANSI Z80.28 order)', status: 'published' as const }] : []),
    ...(setup.viewer.wavefront ? [] : [{ stage: 'optics', name: 'typical-eye', summary: 'SA 0.13 µm, vertical coma and trefoil 0.2145 µm each (higher-order RMS 0.33 µm) at 6 mm (scaled r^n); residual lag 0.3 D and cylinder 0.4 D calibrated to Watson (2013); focus for 570 nm; band weights per primary', source: 'Salmon & van de Pol (2006); calibration against Watson (2013)', status: 'proposal' as const }]),
    { stage: 'retina', name: acuity.name, summary: acuity.summary, source: acuity.source, status: 'published' },
    { stage: 'retina', name: 'opponent-channels', summary: 'Smith & Pokorny cone fundamentals; A = L + M, RG = L − k·M, BY = S − k′·(L + M) with white at zero chroma', source: 'Smith & Pokorny (1975); weights our design', status: 'proposal' },
    { stage: 'retina', name: 'colour-loss', summary: `chromatic cutoffs f0·2.3/(s·e + 2.3): red–green ${setup.models.colourLoss.redGreenFovealCutoffCpd} cpd, s = ${setup.models.colourLoss.redGreenEccentricityScale}; blue–yellow ${setup.models.colourLoss.blueYellowFovealCutoffCpd} cpd, s = ${setup.models.colourLoss.blueYellowEccentricityScale}; no blue–yellow detail under 25′ at the gaze; chromaticity luminance-weighted`, source: 'built on Mullen (1991), Mullen & Kingdom (2002), Mullen, Sakurai & Chu (2005), Hansen et al. (2009), Williams, MacLeod & Hayhoe (1981)', status: 'proposal' },
    { stage: 'light', name: 'cie-191-mesopic', summary: 'photopic > 5 cd/m², scotopic < 0.005 cd/m²; cone share = mesopic coefficient m', source: 'CIE 191:2010', status: 'published' },
    { stage: 'light', name: 'scotopic-luminance', summary: 'rod signal Y·[1.33(1 + (Y+Z)/X) − 1.68]', source: 'Larson, Rushmeier & Piatko (1997), IEEE TVCG 3(4)', status: 'published' },
    { stage: 'retina', name: 'rod-vision', summary: 'colourless rod signal with a 3 cpd cutoff, 0.25 cpd in the central 1.25° rod-free zone', source: 'Curcio et al. (1990) rod-free zone; 3 cpd from memory', status: 'proposal' },
    ...(setup.viewer.eyes === 'both' ? [] : [{ stage: 'retina', name: 'blind-spot', summary: 'optic disc 15° temporal, 1.5° below, 5.5° × 7.5°, filled in from its surroundings', source: 'encyclopaedic summary (checked); Rohrschneider (2004) from memory', status: 'published' as const }]),
    { stage: 'retina', name: 'pyramid-variable-blur', summary: `Gaussian pyramid blended per pixel so detail at the local cutoff keeps ${RESPONSE_AT_CUTOFF * 100} % of its contrast`, source: 'Burt & Adelson (1983) pyramid; blending in the spirit of Geisler & Perry (1998)', status: 'proposal' },
    { stage: 'legibility', name: 'letter-size', summary: `letter = ${CYCLES_PER_LETTER} cycles of the finer of the retinal cutoff and the frequency where the mean MTF falls to ${OPTICAL_THRESHOLD}; defocus adds 5 × ${DEFOCUS_MAR_ARCMIN_PER_MM_D}′ per mm per D in quadrature; reading needs ${READING_RESERVE}× threshold`, source: 'common practice (5′ letter ↔ 30 cpd); Smith (1982) from memory; Whittaker & Lovie-Kitchin (1993)', status: 'proposal' },
  ];
}

const round = (v: number, digits = 4): number => Number(v.toPrecision(digits + 2));

/** Rounds every number in a JSON-like value to keep the report readable and stable. */
export function roundNumbers<T>(value: T): T {
  if (typeof value === 'number') return (Number.isInteger(value) ? value : round(value)) as T;
  if (Array.isArray(value)) return value.map(roundNumbers) as T;
  if (value && typeof value === 'object') return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, roundNumbers(v)])) as T;
  return value;
}

export function numbersReport(setup: Setup, numbers: DerivedNumbers, acuity: { name: string; summary: string; source: string }): Record<string, unknown> {
  const { display, eye } = numbers;
  return roundNumbers({
    reportVersion: REPORT_VERSION,
    cautions: CAUTIONS,
    presets: setup.presetNames,
    display: {
      ...display,
      ...(setup.display.kind === 'screen'
        ? { widthMm: setup.display.widthMm, heightMm: setup.display.heightMm, viewingDistanceMm: setup.display.viewingDistanceMm, eyeOffsetMm: setup.display.eyeOffsetMm }
        : { lens: setup.display.lens, lensSharpness: setup.display.lensSharpness, opticalTransmission: setup.display.opticalTransmission }),
      peakLuminanceCdM2: setup.display.peakLuminanceCdM2,
      blackLuminanceCdM2: setup.display.blackLuminanceCdM2,
    },
    viewer: setup.viewer,
    gaze: { xPx: numbers.gazePx[0], yPx: numbers.gazePx[1] },
    light: { ...numbers.light, adaptingFieldDeg: setup.light.adaptingFieldDeg },
    ...(numbers.blindSpot ? { blindSpot: numbers.blindSpot } : {}),
    eye,
    optics: numbers.optics,
    acuity: numbers.acuity,
    models: modelsUsed(setup, acuity),
  });
}

/** Counts of label verdicts, for summaries. */
export function labelSummary(verdicts: readonly LabelVerdict[], view: 'fromGaze' | 'whenFixated'): Record<Verdict, number> {
  const counts: Record<Verdict, number> = { readable: 0, legible: 0, 'not legible': 0 };
  for (const v of verdicts) counts[v[view].verdict]++;
  return counts;
}

export function proofReport(setup: Setup, result: ProofResult, frame: { file: string; info: FrameInfo }, outputs: string[], labelsFile?: string, depthFile?: { file: string; unit: string }): Record<string, unknown> {
  const base = numbersReport(setup, result.numbers, result.models.acuity);
  if (result.depth) {
    (base.models as ModelEntry[]).push({ stage: 'optics', name: 'depth-of-field', summary: 'extra defocus 1/d − 1/d_gaze per pixel from the depth map, as a Gaussian of σ = blur disk / 4 in quadrature with the PSF at the gaze', source: 'standard optics; Gaussian form our simplification', status: 'proposal' });
  }
  let minLetter = Infinity;
  for (const v of result.smallestLetterPx) if (v < minLetter) minLetter = v;
  return {
    reportVersion: base.reportVersion,
    cautions: base.cautions,
    frame: { file: frame.file, ...frame.info },
    ...base,
    detailMap: roundNumbers({ smallestLetterPxAtGaze: result.numbers.acuity[0]?.smallestLetterPx, smallestLetterPxMinimum: minLetter }),
    ...(result.depth && depthFile ? { depth: roundNumbers({ ...depthFile, ...result.depth }) } : {}),
    ...(result.labels ? {
      labels: roundNumbers({
        file: labelsFile,
        rule: `legible: capital height ≥ the smallest legible letter over the whole box and mean letter advance ≥ the critical spacing of crowding (Song, Levi & Pelli 2014, Eq. 14); readable: legible with ${READING_RESERVE}× size (Whittaker & Lovie-Kitchin 1993). fromGaze: without moving the eyes; whenFixated: looking straight at the label`,
        summaryFromGaze: labelSummary(result.labels, 'fromGaze'),
        summaryWhenFixated: labelSummary(result.labels, 'whenFixated'),
        verdicts: result.labels,
      }),
    } : {}),
    outputs,
  };
}
