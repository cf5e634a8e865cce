/**
 * The ageing lens: how much of the display's light reaches the cones at each age, and what that does
 * to colour. The density of the ocular media grows with age, most at short wavelengths, so blue
 * loses luminance and chroma and whites turn yellowish.
 *
 * - Density by age: Pokorny, Smith & Lutze (1987), Applied Optics 26:1437, Table I — an ageing part
 *   TL1(λ) scaled by 1 + 0.02·(A − 32) from 20 to 60 years and 1.56 + 0.0667·(A − 60) above, plus a
 *   stable part TL2(λ); the age model CIE 170-1:2006 adopts.
 * - Cone fundamentals: CIE 170-1:2006 at 2° (src/colour/data/cie-2006-lms-2deg.ts, age 32). Only the
 *   lens density changes with age there, so the fundamentals at age A are those at 32 times
 *   10^−(D(λ, A) − D(λ, 32)).
 * - Cross-check: van de Kraats & van Norren (2007), JOSA A 24(7):1842, the total media density by age
 *   that CIE 203:2012 adopts (mediaDensityVanDeKraats).
 */
import { CIE_1931_Y, cie1931WavelengthNm } from '../colour/data/cie-1931-2deg.js';
import { CIE_2006_L, CIE_2006_M, CIE_2006_S, cie2006WavelengthNm } from '../colour/data/cie-2006-lms-2deg.js';
import type { Matrix3 } from '../colour/matrix3.js';
import { LUMINANCE_WEIGHTS } from '../colour/srgb.js';
import { PRIMARY_SPECTRA, primaryEmission } from './display-spectra.js';

/** Pokorny, Smith & Lutze (1987) Table I: wavelengths (nm) and the ageing (TL1) and stable (TL2) densities. */
const POKORNY_FIRST_NM = 400;
const POKORNY_STEP_NM = 10;
const POKORNY_TL1 = [0.6, 0.51, 0.433, 0.377, 0.327, 0.295, 0.267, 0.233, 0.207, 0.187, 0.167, 0.147, 0.133, 0.12, 0.107, 0.093, 0.08, 0.067, 0.053, 0.04, 0.033, 0.027, 0.02, 0.013, 0.007, 0];
const POKORNY_TL2 = [1, 0.583, 0.3, 0.116, 0.033, 0.005, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0];

/** The age of the CIE 170-1 standard observer, whose fundamentals the table holds. */
export const STANDARD_OBSERVER_AGE_YEARS = 32;
/** Youngest age the density formula covers; younger viewers are taken at it. */
export const POKORNY_MIN_AGE_YEARS = 20;

/** Scale of the ageing part at an age (Pokorny et al. 1987). */
export function pokornyAgeFactor(ageYears: number): number {
  const a = Math.max(POKORNY_MIN_AGE_YEARS, ageYears);
  return a <= 60 ? 1 + 0.02 * (a - 32) : 1.56 + 0.0667 * (a - 60);
}

function pokornyTable(table: readonly number[], wavelengthNm: number): number {
  const u = (wavelengthNm - POKORNY_FIRST_NM) / POKORNY_STEP_NM;
  if (u <= 0) return table[0];
  if (u >= table.length - 1) return table[table.length - 1];
  const i = Math.floor(u);
  return table[i] + (table[i + 1] - table[i]) * (u - i);
}

/** Optical density of the lens at a wavelength and age (Pokorny et al. 1987; held below 400 nm, 0 beyond 650 nm). */
export function lensDensity(wavelengthNm: number, ageYears: number): number {
  return pokornyTable(POKORNY_TL1, wavelengthNm) * pokornyAgeFactor(ageYears) + pokornyTable(POKORNY_TL2, wavelengthNm);
}

/** Total density of the ocular media by age, van de Kraats & van Norren (2007) / CIE 203:2012 (300–700 nm). */
export function mediaDensityVanDeKraats(wavelengthNm: number, ageYears: number): number {
  const l = wavelengthNm;
  const a2 = ageYears * ageYears;
  return (0.15 + 0.000031 * a2) * (400 / l) ** 4
    + 14.19 * 10.68 * Math.exp(-((0.057 * (l - 273)) ** 2))
    + (1.05 - 0.000063 * a2) * 2.13 * Math.exp(-((0.029 * (l - 370)) ** 2))
    + (0.059 + 0.000186 * a2) * 11.95 * Math.exp(-((0.021 * (l - 325)) ** 2))
    + (0.016 + 0.000132 * a2) * 1.43 * Math.exp(-((0.008 * (l - 325)) ** 2))
    + 0.06;
}

/** CIE 2006 2° cone fundamentals (L, M, S; energy) at an age, on the table's wavelengths. */
export function coneFundamentalsAtAge(ageYears: number): [Float64Array, Float64Array, Float64Array] {
  const n = CIE_2006_L.length;
  const out: [Float64Array, Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  for (let i = 0; i < n; i++) {
    const l = cie2006WavelengthNm(i);
    const t = 10 ** -(lensDensity(l, ageYears) - lensDensity(l, STANDARD_OBSERVER_AGE_YEARS));
    out[0][i] = CIE_2006_L[i] * t;
    out[1][i] = CIE_2006_M[i] * t;
    out[2][i] = CIE_2006_S[i] * t;
  }
  return out;
}

/** Luminance weights on the CIE 2006 2° fundamentals, V = 0.68990272·l̄ + 0.34832189·m̄ (CIE 170-2, from memory). */
export const CIE_2006_LUMINANCE_WEIGHTS: readonly [number, number] = [0.68990272, 0.34832189];

/**
 * Scale of each display primary's band so that its CIE 1931 luminance is the sRGB primary's
 * (IEC 61966-2-1): the bands then mix to the display's white as the frame's values assume.
 */
const PRIMARY_SCALE: readonly number[] = PRIMARY_SPECTRA.map((band, p) => {
  let y = 0;
  for (let i = 0; i < CIE_1931_Y.length; i++) y += primaryEmission(band, cie1931WavelengthNm(i)) * CIE_1931_Y[i];
  return LUMINANCE_WEIGHTS[p] / y;
});

/** Cone responses (rows L, M, S) to each display primary at full drive (columns R, G, B), at an age. */
export function primaryConeResponses(ageYears: number): number[][] {
  const cones = coneFundamentalsAtAge(ageYears);
  return cones.map((cone) => PRIMARY_SPECTRA.map((band, p) => {
    let sum = 0;
    for (let i = 0; i < cone.length; i++) sum += primaryEmission(band, cie2006WavelengthNm(i)) * cone[i];
    return sum * PRIMARY_SCALE[p];
  }));
}

export interface PrimaryTransmission {
  /** Luminance (CIE 2006) of each primary reaching the cones at this age over the standard observer's (32 y). */
  luminance: { red: number; green: number; blue: number };
  /** The same for the S cones' signal from the blue primary (what carries its blueness). */
  blueToSCones: number;
  /** Density of the lens at 450 nm at this age (Pokorny et al. 1987). */
  lensDensityAt450Nm: number;
}

export function primaryTransmission(ageYears: number): PrimaryTransmission {
  const [wl, wm] = CIE_2006_LUMINANCE_WEIGHTS;
  const at = primaryConeResponses(ageYears);
  const std = primaryConeResponses(STANDARD_OBSERVER_AGE_YEARS);
  const lum = (r: number[][], p: number): number => wl * r[0][p] + wm * r[1][p];
  return {
    luminance: { red: lum(at, 0) / lum(std, 0), green: lum(at, 1) / lum(std, 1), blue: lum(at, 2) / lum(std, 2) },
    blueToSCones: at[2][2] / std[2][2],
    lensDensityAt450Nm: lensDensity(450, ageYears),
  };
}

function invert3(m: number[][]): number[][] {
  const [[a, b, c], [d, e, f], [g, h, i]] = m;
  const A = e * i - f * h;
  const B = -(d * i - f * g);
  const C = d * h - e * g;
  const det = a * A + b * B + c * C;
  return [
    [A / det, -(b * i - c * h) / det, (b * f - c * e) / det],
    [B / det, (a * i - c * g) / det, -(a * f - c * d) / det],
    [C / det, -(a * h - b * g) / det, (a * e - b * d) / det],
  ];
}

/**
 * The linear-RGB matrix that gives a viewer of `referenceAge` the cone signals a viewer of `ageYears`
 * gets from the same frame: R(reference)⁻¹·R(age), R the primaries' cone responses. Scaled so the
 * display's white keeps its luminance: the percept shows colour relative to the display, not the
 * dimming of the whole image (which the eye adapts to).
 */
export function mediaColourMatrix(ageYears: number, referenceAgeYears: number): number[][] {
  const m = matrixProduct(invert3(primaryConeResponses(referenceAgeYears)), primaryConeResponses(ageYears));
  const white = m.map((row) => row[0] + row[1] + row[2]);
  const y = LUMINANCE_WEIGHTS[0] * white[0] + LUMINANCE_WEIGHTS[1] * white[1] + LUMINANCE_WEIGHTS[2] * white[2];
  return m.map((row) => row.map((v) => v / y));
}

function matrixProduct(a: number[][], b: number[][]): number[][] {
  return a.map((row) => [0, 1, 2].map((j) => row[0] * b[0][j] + row[1] * b[1][j] + row[2] * b[2][j]));
}

/** How the lens's colour is shown: as the cones receive it, or after adapting to the display's white. */
export type LensColour = 'received' | 'adapted';

/**
 * The matrix for the ageing lens between a viewer and a reference age, or undefined where it is the
 * identity (within 0.1 %). 'received': the cone signals as they arrive (mediaColourMatrix; whites
 * turn yellowish). 'adapted': the same after each cone class is rescaled so the display's white keeps
 * its cone signals (von Kries), as long-term adaptation keeps an older viewer's white neutral
 * (Werner & Schefrin 1993, from memory); blue still loses luminance against white.
 */
export function lensColourMatrix(ageYears: number, referenceAgeYears: number, mode: LensColour): Matrix3 | undefined {
  let m: number[][];
  if (mode === 'received') {
    m = mediaColourMatrix(ageYears, referenceAgeYears);
  } else {
    const at = primaryConeResponses(ageYears);
    const ref = primaryConeResponses(referenceAgeYears);
    const gain = [0, 1, 2].map((c) => (ref[c][0] + ref[c][1] + ref[c][2]) / (at[c][0] + at[c][1] + at[c][2]));
    m = matrixProduct(invert3(ref), at.map((row, c) => row.map((v) => v * gain[c])));
  }
  const identity = m.every((row, i) => row.every((v, j) => Math.abs(v - (i === j ? 1 : 0)) < 1e-3));
  return identity ? undefined : (m as unknown as Matrix3);
}
