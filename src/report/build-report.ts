/** report.json: stable keys with units in their names. */
import type { Setup } from '../config/setup.js';
import type { FrameInfo } from '../io/decode-frame.js';
import { CYCLES_PER_LETTER, OPTICAL_CYCLES_PER_LETTER, OPTICAL_THRESHOLD_MODULATION, READING_RESERVE } from '../analysis/letter-size.js';
import type { DerivedNumbers, ProofResult } from '../pipeline.js';
import { countedJudgement, LIMIT_SOURCES, type LabelVerdict, type Verdict } from '../analysis/labels.js';
import type { FrameScale } from '../pipeline.js';
import type { FixationResult } from '../proof.js';
import { NEURAL_CONTRAST_LOG_PER_YEAR, NEURAL_CONTRAST_ONSET_YEARS, neuralAcuityFactor } from '../retina/neural-ageing.js';
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
  const { colourLoss } = setup.models;
  const reference = setup.percept.referenceViewerName ?? 'custom';
  return [
    ...pupil,
    { stage: 'accommodation', name: 'hofstetter-1950-mean', summary: 'mean amplitude 18.5 − 0.30·age D', source: 'Hofstetter (1950)', status: 'published' },
    { stage: 'defocus', name: 'sustained-accommodation', summary: `demand 1/d + spherical equivalent; the eye supplies at most ${(100 * (1 - setup.models.accommodationReserve)).toFixed(0)} % of its amplitude in sustained viewing; the rest of the demand is defocus`, source: 'standard optics; reserve: common practice', status: 'proposal' },
    { stage: 'optics', name: 'wavefront-psf', summary: 'PSF = |FFT(P·exp(i2πW/λ))|² from ANSI Zernike terms: the viewer’s cylinder and residual defocus (power vectors), the eye’s longitudinal chromatic aberration, three wavelengths per display primary (Gaussian emission bands of the sRGB hues, luminance-weighted), focus where the white-light luminance image is best; binned to frame pixels and applied by tiled FFT', source: 'Goodman (Fourier optics); ANSI Z80.28; Thibos et al. (2004) power vectors; Thibos et al. (1992) chromatic eye', status: 'published' },
    ...(setup.viewer.wavefront
      ? [{ stage: 'optics', name: 'measured-wavefront', summary: `the viewer's measured Zernike coefficients over ${setup.viewer.wavefront.pupilDiameterMm} mm replace the typical eye`, source: 'setup (ANSI Z80.28 order)', status: 'published' as const }]
      : [{ stage: 'optics', name: 'typical-eye', summary: `higher-order aberrations of the mean eye at age ${setup.viewer.ageYears}: spherical aberration, with coma and trefoil as an orientation-free factor on the MTF`, source: 'Salmon & van de Pol (2006) at 6 mm; growth with age Berrio, Tabernero & Artal (2010)', status: 'published' as const }]),
    { stage: 'optics', name: 'ocular-scatter', summary: 'short-angle scatter exp(−f/f_s), f_s fitted so the default eye’s white-light MTF lies within 0.07 of Rovamo et al. (1998) at 2–6 mm; widening with age as IJspeert’s', source: 'form and age term: IJspeert, van den Berg & Spekreijse (1993); target: Rovamo, Kukkonen & Mustonen (1998)', status: 'proposal' },
    { stage: 'optics', name: 'ageing-lens', summary: `lens density by age on the CIE 170-1:2006 2° cone fundamentals, as a colour matrix on the display primaries relative to ${setup.percept.mode === 'same-display' ? `the reference viewer (${setup.percept.referenceViewer.ageYears} y)` : 'the 32-year-old standard observer'}; shown ${setup.models.lensColour === 'received' ? 'as the cones receive it (whites yellow)' : 'after adapting to the display white'}`, source: 'Pokorny, Smith & Lutze (1987); CIE 170-1:2006; Stockman & Sharpe (2000)', status: 'published' },
    { stage: 'optics', name: 'off-axis-optics', summary: 'the MTF falls off-axis by the ratio of Navarro et al.’s fits at the eccentricity to the foveal one, applied as a Gaussian matched at half the local cutoff', source: 'Navarro, Artal & Williams (1993), JOSA A 10:201', status: 'proposal' },
    { stage: 'optics', name: 'cie-disability-glare', summary: `stray light beyond 1° integrated over the frame and a surround of ${(setup.light.surroundLuminanceCdM2 ?? setup.display.blackLuminanceCdM2).toFixed(3)} cd/m²: 10/θ³ + [5/θ² + 0.1p/θ][1 + (A/62.5)⁴] + 0.0025p (age ${setup.viewer.ageYears}, p = ${setup.viewer.eyePigmentation}); the scattered share comes out of the core`, source: 'CIE 146/147:2002, CIE 180:2010; applied from 1° (our proposal)', status: 'published' },
    ...(setup.display.kind === 'headset' && setup.display.lensSharpness ? [{ stage: 'optics', name: 'headset-lens-blur', summary: 'the lens MTF50 by field angle, interpolated, as a Gaussian blur applied before the eye (retinal-image percepts only: a same-display viewer looks through the lens too)', source: 'setup; Gaussian form our simplification', status: 'proposal' as const }] : []),
    setup.percept.mode === 'same-display'
      ? { stage: 'percept', name: 'same-display', summary: `what to show on this display so that the reference viewer (${reference}, ${setup.percept.referenceViewer.ageYears} y) sees what the simulated viewer sees: the simulated eye's optical transfer over the reference eye's (modulus at most 1) and only the stray light it adds; the retina's losses in full, since the reference viewer looks at each part directly`, source: 'after Peli (1996), JOSA A 13(6):1131', status: 'proposal' }
      : { stage: 'percept', name: 'retinal-image', summary: 'the image on the simulated retina: the eye’s optics, stray light and the retina’s losses in full', source: 'standard optics', status: 'published' },
    { stage: 'retina', name: acuity.name, summary: acuity.summary, source: acuity.source, status: 'published' },
    { stage: 'retina', name: 'neural-ageing', summary: `beyond the optics and media: contrast above a few cpd kept as t + (1 − t)·exp(−f²/8), t = 10^−(${NEURAL_CONTRAST_LOG_PER_YEAR}·(age − ${NEURAL_CONTRAST_ONSET_YEARS})) after ${NEURAL_CONTRAST_ONSET_YEARS} years; the retina's cutoff scaled by a factor by age (${neuralAcuityFactor(setup.viewer.ageYears).toFixed(3)} at ${setup.viewer.ageYears})`, source: 'fitted to Elliott, Yang & Whitaker (1995) acuity and to the contrast loss of Owsley, Sekuler & Siemsen (1983) and Ashraf et al. (2020)', status: 'proposal' },
    { stage: 'retina', name: 'sharp-sampling-lowpass', summary: 'per pixel, a low-pass keeping 5 % at the local cutoff and about 0.8 at half of it (target exp(ln 0.05·(f/f_c)⁴)), nothing where the cutoff exceeds the frame’s pixels; a half-octave ladder of binomial-pyramid blurs with fitted coefficients', source: 'our design (scripts/fit-retina-filter.ts); pyramid after Burt & Adelson (1983)', status: 'proposal' },
    { stage: 'retina', name: 'opponent-channels', summary: 'Smith & Pokorny cone fundamentals; A = L + M, RG = L − k·M, BY = S − k′·(L + M) with white at zero chroma', source: 'Smith & Pokorny (1975); weights our design', status: 'proposal' },
    { stage: 'retina', name: 'colour-loss', summary: `colour thresholds rising with frequency as Geisler & Perry’s, the eccentricity term ${colourLoss.redGreenEccentricityScale}× for red–green and ${colourLoss.blueYellowEccentricityScale}× for blue–yellow; foveal cutoffs ${colourLoss.redGreenFovealCutoffCpd} and ${colourLoss.blueYellowFovealCutoffCpd} cpd; Gaussian-like low-pass per channel, bound to the percept's luminance edges by a local regression of colour on luminance (our proposal, after the guided filter); no hue the frame lacks nearby; no blue–yellow detail under 25′ at the gaze`, source: 'built on Geisler & Perry (1998), He, Sun & Tang (2010), Mullen (1985, 1991), Mullen & Kingdom (2002), Mullen, Sakurai & Chu (2005), Hansen et al. (2009), Williams, MacLeod & Hayhoe (1981)', status: 'proposal' },
    { stage: 'light', name: 'cie-191-mesopic', summary: 'photopic > 5 cd/m², scotopic < 0.005 cd/m²; cone share = mesopic coefficient m', source: 'CIE 191:2010', status: 'published' },
    { stage: 'light', name: 'scotopic-luminance', summary: 'rod signal Y·[1.33(1 + (Y+Z)/X) − 1.68]', source: 'Larson, Rushmeier & Piatko (1997), IEEE TVCG 3(4)', status: 'published' },
    { stage: 'retina', name: 'rod-vision', summary: 'colourless rod signal with a 3 cpd cutoff, 0.25 cpd in the central 1.25° rod-free zone', source: 'Curcio et al. (1990) rod-free zone; 3 cpd from memory', status: 'proposal' },
    ...(setup.viewer.eyes === 'both' ? [] : [{ stage: 'retina', name: 'blind-spot', summary: 'optic disc 15° temporal, 1.5° below, 5.5° × 7.5°, filled in from its surroundings', source: 'encyclopaedic summary (checked); Rohrschneider (2004) from memory', status: 'published' as const }]),
    { stage: 'legibility', name: 'letter-size', summary: `smallest letter = neural and optical limits added in quadrature: ${CYCLES_PER_LETTER} cycles per letter at the acuity model's letter factor × the retinal cutoff, and ${OPTICAL_CYCLES_PER_LETTER} cycles per letter where this eye's white-light MTF (with defocus, stray light and off-axis loss) falls to ${OPTICAL_THRESHOLD_MODULATION}; reading needs ${READING_RESERVE}× threshold`, source: 'fitted to Elliott, Yang & Whitaker (1995) and Blendowske (2015); periphery checked against Song, Levi & Pelli (2014); Whittaker & Lovie-Kitchin (1993)', status: 'proposal' },
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
    viewer: { ...setup.viewer, ageing: numbers.ageing },
    gaze: { xPx: numbers.gazePx[0], yPx: numbers.gazePx[1] },
    light: { ...numbers.light, adaptingFieldDeg: setup.light.adaptingFieldDeg },
    ...(numbers.blindSpot ? { blindSpot: numbers.blindSpot } : {}),
    percept: numbers.percept,
    eye,
    optics: numbers.optics,
    acuity: numbers.acuity,
    models: modelsUsed(setup, acuity),
  });
}

/** Counts of label verdicts, for summaries: by role (`verdict`), or as seen from the gaze or when looked at. */
export function labelSummary(verdicts: readonly LabelVerdict[], view: 'verdict' | 'fromGaze' | 'whenFixated'): Record<Verdict, number> {
  const counts: Record<Verdict, number> = { readable: 0, legible: 0, 'not legible': 0, 'not judged': 0 };
  for (const v of verdicts) counts[view === 'verdict' ? v.verdict : v[view].verdict]++;
  return counts;
}

/** Verdict counts by role in words ("3 readable, 2 legible, 1 not legible[, 1 decorative]"). */
export function describeVerdicts(verdicts: readonly LabelVerdict[], separator = ', '): string {
  const c = labelSummary(verdicts, 'verdict');
  return [`${c.readable} readable`, `${c.legible} legible`, `${c['not legible']} not legible`, ...(c['not judged'] ? [`${c['not judged']} decorative`] : [])].join(separator);
}

/** The rule in words, for the report and the review material. */
export const LABEL_RULE = `Each label is judged by its role: glance labels as seen from the gaze without moving the eyes, look labels (the default) when looked at, decorative labels not at all. `
  + `A label passes when readable: capital height at least ${READING_RESERVE}× the smallest legible letter at its farthest point (Whittaker & Lovie-Kitchin 1993), `
  + 'mean letter advance at least the critical spacing of crowding (Song, Levi & Pelli 2014, Eq. 14), WCAG 2.2 contrast ratio of the text as it reaches the retina at least 4.5:1 (3:1 for large text), '
  + 'and not in the blind spot. Legible: the letters can be made out (size at threshold, no crowding) but one of those limits is not met. '
  + 'Crowding is not drawn in the percept: letters that each look sharp there can still not be read when crowded.';

export interface ProofReportExtras {
  labelsFile?: string;
  depthFile?: { file: string; unit: string };
  frameScale?: FrameScale;
  fixations?: FixationResult[];
}

/** The label verdicts in the short form used per fixation. */
function shortVerdicts(verdicts: readonly LabelVerdict[]): Record<string, unknown>[] {
  return verdicts.map((v) => ({ id: v.id, role: v.role, verdict: v.verdict, passes: v.passes, limitedBy: countedJudgement(v).limitedBy, eccentricityDeg: v.fromGaze.eccentricityDeg }));
}

export function proofReport(setup: Setup, result: ProofResult, frame: { file: string; info: FrameInfo }, outputs: string[], extras: ProofReportExtras = {}): Record<string, unknown> {
  const { labelsFile, depthFile, frameScale, fixations } = extras;
  const base = numbersReport(setup, result.numbers, result.models.acuity);
  if (result.depth) {
    (base.models as ModelEntry[]).push({ stage: 'optics', name: 'depth-of-field', summary: 'extra defocus 1/d − 1/d_gaze per pixel from the depth map, as a Gaussian of σ = blur disk / 4 in quadrature with the PSF at the gaze', source: 'standard optics; Gaussian form our simplification', status: 'proposal' });
  }
  let minLetter = Infinity;
  for (const v of result.smallestLetterPx) if (v < minLetter) minLetter = v;
  return {
    reportVersion: base.reportVersion,
    cautions: base.cautions,
    frame: { file: frame.file, ...frame.info, ...(frameScale ? roundNumbers(frameScale) as object : {}) },
    ...base,
    detailMap: roundNumbers({ smallestLetterPxAtGaze: result.numbers.acuity[0]?.smallestLetterPx, smallestLetterPxMinimum: minLetter }),
    ...(result.depth && depthFile ? { depth: roundNumbers({ ...depthFile, ...result.depth }) } : {}),
    ...(result.labels ? {
      labels: roundNumbers({
        file: labelsFile,
        rule: LABEL_RULE,
        sources: LIMIT_SOURCES,
        summary: { ...labelSummary(result.labels, 'verdict'), passing: result.labels.filter((v) => v.passes === true).length, failing: result.labels.filter((v) => v.passes === false).map((v) => v.id) },
        summaryFromGaze: labelSummary(result.labels, 'fromGaze'),
        summaryWhenFixated: labelSummary(result.labels, 'whenFixated'),
        verdicts: result.labels,
      }),
    } : {}),
    ...(fixations ? { fixations: roundNumbers(fixations.map((f) => ({ ...f, ...(f.labels ? { labels: shortVerdicts(f.labels), summary: labelSummary(f.labels, 'verdict') } : {}) }))) } : {}),
    outputs,
  };
}
