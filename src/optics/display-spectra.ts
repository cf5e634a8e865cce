/**
 * Spectra of the display's primaries, for the wavelength-dependent parts of the eye (chromatic
 * aberration, and the ageing lens). OUR PROPOSAL for a typical sRGB panel: each primary is a Gaussian
 * emission band whose hue (dominant wavelength around D65) is that of the sRGB primary, with widths
 * typical of LCD and OLED panels (full width at half maximum 40, 50 and 25 nm). The colour pipeline
 * itself uses the sRGB matrices; the spectra only say where in wavelength each channel's light lies.
 *
 * Within a channel the eye's optics are integrated at three wavelengths, the mean and ±√3 standard
 * deviations of the channel's spectrum weighted by V(λ) (three-point Gauss–Hermite quadrature), so
 * that the luminance image of a white frame is computed as the eye sees it.
 */
import { CIE_1931_Y, cie1931WavelengthNm } from '../colour/data/cie-1931-2deg.js';
import { LUMINANCE_WEIGHTS } from '../colour/srgb.js';

export interface PrimaryBand {
  name: 'red' | 'green' | 'blue';
  peakNm: number;
  fullWidthNm: number;
}

/**
 * Peaks chosen so each band has the sRGB primary's hue around D65 (tests/optics/display-spectra.test.ts
 * checks this against the CIE 1931 observer); widths are typical values (our proposal).
 */
export const PRIMARY_SPECTRA: readonly PrimaryBand[] = [
  { name: 'red', peakNm: 621.9, fullWidthNm: 40 },
  { name: 'green', peakNm: 544.2, fullWidthNm: 50 },
  { name: 'blue', peakNm: 462.9, fullWidthNm: 25 },
];

/** Relative emission of a primary at a wavelength (peak 1). */
export function primaryEmission(band: PrimaryBand, wavelengthNm: number): number {
  const sigma = band.fullWidthNm / (2 * Math.sqrt(2 * Math.log(2)));
  return Math.exp(-0.5 * ((wavelengthNm - band.peakNm) / sigma) ** 2);
}

export interface WavelengthSample {
  wavelengthNm: number;
  /** Share of the channel's luminance carried at this wavelength; a channel's shares sum to 1. */
  weight: number;
}

/** Mean and standard deviation (nm) of a primary's spectrum weighted by V(λ). */
export function luminanceWeightedMoments(band: PrimaryBand): { meanNm: number; sdNm: number } {
  let w = 0;
  let m1 = 0;
  let m2 = 0;
  for (let i = 0; i < CIE_1931_Y.length; i++) {
    const l = cie1931WavelengthNm(i);
    const e = primaryEmission(band, l) * CIE_1931_Y[i];
    w += e;
    m1 += e * l;
    m2 += e * l * l;
  }
  const meanNm = m1 / w;
  return { meanNm, sdNm: Math.sqrt(m2 / w - meanNm * meanNm) };
}

/** Three wavelengths per channel (Gauss–Hermite: weights 2/3, 1/6, 1/6). */
export const CHANNEL_WAVELENGTHS: readonly (readonly WavelengthSample[])[] = PRIMARY_SPECTRA.map((band) => {
  const { meanNm, sdNm } = luminanceWeightedMoments(band);
  return [
    { wavelengthNm: meanNm, weight: 2 / 3 },
    { wavelengthNm: meanNm - Math.sqrt(3) * sdNm, weight: 1 / 6 },
    { wavelengthNm: meanNm + Math.sqrt(3) * sdNm, weight: 1 / 6 },
  ];
});

/** Luminance of each channel at full drive, from the sRGB matrix (IEC 61966-2-1): sums to 1. */
export const CHANNEL_LUMINANCE: readonly [number, number, number] = [LUMINANCE_WEIGHTS[0], LUMINANCE_WEIGHTS[1], LUMINANCE_WEIGHTS[2]];

/** Shortest wavelength sampled, nm (sets the finest PSF sampling needed). */
export const SHORTEST_SAMPLED_NM = Math.min(...CHANNEL_WAVELENGTHS.flat().map((s) => s.wavelengthNm));
