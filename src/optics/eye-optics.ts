/**
 * The eye's optics in white light. A wavefront of ANSI Zernike terms over the viewer's pupil —
 * the viewer's uncorrected cylinder and any defocus accommodation leaves, the typical higher-order
 * aberrations (or measured ones), the eye's longitudinal chromatic aberration — gives a PSF per
 * wavelength; each display channel's PSF integrates its primary's spectrum (three wavelengths), the
 * eye focuses where the white-light luminance image is best (computed), and the short-angle scatter
 * of ocular-scatter.ts is added. The mean eye has no preferred axis, so the typical eye's coma and
 * trefoil enter as a rotationally symmetric factor on the transfer; a viewer's cylinder or measured
 * wavefront keeps its axes.
 */
import { ARCMIN_PER_RAD } from '../units.js';
import { chromaticRefractionD } from './chromatic.js';
import { CHANNEL_LUMINANCE, CHANNEL_WAVELENGTHS, SHORTEST_SAMPLED_NM } from './display-spectra.js';
import { createFft2dPlan, fft2dForward, nextPowerOfTwo } from './fft2d.js';
import { powerVectorFromPrescription, zernikeFromPowerVector } from './power-vector.js';
import { binPsfToPixels, encircledEnergyDiameterArcmin, monochromaticPsf, otfMagnitude, radialAverage, type PsfGrid } from './pupil-psf.js';
import { scatterScaleCpd, scatterTransfer } from './ocular-scatter.js';
import { zernikeOrders, type ZernikeTerm } from './zernike.js';
import { BEST_FOCUS_AGES_YEARS, BEST_FOCUS_OFFSETS_D, BEST_FOCUS_PUPILS_MM } from './best-focus-table.js';

/**
 * A typical eye's higher-order aberrations. At a 6 mm pupil, Salmon & van de Pol (2006): mean
 * |c₄⁰| ≈ 0.13 µm and higher-order RMS ≈ 0.33 µm; the rest, sqrt(0.33² − 0.13²) = 0.3033 µm, is put
 * equally on coma and trefoil (our choice; their orientation is averaged, see finishPsf). These are
 * taken for the population's mean age, 40 years (from memory). With age, over a 5 mm pupil, the
 * higher-order RMS grows by 0.0032 µm and spherical aberration by 0.0011 µm a year (Berrio, Tabernero
 * & Artal 2010, J Vision 10(14):34). Coefficients scale with pupil radius as r^n for order n.
 */
/** Wavelength at which chromatic focus shifts are referred, nm (a bookkeeping choice: near the V(λ) peak). */
export const LCA_REFERENCE_NM = 555;

export const TYPICAL_EYE = {
  referencePupilMm: 6,
  sphericalAberrationUm: 0.13,
  higherOrderRmsUm: 0.33,
  referenceAgeYears: 40,
  agePupilMm: 5,
  higherOrderRmsUmPerYear: 0.0032,
  sphericalAberrationUmPerYear: 0.0011,
} as const;

/** Spherical aberration and the rest of the higher-order RMS (µm) of the typical eye over a 5 mm pupil at an age. */
export function typicalAberrationsAt5Mm(ageYears: number): { sphericalUm: number; restUm: number } {
  const e = TYPICAL_EYE;
  const toAgePupil = (um: number, order: number): number => um * (e.agePupilMm / e.referencePupilMm) ** order;
  const sa0 = toAgePupil(e.sphericalAberrationUm, 4);
  const rest0 = toAgePupil(Math.sqrt(e.higherOrderRmsUm ** 2 - e.sphericalAberrationUm ** 2), 3);
  const years = ageYears - e.referenceAgeYears;
  const sphericalUm = Math.max(0, sa0 + e.sphericalAberrationUmPerYear * years);
  const rms = Math.max(sphericalUm, Math.hypot(sa0, rest0) + e.higherOrderRmsUmPerYear * years);
  return { sphericalUm, restUm: Math.sqrt(Math.max(0, rms * rms - sphericalUm * sphericalUm)) };
}

/**
 * The typical eye's higher-order terms at a pupil and age: spherical aberration always; coma and
 * trefoil (`asymmetric`) only where they are computed directly — otherwise they enter as a symmetric factor.
 */
export function typicalHigherOrderTerms(pupilDiameterMm: number, ageYears: number, asymmetric = true): ZernikeTerm[] {
  const k = pupilDiameterMm / TYPICAL_EYE.agePupilMm;
  const { sphericalUm, restUm } = typicalAberrationsAt5Mm(ageYears);
  const each = restUm / Math.SQRT2;
  return [
    { n: 4, m: 0, coefficientUm: sphericalUm * k ** 4 },
    ...(asymmetric ? [{ n: 3, m: 1, coefficientUm: each * k ** 3 }, { n: 3, m: 3, coefficientUm: each * k ** 3 }] : []),
  ];
}

export interface EyeOpticsInput {
  pupilDiameterMm: number;
  /** Spherical defocus accommodation cannot remove, D (+: focus behind the retina). */
  defocusD: number;
  /** The viewer's uncorrected cylinder and axis. */
  cylinderD: number;
  axisDeg: number;
  /** Angular size of one frame pixel at the gaze, arcmin. */
  pixelArcmin: number;
  /** Age, for the width of the ocular scatter. */
  ageYears: number;
  /** Measured aberrations replacing the typical eye's (coefficients in µm by ANSI j, over a pupil). */
  measured?: { pupilDiameterMm: number; coefficientsUm: readonly number[] };
}

export interface EyeOpticsFigures {
  /** Peak of the 555 nm PSF at the eye's focus over that of a perfect eye with the same pupil. */
  strehlRatio: number;
  /** Radially averaged MTF of the white-light luminance image (display primaries, with scatter). */
  mtfAt5Cpd: number;
  mtfAt10Cpd: number;
  mtfAt20Cpd: number;
  mtfAt30Cpd: number;
  /** The monochromatic part at 555 nm, best focus, with scatter (compare Watson 2013). */
  monochromatic555: { mtfAt5Cpd: number; mtfAt10Cpd: number; mtfAt20Cpd: number; mtfAt30Cpd: number };
  encircledEnergy50DiameterArcmin: number;
  encircledEnergy80DiameterArcmin: number;
  /** Spherical defocus at the luminance-weighted mean wavelength of each primary, D (+: behind the retina). */
  defocusByChannelD: { red: number; green: number; blue: number };
  /** Wavelength in focus on the retina, nm. */
  focusWavelengthNm: number;
  /** Focus chosen for the best white-light luminance image, relative to 555 nm in focus, D. */
  bestFocusOffsetD: number;
  /** Frequency scale of the ocular scatter, cpd. */
  scatterScaleCpd: number;
  psfSampleArcmin: number;
  aberrations: 'measured' | 'typical eye';
  /** Pupil used for the optics (limited to a measured wavefront's pupil). */
  opticalPupilDiameterMm: number;
}

export interface EyeOptics {
  /** One odd-sized, centred kernel per channel (R, G, B), each summing to 1. */
  kernels: { kernel: Float32Array; size: number }[];
  figures: EyeOpticsFigures;
  /** Fine-grid PSFs per channel (with scatter), for pictures. */
  channelPsfs: Float64Array[];
  grid: PsfGrid;
  /** White-light luminance MTF (radial, with scatter) at 0, 1, 2 … cpd. */
  luminanceMtfPerCpd: Float64Array;
}

/** Largest transform used for a PSF; a blur needing more is beyond what this model samples. */
export const MAX_PSF_SIZE = 1024;

/** Measured terms (j ≥ 3) over the current pupil: evaluated on the inner part of the measured pupil. */
function measuredTerms(input: EyeOpticsInput): ZernikeTerm[] {
  const m = input.measured;
  if (!m) return [];
  const pupilScale = Math.min(1, input.pupilDiameterMm / m.pupilDiameterMm);
  return m.coefficientsUm.flatMap((c, j) => (j < 3 || c === 0 ? [] : [{ ...zernikeOrders(j), coefficientUm: c, pupilScale }]));
}

/** Wavefront terms at a wavelength for a focus offset and one orientation of the typical aberrations. */
export function eyeTerms(input: EyeOpticsInput, wavelengthNm: number, focusOffsetD: number, asymmetric = false): ZernikeTerm[] {
  const chromatic = chromaticRefractionD(wavelengthNm) - chromaticRefractionD(LCA_REFERENCE_NM);
  const prescription = powerVectorFromPrescription(0, input.cylinderD, input.axisDeg);
  const second = zernikeFromPowerVector({ mD: input.defocusD + focusOffsetD + chromatic, j0D: prescription.j0D, j45D: prescription.j45D }, input.pupilDiameterMm / 2);
  return [...second, ...(input.measured ? measuredTerms(input) : typicalHigherOrderTerms(input.pupilDiameterMm, input.ageYears, asymmetric))];
}

/** Sampling of the fine PSF grid: an odd number of samples per frame pixel, fine enough for the shortest wavelength. */
export function psfGridFor(input: EyeOpticsInput): { grid: PsfGrid; oversample: number } {
  const pixelRad = input.pixelArcmin / ARCMIN_PER_RAD;
  const maxSampleRad = (SHORTEST_SAMPLED_NM * 1e-9) / (2 * input.pupilDiameterMm * 1e-3);
  let oversample = Math.ceil(pixelRad / maxSampleRad);
  if (oversample % 2 === 0) oversample++;
  const sampleRad = pixelRad / oversample;
  // Window: twice the blur-circle diameter of the worst channel (the chromatic spread of the display's
  // primaries is within 1 D, the higher orders add about 0.3 D), at least 40 diffraction widths and 16 px.
  const worstBlurD = Math.abs(input.defocusD) + 1 + Math.abs(input.cylinderD) / 2 + 0.3;
  const windowRad = Math.max(2 * input.pupilDiameterMm * 1e-3 * worstBlurD, 40 * maxSampleRad * 2, 16 * pixelRad);
  const size = Math.min(MAX_PSF_SIZE, Math.max(64, nextPowerOfTwo(Math.ceil(windowRad / sampleRad))));
  return { grid: { size, sampleRad }, oversample };
}

/**
 * Peak of the normalised diffraction-limited PSF on a grid: with all pupil samples in phase the
 * peak is |Σ P|² / (N²·Σ |P|²) = (pupil samples) / N² (Parseval).
 */
export function diffractionLimitedPeak(pupilDiameterMm: number, wavelengthNm: number, grid: PsfGrid): number {
  const n = grid.size;
  const stepMm = (wavelengthNm * 1e-6) / (n * grid.sampleRad);
  const radius = pupilDiameterMm / 2 / stepMm;
  let count = 0;
  for (let y = 0; y < n; y++) for (let x = 0; x < n; x++) if (Math.hypot(x - n / 2, y - n / 2) <= radius) count++;
  return count / (n * n);
}

/** Radial bins of a transfer on an n-point grid: distance of bin (kx, ky) from zero frequency, in bins. */
function binRadius(kx: number, ky: number, n: number): number {
  return Math.hypot(kx <= n / 2 ? kx : kx - n, ky <= n / 2 ? ky : ky - n);
}

/** Radial profile (per whole bin) of the modulus of a PSF's transfer. */
function mtfProfile(psf: Float64Array, n: number): Float64Array {
  const data = new Float64Array(2 * n * n);
  for (let i = 0; i < n * n; i++) data[2 * i] = psf[i];
  fft2dForward(createFft2dPlan(n, n), data);
  const bins = Math.ceil((n / 2) * Math.SQRT2) + 2;
  const sum = new Float64Array(bins);
  const weight = new Float64Array(bins);
  for (let ky = 0; ky < n; ky++) for (let kx = 0; kx < n; kx++) {
    const r = binRadius(kx, ky, n);
    const b = Math.floor(r);
    const t = r - b;
    const m = Math.hypot(data[2 * (ky * n + kx)], data[2 * (ky * n + kx) + 1]);
    sum[b] += (1 - t) * m;
    weight[b] += 1 - t;
    sum[b + 1] += t * m;
    weight[b + 1] += t;
  }
  const dc = sum[0] / weight[0];
  return sum.map((v, b) => (weight[b] > 0 ? v / weight[b] / dc : 0));
}

/**
 * The typical eye's coma and trefoil as a rotationally symmetric factor on the transfer: the ratio of
 * the radially averaged MTF (the modulus, as an individual eye has it whatever the orientation of its
 * aberrations) at 555 nm with and without them, at the eye's focus, never above 1. Averaging PSFs over
 * orientation instead would cancel their phases and blur far more than any single eye does.
 */
export function asymmetricAberrationFactor(input: EyeOpticsInput, grid: PsfGrid, focusOffsetD: number): Float64Array {
  const symmetricOnly = { ...input, cylinderD: 0, defocusD: 0 };
  const all = eyeTerms(symmetricOnly, LCA_REFERENCE_NM, focusOffsetD, true);
  const symmetric = eyeTerms(symmetricOnly, LCA_REFERENCE_NM, focusOffsetD, false);
  const withAll = mtfProfile(monochromaticPsf(input.pupilDiameterMm, LCA_REFERENCE_NM, all, grid), grid.size);
  const without = mtfProfile(monochromaticPsf(input.pupilDiameterMm, LCA_REFERENCE_NM, symmetric, grid), grid.size);
  return withAll.map((v, b) => (without[b] > 1e-4 ? Math.min(1, v / without[b]) : Math.min(1, v)));
}

/**
 * Multiplies the transfer of a fine-grid PSF by radially symmetric factors (the ocular scatter and,
 * for the typical eye, its coma and trefoil), in place, and renormalises.
 */
export function finishPsf(psf: Float64Array, grid: PsfGrid, scaleCpd: number, radialFactor?: Float64Array): void {
  const n = grid.size;
  const plan = createFft2dPlan(n, n);
  const data = new Float64Array(2 * n * n);
  for (let i = 0; i < n * n; i++) data[2 * i] = psf[i];
  fft2dForward(plan, data);
  // Bin spacing of the transform: 1/(N·sample) cycles per radian.
  const cpdPerBin = 1 / (n * grid.sampleRad) / (180 / Math.PI);
  for (let ky = 0; ky < n; ky++) for (let kx = 0; kx < n; kx++) {
    const r = binRadius(kx, ky, n);
    let g = scatterTransfer(r * cpdPerBin, scaleCpd);
    if (radialFactor) {
      const b = Math.floor(r);
      g *= radialFactor[b] + (radialFactor[b + 1] - radialFactor[b]) * (r - b);
    }
    const i = 2 * (ky * n + kx);
    data[i] *= g;
    data[i + 1] *= g;
  }
  // Inverse by conjugation: conj(FFT(conj(X))) / N².
  for (let i = 1; i < data.length; i += 2) data[i] = -data[i];
  fft2dForward(plan, data);
  let total = 0;
  for (let i = 0; i < n * n; i++) {
    psf[i] = Math.max(0, data[2 * i]);
    total += psf[i];
  }
  for (let i = 0; i < psf.length; i++) psf[i] /= total;
}

/** Luminance PSF of a white frame: channels weighted by their luminance. */
function luminancePsf(channelPsfs: readonly Float64Array[]): Float64Array {
  const out = new Float64Array(channelPsfs[0].length);
  channelPsfs.forEach((p, c) => {
    for (let i = 0; i < out.length; i++) out[i] += CHANNEL_LUMINANCE[c] * p[i];
  });
  return out;
}

const BEST_FOCUS_FREQUENCIES_CPD = [2, 4, 6, 8, 10, 12, 15, 20, 25, 30];
const bestFocusCache = new Map<string, number>();

/**
 * Sum of the white-light luminance MTF from 2 to 30 cpd at a focus offset (each channel at its mean
 * wavelength): the measure of image quality the eye's focus maximises (our proposal).
 */
export function focusScore(input: EyeOpticsInput, offsetD: number, gridSize = 256): number {
  const sampleRad = (SHORTEST_SAMPLED_NM * 1e-9) / (2 * input.pupilDiameterMm * 1e-3);
  const grid: PsfGrid = { size: gridSize, sampleRad };
  const probe = { ...input, defocusD: 0 };
  const psf = new Float64Array(grid.size * grid.size);
  CHANNEL_WAVELENGTHS.forEach((samples, c) => {
    const p = monochromaticPsf(input.pupilDiameterMm, samples[0].wavelengthNm, eyeTerms(probe, samples[0].wavelengthNm, offsetD), grid);
    for (let i = 0; i < psf.length; i++) psf[i] += CHANNEL_LUMINANCE[c] * p[i];
  });
  const otf = otfMagnitude(psf, grid.size);
  return BEST_FOCUS_FREQUENCIES_CPD.reduce((s, f) => s + radialAverage(otf, grid, f), 0);
}

/** Golden-section search of the focus offset (D) maximising focusScore, over ±1 D to 0.02 D. */
export function searchBestFocusD(input: EyeOpticsInput, gridSize = 256): number {
  const ratio = (Math.sqrt(5) - 1) / 2;
  let lo = -1;
  let hi = 1;
  let a = hi - ratio * (hi - lo);
  let b = lo + ratio * (hi - lo);
  let fa = focusScore(input, a, gridSize);
  let fb = focusScore(input, b, gridSize);
  while (hi - lo > 0.02) {
    if (fa > fb) {
      hi = b;
      b = a;
      fb = fa;
      a = hi - ratio * (hi - lo);
      fa = focusScore(input, a, gridSize);
    } else {
      lo = a;
      a = b;
      fa = fb;
      b = lo + ratio * (hi - lo);
      fb = focusScore(input, b, gridSize);
    }
  }
  return (lo + hi) / 2;
}

function bracket(values: readonly number[], v: number): [number, number] {
  if (v <= values[0]) return [0, 0];
  if (v >= values[values.length - 1]) return [values.length - 2, 1];
  let i = 0;
  while (v > values[i + 1]) i++;
  return [i, (v - values[i]) / (values[i + 1] - values[i])];
}

/** The typical eye's tabulated best-focus offset, bilinear in pupil and age (held beyond the table's ends). */
export function typicalBestFocusD(pupilDiameterMm: number, ageYears: number): number {
  const [i, s] = bracket(BEST_FOCUS_AGES_YEARS, ageYears);
  const [j, t] = bracket(BEST_FOCUS_PUPILS_MM, pupilDiameterMm);
  const row = (k: number): number => BEST_FOCUS_OFFSETS_D[k][j] * (1 - t) + BEST_FOCUS_OFFSETS_D[k][Math.min(j + 1, BEST_FOCUS_PUPILS_MM.length - 1)] * t;
  return row(i) * (1 - s) + row(Math.min(i + 1, BEST_FOCUS_AGES_YEARS.length - 1)) * s;
}

/**
 * Focus offset (D, relative to 555 nm in focus) at which the white-light luminance image is best.
 * For the typical eye it is read from a table computed once over pupil and age
 * (best-focus-table.ts, made by scripts/make-best-focus-table.ts with the same search); a viewer's
 * cylinder or measured wavefront is searched afresh.
 */
export function bestFocusOffsetD(input: EyeOpticsInput): number {
  if (!input.measured && input.cylinderD === 0) return typicalBestFocusD(input.pupilDiameterMm, input.ageYears);
  const key = JSON.stringify([input.pupilDiameterMm.toFixed(3), input.ageYears.toFixed(1), input.cylinderD, input.axisDeg, input.measured ?? null]);
  const cached = bestFocusCache.get(key);
  if (cached !== undefined) return cached;
  const best = searchBestFocusD(input);
  bestFocusCache.set(key, best);
  return best;
}

/** Wavelength (nm) whose chromatic refraction a focus offset puts on the retina. */
function focusedWavelengthNm(offsetD: number): number {
  // Rx(λ) − Rx(555) + offset = 0  ⇒  Rx(λ) = Rx(555) − offset; invert Rx = p − q/(λ − c) by bisection.
  const targetD = chromaticRefractionD(LCA_REFERENCE_NM) - offsetD;
  let lo = 380;
  let hi = 780;
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    if (chromaticRefractionD(mid) < targetD) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

export function computeEyeOptics(requested: EyeOpticsInput): EyeOptics {
  // Measured coefficients say nothing beyond their pupil: a larger pupil is limited to it.
  const input = requested.measured && requested.pupilDiameterMm > requested.measured.pupilDiameterMm
    ? { ...requested, pupilDiameterMm: requested.measured.pupilDiameterMm }
    : requested;
  const { grid, oversample } = psfGridFor(input);
  const focusOffsetD = bestFocusOffsetD(input);
  // The mean eye has no preferred axis: its coma and trefoil enter as a symmetric factor on the
  // transfer; a viewer's cylinder or a measured wavefront keeps its own axes.
  const factor = input.measured ? undefined : asymmetricAberrationFactor(input, grid, focusOffsetD);
  const n = grid.size;
  const channelPsfs = CHANNEL_WAVELENGTHS.map((samples) => {
    const sum = new Float64Array(n * n);
    for (const { wavelengthNm, weight } of samples) {
      const psf = monochromaticPsf(input.pupilDiameterMm, wavelengthNm, eyeTerms(input, wavelengthNm, focusOffsetD), grid);
      for (let i = 0; i < sum.length; i++) sum[i] += weight * psf[i];
    }
    return sum;
  });
  const scaleCpd = scatterScaleCpd(input.ageYears);
  for (const psf of channelPsfs) finishPsf(psf, grid, scaleCpd, factor);
  const kernels = channelPsfs.map((psf) => binPsfToPixels(psf, grid, oversample));

  const lum = luminancePsf(channelPsfs);
  const lumOtf = otfMagnitude(lum, n);
  const maxCpd = Math.floor(0.5 / grid.sampleRad / (180 / Math.PI));
  const luminanceMtfPerCpd = Float64Array.from({ length: Math.min(200, maxCpd) + 1 }, (_, f) => (f === 0 ? 1 : radialAverage(lumOtf, grid, f)));

  // Strehl ratio of the whole wavefront at 555 nm (an individual eye, coma and trefoil included).
  const whole = monochromaticPsf(input.pupilDiameterMm, LCA_REFERENCE_NM, eyeTerms(input, LCA_REFERENCE_NM, focusOffsetD, true), grid);
  const strehlRatio = whole.reduce((a, b) => Math.max(a, b), 0) / diffractionLimitedPeak(input.pupilDiameterMm, LCA_REFERENCE_NM, grid);
  const mono = monochromaticPsf(input.pupilDiameterMm, LCA_REFERENCE_NM, eyeTerms(input, LCA_REFERENCE_NM, focusOffsetD), grid);
  finishPsf(mono, grid, scaleCpd, factor);
  const monoOtf = otfMagnitude(mono, n);
  const channelDefocus = (c: number): number => {
    const meanNm = CHANNEL_WAVELENGTHS[c][0].wavelengthNm;
    return input.defocusD + focusOffsetD + chromaticRefractionD(meanNm) - chromaticRefractionD(LCA_REFERENCE_NM);
  };
  const at = (otf: Float64Array, f: number): number => radialAverage(otf, grid, f);
  return {
    kernels,
    channelPsfs,
    grid,
    luminanceMtfPerCpd,
    figures: {
      strehlRatio,
      mtfAt5Cpd: at(lumOtf, 5),
      mtfAt10Cpd: at(lumOtf, 10),
      mtfAt20Cpd: at(lumOtf, 20),
      mtfAt30Cpd: at(lumOtf, 30),
      monochromatic555: { mtfAt5Cpd: at(monoOtf, 5), mtfAt10Cpd: at(monoOtf, 10), mtfAt20Cpd: at(monoOtf, 20), mtfAt30Cpd: at(monoOtf, 30) },
      encircledEnergy50DiameterArcmin: encircledEnergyDiameterArcmin(lum, grid, 0.5),
      encircledEnergy80DiameterArcmin: encircledEnergyDiameterArcmin(lum, grid, 0.8),
      defocusByChannelD: { red: channelDefocus(0), green: channelDefocus(1), blue: channelDefocus(2) },
      focusWavelengthNm: focusedWavelengthNm(input.defocusD + focusOffsetD),
      bestFocusOffsetD: focusOffsetD,
      scatterScaleCpd: scaleCpd,
      aberrations: input.measured ? 'measured' : 'typical eye',
      opticalPupilDiameterMm: input.pupilDiameterMm,
      psfSampleArcmin: grid.sampleRad * ARCMIN_PER_RAD,
    },
  };
}

/** White-light luminance MTF at f (cpd) from the tabulated curve (linear between whole cpd). */
export function luminanceMtfAt(optics: Pick<EyeOptics, 'luminanceMtfPerCpd'>, frequencyCpd: number): number {
  const t = optics.luminanceMtfPerCpd;
  if (frequencyCpd <= 0) return 1;
  const i = Math.floor(frequencyCpd);
  if (i >= t.length - 1) return t[t.length - 1] * Math.exp(-(frequencyCpd - (t.length - 1)) / 10);
  return t[i] + (t[i + 1] - t[i]) * (frequencyCpd - i);
}
