/**
 * The eye's optics as physics: a wavefront from Zernike terms over the viewer's pupil, a PSF per
 * colour channel integrated over the primary's band with the eye's longitudinal chromatic
 * aberration, binned to frame pixels as convolution kernels; plus the figures a report needs.
 */
import { ARCMIN_PER_RAD } from '../units.js';
import { chromaticRefractionD, FOCUS_WAVELENGTH_NM, PRIMARY_BANDS } from './chromatic.js';
import { nextPowerOfTwo } from './fft2d.js';
import { powerVectorFromPrescription, zernikeFromPowerVector } from './power-vector.js';
import { binPsfToPixels, encircledEnergyDiameterArcmin, monochromaticPsf, otfMagnitude, radialAverage, type PsfGrid } from './pupil-psf.js';
import { zernikeOrders, type ZernikeTerm } from './zernike.js';

/**
 * A typical eye. Higher-order aberrations at a 6 mm pupil from Salmon & van de Pol (2006): mean
 * |c₄⁰| ≈ 0.13 µm and higher-order RMS ≈ 0.33 µm, the rest (0.303 µm) put equally on vertical coma
 * and trefoil (our choice). Coefficients scale with pupil radius as r^n for order n. A residual
 * second-order error of a corrected eye — 0.3 D of accommodative lag and 0.4 D of uncorrected
 * cylinder (J0 = 0.2 D) — is our proposal, calibrated so that the whole model's radially averaged
 * MTF at 555 nm lies within 0.07 of the mean human MTF of Watson (2013) from 5 to 30 cpd for 3–6 mm
 * pupils (tests/optics/eye-optics.test.ts states the table).
 */
export const TYPICAL_EYE = {
  referencePupilMm: 6,
  sphericalAberrationUm: 0.13,
  verticalComaUm: 0.2145,
  trefoilUm: 0.2145,
  residualLagD: 0.3,
  residualJ0D: 0.2,
} as const;

export function typicalHigherOrderTerms(pupilDiameterMm: number): ZernikeTerm[] {
  const k = pupilDiameterMm / TYPICAL_EYE.referencePupilMm;
  return [
    { n: 4, m: 0, coefficientUm: TYPICAL_EYE.sphericalAberrationUm * k ** 4 },
    { n: 3, m: -1, coefficientUm: TYPICAL_EYE.verticalComaUm * k ** 3 },
    { n: 3, m: 3, coefficientUm: TYPICAL_EYE.trefoilUm * k ** 3 },
  ];
}

export interface EyeOpticsInput {
  pupilDiameterMm: number;
  /** The viewer's residual spherical defocus after accommodation, D (+: focus behind the retina). */
  defocusD: number;
  /** The viewer's uncorrected cylinder and axis. */
  cylinderD: number;
  axisDeg: number;
  /** Angular size of one frame pixel at the gaze, arcmin. */
  pixelArcmin: number;
  /** Measured aberrations replacing the typical eye's (coefficients in µm by ANSI j, over a pupil). */
  measured?: { pupilDiameterMm: number; coefficientsUm: readonly number[] };
}

export interface EyeOpticsFigures {
  /** Peak of the 555 nm PSF over that of a perfect eye with the same pupil. */
  strehlRatio: number;
  /** Radially averaged MTF at 555 nm. */
  mtfAt5Cpd: number;
  mtfAt10Cpd: number;
  mtfAt20Cpd: number;
  mtfAt30Cpd: number;
  encircledEnergy50DiameterArcmin: number;
  encircledEnergy80DiameterArcmin: number;
  /** Spherical defocus at the centre wavelength of each display primary, D. */
  defocusByChannelD: { red: number; green: number; blue: number };
  focusWavelengthNm: number;
  psfSampleArcmin: number;
  /** Whose higher-order aberrations were used. */
  aberrations: 'measured' | 'typical eye';
  /** Pupil used for the optics (limited to a measured wavefront's pupil). */
  opticalPupilDiameterMm: number;
}

export interface EyeOptics {
  /** One odd-sized, centred kernel per channel (R, G, B), each summing to 1. */
  kernels: { kernel: Float32Array; size: number }[];
  figures: EyeOpticsFigures;
  /** Fine-grid PSFs per channel, for pictures. */
  channelPsfs: Float64Array[];
  grid: PsfGrid;
}

/** Largest transform used for a PSF; a blur needing more is beyond what this model samples. */
export const MAX_PSF_SIZE = 1024;

/**
 * The typical lag of accommodation applies while the eye accommodates within its range; when the
 * target lies outside it (a presbyope too near, a myope too far) the residual defocus replaces it.
 */
function residualLagD(input: EyeOpticsInput): number {
  return input.defocusD === 0 && !input.measured ? TYPICAL_EYE.residualLagD : 0;
}

/** Measured terms (j ≥ 3) over the current pupil: evaluated on the inner part of the measured pupil. */
function measuredTerms(input: EyeOpticsInput): ZernikeTerm[] {
  const m = input.measured;
  if (!m) return [];
  const pupilScale = Math.min(1, input.pupilDiameterMm / m.pupilDiameterMm);
  return m.coefficientsUm.flatMap((c, j) => (j < 3 || c === 0 ? [] : [{ ...zernikeOrders(j), coefficientUm: c, pupilScale }]));
}

/** Wavefront terms at a wavelength: the viewer's and typical residual refraction, LCA, and typical higher orders. */
export function eyeTerms(input: EyeOpticsInput, wavelengthNm: number): ZernikeTerm[] {
  const chromatic = chromaticRefractionD(wavelengthNm) - chromaticRefractionD(FOCUS_WAVELENGTH_NM);
  const prescription = powerVectorFromPrescription(0, input.cylinderD, input.axisDeg);
  const second = zernikeFromPowerVector({
    // + is hyperopic (focus behind the retina); LCA makes short wavelengths more myopic.
    mD: input.defocusD + residualLagD(input) + chromatic,
    j0D: prescription.j0D + (input.measured ? 0 : TYPICAL_EYE.residualJ0D),
    j45D: prescription.j45D,
  }, input.pupilDiameterMm / 2);
  return [...second, ...(input.measured ? measuredTerms(input) : typicalHigherOrderTerms(input.pupilDiameterMm))];
}

/** Sampling of the fine PSF grid: an odd number of samples per frame pixel, fine enough for the shortest wavelength. */
export function psfGridFor(input: EyeOpticsInput): { grid: PsfGrid; oversample: number } {
  const pixelRad = input.pixelArcmin / ARCMIN_PER_RAD;
  const shortestNm = Math.min(...PRIMARY_BANDS.flat().map((b) => b.wavelengthNm));
  const maxSampleRad = (shortestNm * 1e-9) / (2 * input.pupilDiameterMm * 1e-3);
  let oversample = Math.ceil(pixelRad / maxSampleRad);
  if (oversample % 2 === 0) oversample++;
  const sampleRad = pixelRad / oversample;
  // Window: 2.5 blur-circle diameters of the worst channel (the blue band sits about 1 D myopic of
  // the focus wavelength), at least 40 diffraction widths and 8 frame pixels.
  const lcaD = Math.max(...PRIMARY_BANDS.flat().map((b) => Math.abs(chromaticRefractionD(b.wavelengthNm) - chromaticRefractionD(FOCUS_WAVELENGTH_NM))));
  const worstBlurD = Math.hypot(Math.abs(input.defocusD) + TYPICAL_EYE.residualLagD + lcaD, Math.abs(input.cylinderD) / 2 + TYPICAL_EYE.residualJ0D);
  const windowRad = Math.max(2.5 * input.pupilDiameterMm * 1e-3 * worstBlurD, 40 * maxSampleRad * 2, 8 * pixelRad);
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

export function computeEyeOptics(requested: EyeOpticsInput): EyeOptics {
  // Measured coefficients say nothing beyond their pupil: a larger pupil is limited to it.
  const input = requested.measured && requested.pupilDiameterMm > requested.measured.pupilDiameterMm
    ? { ...requested, pupilDiameterMm: requested.measured.pupilDiameterMm }
    : requested;
  const { grid, oversample } = psfGridFor(input);
  const channelPsfs = PRIMARY_BANDS.map((band) => {
    const sum = new Float64Array(grid.size * grid.size);
    for (const { wavelengthNm, weight } of band) {
      const psf = monochromaticPsf(input.pupilDiameterMm, wavelengthNm, eyeTerms(input, wavelengthNm), grid);
      for (let i = 0; i < sum.length; i++) sum[i] += weight * psf[i];
    }
    return sum;
  });
  const kernels = channelPsfs.map((psf) => binPsfToPixels(psf, grid, oversample));

  const mono = monochromaticPsf(input.pupilDiameterMm, 555, eyeTerms(input, 555), grid);
  const otf = otfMagnitude(mono, grid.size);
  const peak = mono.reduce((a, b) => Math.max(a, b), 0);
  const channelDefocus = (band: number): number => {
    const centreNm = PRIMARY_BANDS[band].reduce((a, b) => a + b.wavelengthNm * b.weight, 0);
    return input.defocusD + residualLagD(input) + chromaticRefractionD(centreNm) - chromaticRefractionD(FOCUS_WAVELENGTH_NM);
  };
  return {
    kernels,
    channelPsfs,
    grid,
    figures: {
      strehlRatio: peak / diffractionLimitedPeak(input.pupilDiameterMm, 555, grid),
      mtfAt5Cpd: radialAverage(otf, grid, 5),
      mtfAt10Cpd: radialAverage(otf, grid, 10),
      mtfAt20Cpd: radialAverage(otf, grid, 20),
      mtfAt30Cpd: radialAverage(otf, grid, 30),
      encircledEnergy50DiameterArcmin: encircledEnergyDiameterArcmin(mono, grid, 0.5),
      encircledEnergy80DiameterArcmin: encircledEnergyDiameterArcmin(mono, grid, 0.8),
      defocusByChannelD: { red: channelDefocus(0), green: channelDefocus(1), blue: channelDefocus(2) },
      focusWavelengthNm: FOCUS_WAVELENGTH_NM,
      aberrations: input.measured ? 'measured' : 'typical eye',
      opticalPupilDiameterMm: input.pupilDiameterMm,
      psfSampleArcmin: grid.sampleRad * ARCMIN_PER_RAD,
    },
  };
}
