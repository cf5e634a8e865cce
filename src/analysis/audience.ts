/**
 * The audience: how many of the people who will use a display can read a label, computed from the
 * models for a few thousand typical eyes without running the percept for each.
 *
 * Who is in it (our stated assumptions; change them here, and say so in a review):
 * - ages 20 to 75, every year equally represented;
 * - accommodation: five equally weighted amplitudes per age spanning Hofstetter's (1950) minimum
 *   (15 − 0.25·age), mean (18.5 − 0.30·age) and maximum (25 − 0.40·age), floored at 0;
 * - pupil by age and light, Watson & Yellott (2012), in the proof's adapting light;
 * - refraction, two audiences: `uncorrected` with the spread of spherical equivalents of
 *   REFRACTION_SPREAD (from memory: the rough shape of adult population surveys, about a third
 *   myopic); `corrected` for distance (glasses or contact lenses for far), leaving −0.25, 0 or
 *   +0.25 D (common practice: prescriptions are given in 0.25 D steps). Neither has glasses for
 *   near, so presbyopes meet a near display with their accommodation only;
 * - the neural ageing of acuity (neural-ageing.ts) and the optics of the typical eye of each age,
 *   from a table (scripts/make-audience-table.ts) of the optical letter limit by age, pupil and
 *   defocus; cylinder is not spread.
 * A person reads a label when its capital height is at least READING_RESERVE× their smallest
 * legible letter where the label is judged, and its letters are not crowded nor in the blind spot
 * (neither depends on the eye's optics). Contrast is judged for the proof's own viewer only.
 */
import { accommodationFor, hofstetterAmplitudeD } from '../optics/accommodation.js';
import { watsonYellottPupilMm } from '../optics/pupil.js';
import type { AcuityModel } from '../retina/acuity-model.js';
import { neuralAcuityFactor } from '../retina/neural-ageing.js';
import type { Eyes } from '../config/setup.js';
import { AUDIENCE_TABLE_AXES as AXES } from './audience-axes.js';
import { AUDIENCE_OPTICAL_CUTOFF_CPD as TABLE } from './audience-optics-table.js';
import { CYCLES_PER_LETTER, FRAME_MIN_LETTER_PX, OPTICAL_CYCLES_PER_LETTER, READING_RESERVE } from './letter-size.js';

export const AUDIENCE_AGES_YEARS: readonly [number, number] = [20, 75];

/** Spherical equivalent refraction of uncorrected adults, D, with shares (from memory). */
export const REFRACTION_SPREAD: readonly { sphereD: number; share: number }[] = [
  { sphereD: -6, share: 0.03 }, { sphereD: -3, share: 0.07 }, { sphereD: -1.5, share: 0.1 }, { sphereD: -0.75, share: 0.12 },
  { sphereD: 0, share: 0.36 }, { sphereD: 0.75, share: 0.16 }, { sphereD: 1.5, share: 0.09 }, { sphereD: 3, share: 0.05 }, { sphereD: 5, share: 0.02 },
];

/** Residual error after a distance correction, D, with shares (common practice: 0.25 D steps). */
export const CORRECTED_RESIDUAL: readonly { sphereD: number; share: number }[] = [
  { sphereD: -0.25, share: 0.25 }, { sphereD: 0, share: 0.5 }, { sphereD: 0.25, share: 0.25 },
];

export const AUDIENCE_SOURCES = 'ages 20–75 equally; accommodation spread Hofstetter (1950) minimum–maximum; pupil Watson & Yellott (2012); uncorrected refraction spread from memory (about a third myopic); corrected: distance correction within ±0.25 D (common practice); no near glasses';

export type AudienceKind = 'uncorrected' | 'corrected';

export interface AudienceEye {
  ageYears: number;
  kind: AudienceKind;
  weight: number;
  pupilMm: number;
  /** Defocus left after accommodation, D (magnitude). */
  blurD: number;
  /** Neural factor on the retina's cutoff for the age. */
  neuralFactor: number;
}

export interface AudienceConditions {
  /** Distance the eyes focus at, m. */
  focalDistanceM: number;
  adaptingLuminanceCdM2: number;
  adaptingFieldDeg: number;
  eyes: Eyes;
  accommodationReserve: number;
}

/** Every eye of both audiences in the given conditions; weights of each audience sum to 1. */
export function audienceEyes(c: AudienceConditions): AudienceEye[] {
  const eyes: AudienceEye[] = [];
  const ages = AUDIENCE_AGES_YEARS[1] - AUDIENCE_AGES_YEARS[0] + 1;
  for (let age = AUDIENCE_AGES_YEARS[0]; age <= AUDIENCE_AGES_YEARS[1]; age++) {
    const pupilMm = watsonYellottPupilMm({ luminanceCdM2: c.adaptingLuminanceCdM2, fieldDiameterDeg: c.adaptingFieldDeg, ageYears: age, eyes: c.eyes === 'both' ? 2 : 1 }).pupilDiameterMm;
    const [lo, mid, hi] = [hofstetterAmplitudeD(age, 'min'), hofstetterAmplitudeD(age, 'mean'), hofstetterAmplitudeD(age, 'max')];
    const amplitudes = [lo, (lo + mid) / 2, mid, (mid + hi) / 2, hi];
    const neuralFactor = neuralAcuityFactor(age);
    for (const [kind, spread] of [['uncorrected', REFRACTION_SPREAD], ['corrected', CORRECTED_RESIDUAL]] as const) {
      for (const r of spread) {
        for (const amplitude of amplitudes) {
          const { defocusD } = accommodationFor(c.focalDistanceM, r.sphereD, amplitude, c.accommodationReserve);
          eyes.push({ ageYears: age, kind, weight: r.share / amplitudes.length / ages, pupilMm, blurD: Math.abs(defocusD), neuralFactor });
        }
      }
    }
  }
  return eyes;
}

/** Index and weight of a value between the two nearest entries of an axis (clamped at its ends). */
function bracket(axis: readonly number[], v: number): [number, number, number] {
  if (v <= axis[0]) return [0, 0, 0];
  const last = axis.length - 1;
  if (v >= axis[last]) return [last, last, 0];
  let i = 0;
  while (axis[i + 1] < v) i++;
  return [i, i + 1, (v - axis[i]) / (axis[i + 1] - axis[i])];
}

/** Optical letter cutoff (cpd) of the typical eye, interpolated in the table. */
export function opticalCutoffFromTable(ageYears: number, pupilMm: number, blurD: number, eccentricityDeg: number): number {
  const axes = [AXES.ageYears, AXES.pupilMm, AXES.defocusD, AXES.eccentricityDeg] as const;
  const b = [bracket(axes[0], ageYears), bracket(axes[1], pupilMm), bracket(axes[2], blurD), bracket(axes[3], eccentricityDeg)];
  const strides = [axes[1].length * axes[2].length * axes[3].length, axes[2].length * axes[3].length, axes[3].length, 1];
  let sum = 0;
  for (let corner = 0; corner < 16; corner++) {
    let index = 0;
    let weight = 1;
    for (let d = 0; d < 4; d++) {
      const upper = (corner >> d) & 1;
      const [i0, i1, t] = b[d];
      index += (upper ? i1 : i0) * strides[d];
      weight *= upper ? t : 1 - t;
    }
    if (weight > 0) sum += weight * TABLE[index];
  }
  return sum;
}

/** Smallest legible capital of one eye at a field point, arcmin (letter-size.ts's rule). */
export function audienceLetterArcmin(eye: AudienceEye, model: AcuityModel, retinalCutoffCpd: number, eccentricityDeg: number): number {
  const neural = (CYCLES_PER_LETTER * 60) / (model.letterFactor * retinalCutoffCpd * eye.neuralFactor);
  const optical = (OPTICAL_CYCLES_PER_LETTER * 60) / opticalCutoffFromTable(eye.ageYears, eye.pupilMm, eye.blurD, eccentricityDeg);
  return Math.hypot(neural, optical);
}

export interface AudienceShare {
  uncorrected: number;
  corrected: number;
}

/**
 * Share of each audience for whom a capital of `letterPx` frame px is readable at a field point:
 * `retinalCutoffCpd` is the unaged retina's cutoff there (the model's, in the proof's light).
 */
export function audienceShareFor(eyes: readonly AudienceEye[], model: AcuityModel, retinalCutoffCpd: number, eccentricityDeg: number, arcminPerPx: number, letterPx: number, minLetterPx = FRAME_MIN_LETTER_PX, letters?: Float64Array): AudienceShare {
  const arcmin = letters ?? audienceLetters(eyes, model, retinalCutoffCpd, eccentricityDeg);
  const share: AudienceShare = { uncorrected: 0, corrected: 0 };
  for (let i = 0; i < eyes.length; i++) {
    const px = Math.max(minLetterPx, arcmin[i] / arcminPerPx);
    if (READING_RESERVE * px <= letterPx) share[eyes[i].kind] += eyes[i].weight;
  }
  return { uncorrected: Math.min(1, share.uncorrected), corrected: Math.min(1, share.corrected) };
}

/** Every eye's smallest legible capital at a field point, arcmin (to reuse across labels at one place). */
export function audienceLetters(eyes: readonly AudienceEye[], model: AcuityModel, retinalCutoffCpd: number, eccentricityDeg: number): Float64Array {
  return Float64Array.from(eyes, (eye) => audienceLetterArcmin(eye, model, retinalCutoffCpd, eccentricityDeg));
}

/**
 * The cumulative share of an audience that reads a capital of each height at a field point: points
 * [px, share] in increasing px, the share reached at that px.
 */
export function readingSizeDistribution(eyes: readonly AudienceEye[], kind: AudienceKind, model: AcuityModel, retinalCutoffCpd: number, eccentricityDeg: number, arcminPerPx: number, minLetterPx = FRAME_MIN_LETTER_PX): [number, number][] {
  const sizes = eyes.filter((e) => e.kind === kind)
    .map((e) => ({ px: READING_RESERVE * Math.max(minLetterPx, audienceLetterArcmin(e, model, retinalCutoffCpd, eccentricityDeg) / arcminPerPx), w: e.weight }))
    .sort((a, b) => a.px - b.px);
  let cumulative = 0;
  return sizes.map((s) => [s.px, Math.min(1, (cumulative += s.w))]);
}

/** Smallest capital (frame px) that a given share (0–1) of an audience reads at a field point. */
export function letterForShare(eyes: readonly AudienceEye[], kind: AudienceKind, share: number, model: AcuityModel, retinalCutoffCpd: number, eccentricityDeg: number, arcminPerPx: number, minLetterPx = FRAME_MIN_LETTER_PX): number {
  const points = readingSizeDistribution(eyes, kind, model, retinalCutoffCpd, eccentricityDeg, arcminPerPx, minLetterPx);
  return (points.find(([, s]) => s >= share - 1e-9) ?? points[points.length - 1])[0];
}
