import { describe, expect, test } from 'vitest';
import { chromaticRefractionD } from '../../src/optics/chromatic.js';
import { computeEyeOptics, typicalHigherOrderTerms, TYPICAL_EYE } from '../../src/optics/eye-optics.js';
import { diffractionMtf } from '../../src/optics/mean-mtf.js';
import { defocusDiopters, powerVectorFromPrescription, prescriptionFromPowerVector, zernikeFromPowerVector } from '../../src/optics/power-vector.js';
import { binPsfToPixels, encircledEnergyDiameterArcmin, monochromaticPsf, radialMtf } from '../../src/optics/pupil-psf.js';
import { zernike, zernikeIndex, zernikeOrders } from '../../src/optics/zernike.js';

const ARCMIN_PER_RAD = (180 / Math.PI) * 60;

describe('Zernike polynomials (ANSI Z80.28; Thibos et al. 2002)', () => {
  test('single index: j 4 = defocus, 3 and 5 = astigmatism, 12 = primary spherical', () => {
    expect(zernikeIndex(2, 0)).toBe(4);
    expect(zernikeIndex(2, -2)).toBe(3);
    expect(zernikeIndex(2, 2)).toBe(5);
    expect(zernikeIndex(4, 0)).toBe(12);
    expect(zernikeOrders(12)).toEqual({ n: 4, m: 0 });
  });
  test('each term has unit RMS over the pupil (numerical integration)', () => {
    for (const [n, m] of [[2, 0], [2, 2], [3, -1], [4, 0], [3, 3]]) {
      let sum = 0;
      let count = 0;
      for (let y = -1; y <= 1; y += 0.01) for (let x = -1; x <= 1; x += 0.01) {
        const r = Math.hypot(x, y);
        if (r > 1) continue;
        sum += zernike(n, m, r, Math.atan2(y, x)) ** 2;
        count++;
      }
      expect(Math.sqrt(sum / count)).toBeCloseTo(1, 2);
    }
  });
});

describe('power vectors, Thibos, Hong, Bradley & Applegate (2004)', () => {
  test('c₂⁰ = 1 µm over a 3 mm radius is M = −0.7698 D; 1 D over a 5 mm pupil is |c₂⁰| = 0.9021 µm (derived)', () => {
    expect(defocusDiopters(1, 3)).toBeCloseTo(-0.7698, 4);
    expect(Math.abs(zernikeFromPowerVector({ mD: 1, j0D: 0, j45D: 0 }, 2.5)[0].coefficientUm)).toBeCloseTo(0.9021, 4);
  });
  test('sphere/cylinder/axis survive a round trip through power vectors (negative-cylinder form)', () => {
    const back = prescriptionFromPowerVector(powerVectorFromPrescription(-1.25, -0.75, 30));
    expect(back.sphereD).toBeCloseTo(-1.25, 10);
    expect(back.cylinderD).toBeCloseTo(-0.75, 10);
    expect(back.axisDeg).toBeCloseTo(30, 8);
  });
});

describe('longitudinal chromatic aberration, Thibos et al. (1992) chromatic eye', () => {
  test('Rx(450) − Rx(650) = −1.232 D; Rx(400) − Rx(700) = −2.104 D (derived)', () => {
    expect(chromaticRefractionD(450) - chromaticRefractionD(650)).toBeCloseTo(-1.232, 3);
    expect(chromaticRefractionD(400) - chromaticRefractionD(700)).toBeCloseTo(-2.104, 3);
  });
});

describe('PSF from the pupil function (Goodman; Born & Wolf)', () => {
  // 3 mm pupil at 555 nm, four samples per λ/(2D).
  const grid = { size: 256, sampleRad: 555e-9 / (2 * 3e-3) / 4 };
  const perfect = monochromaticPsf(3, 555, [], grid);

  test('diffraction-limited: the Airy pattern has its first zero at 1.22 λ/D = 0.7759′ (Born & Wolf)', () => {
    const row = Array.from({ length: 20 }, (_, k) => perfect[128 * 256 + 128 + k]);
    const firstMin = row.findIndex((v, k) => k > 2 && v < row[k - 1] && v <= row[k + 1]);
    expect(firstMin * grid.sampleRad * ARCMIN_PER_RAD).toBeCloseTo(0.7759, 1);
  });

  test('diffraction-limited MTF equals the analytic circular-pupil MTF (Born & Wolf), e.g. 0.391 at half the 94.34 cpd cutoff', () => {
    for (const f of [10, 30, 47.17, 70]) expect(radialMtf(perfect, grid, f)).toBeCloseTo(diffractionMtf(f / 94.34), 2);
  });

  test('Maréchal: a wavefront of RMS λ/14 has a Strehl ratio of about 0.8176 (Maréchal approximation)', () => {
    const psf = monochromaticPsf(3, 555, [{ n: 4, m: 0, coefficientUm: 0.555 / 14 }], grid);
    const peak = (p: Float64Array): number => p.reduce((a, b) => Math.max(a, b), 0);
    expect(peak(psf) / peak(perfect)).toBeCloseTo(0.8176, 1);
  });

  test('large defocus approaches the geometric blur circle: 80 % of the energy within √0.8 of its diameter (geometric optics)', () => {
    const defocusGrid = { size: 512, sampleRad: 555e-9 / (2 * 5e-3) };
    const psf = monochromaticPsf(5, 555, zernikeFromPowerVector({ mD: 2, j0D: 0, j45D: 0 }, 2.5), defocusGrid);
    const blurArcmin = 5e-3 * 2 * ARCMIN_PER_RAD;
    expect(encircledEnergyDiameterArcmin(psf, defocusGrid, 0.8) / (Math.sqrt(0.8) * blurArcmin)).toBeCloseTo(1, 1);
  });

  test('every PSF and every binned kernel holds all the light (energy conservation)', () => {
    expect(perfect.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 10);
    const { kernel } = binPsfToPixels(perfect, grid, 5);
    expect(kernel.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 5);
  });

  test('uncorrected astigmatism spreads the PSF into an ellipse whose orientation follows the axis (power vectors)', () => {
    const moments = (axisDeg: number): [number, number] => {
      const psf = monochromaticPsf(3, 555, zernikeFromPowerVector(powerVectorFromPrescription(0, -1, axisDeg), 1.5), { size: 256, sampleRad: grid.sampleRad });
      let sxx = 0;
      let syy = 0;
      for (let y = 0; y < 256; y++) for (let x = 0; x < 256; x++) {
        sxx += psf[y * 256 + x] * (x - 128) ** 2;
        syy += psf[y * 256 + x] * (y - 128) ** 2;
      }
      return [sxx, syy];
    };
    const [x90, y90] = moments(90);
    const [x180, y180] = moments(180);
    expect(Math.max(x90, y90) / Math.min(x90, y90)).toBeGreaterThan(2);
    // Turning the axis by 90° swaps the long and short directions.
    expect(Math.sign(x90 - y90)).toBe(-Math.sign(x180 - y180));
  });
});

describe('the typical eye against published population figures', () => {
  test('typical higher-order aberrations at the population’s age: RMS 0.33 µm at 6 mm with |c₄⁰| = 0.13 µm (Salmon & van de Pol 2006)', () => {
    const terms = typicalHigherOrderTerms(6, TYPICAL_EYE.referenceAgeYears);
    const rms = Math.sqrt(terms.reduce((a, t) => a + t.coefficientUm ** 2, 0));
    expect(rms).toBeCloseTo(0.33, 3);
    expect(terms.find((t) => t.n === 4 && t.m === 0)?.coefficientUm).toBeCloseTo(0.13, 6);
  });

  test('higher-order RMS over 5 mm grows by 0.0032 µm a year and spherical aberration by 0.0011 µm (Berrio, Tabernero & Artal 2010)', () => {
    const at = (age: number): { rms: number; sa: number } => {
      const terms = typicalHigherOrderTerms(5, age);
      return { rms: Math.sqrt(terms.reduce((a, t) => a + t.coefficientUm ** 2, 0)), sa: terms.find((t) => t.n === 4)!.coefficientUm };
    };
    expect((at(70).rms - at(30).rms) / 40).toBeCloseTo(0.0032, 6);
    expect((at(70).sa - at(30).sa) / 40).toBeCloseTo(0.0011, 6);
  });
});

describe('Strehl ratio reference', () => {
  test('the analytic diffraction-limited peak equals the computed perfect PSF peak (Parseval)', async () => {
    const { diffractionLimitedPeak } = await import('../../src/optics/eye-optics.js');
    const grid = { size: 128, sampleRad: 555e-9 / (2 * 3e-3) / 2 };
    const perfect = monochromaticPsf(3, 555, [], grid);
    expect(diffractionLimitedPeak(3, 555, grid) / perfect.reduce((a, b) => Math.max(a, b), 0)).toBeCloseTo(1, 6);
  });
});

describe('compiled wavefront (fast path) against the term-by-term evaluation (slow reference)', () => {
  test('both give the same wavefront to 1e-12', async () => {
    const { compileWavefront, wavefrontUm } = await import('../../src/optics/zernike.js');
    const terms = [{ n: 2, m: 0, coefficientUm: 0.3 }, { n: 3, m: -1, coefficientUm: -0.2 }, { n: 4, m: 0, coefficientUm: 0.1, pupilScale: 0.5 }, { n: 3, m: 3, coefficientUm: 0.05 }];
    const fast = compileWavefront(terms);
    for (const [r, t] of [[0, 0], [0.3, 1], [0.9, -2], [1, 3]]) expect(fast(r, t)).toBeCloseTo(wavefrontUm(terms, r, t), 12);
  });
});
