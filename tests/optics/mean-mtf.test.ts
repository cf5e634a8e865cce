import { describe, expect, test } from 'vitest';
import { besselJ1, diffractionCutoffCpd, diffractionMtf, diskOtf, watsonMeanMtf } from '../../src/optics/mean-mtf.js';

describe('diffraction (Born & Wolf)', () => {
  test('3 mm pupil at 555 nm has an incoherent cutoff of 94.34 cpd (D/λ, derived)', () => {
    expect(diffractionCutoffCpd(3, 555)).toBeCloseTo(94.34, 2);
  });
  test('MTF at half the cutoff is 0.39100 (circular pupil MTF, derived)', () => {
    expect(diffractionMtf(0.5)).toBeCloseTo(0.391, 5);
    expect(diffractionMtf(0)).toBe(1);
    expect(diffractionMtf(1)).toBe(0);
  });
});

describe('mean optical MTF, Watson (2013)', () => {
  test('d = 3 mm at 10 cpd → 0.5626; d = 4 mm at 20 cpd → 0.1967 (Watson 2013, J Vision 13(6):18)', () => {
    expect(watsonMeanMtf(10, 3)).toBeCloseTo(0.5626, 4);
    expect(watsonMeanMtf(20, 4)).toBeCloseTo(0.1967, 4);
  });
});

describe('uniform blur disk', () => {
  test('J1 matches tabulated values J1(1) = 0.4400505857, J1(5) = −0.3275791376 (Abramowitz & Stegun Table 9.1, from memory)', () => {
    expect(besselJ1(1)).toBeCloseTo(0.4400505857, 9);
    expect(besselJ1(5)).toBeCloseTo(-0.3275791376, 9);
  });
  test('the disk OTF first vanishes at 1.22/b cycles per unit angle (first zero of J1 at 3.8317, common practice)', () => {
    const b = 0.2;
    expect(Math.abs(diskOtf(3.8317 / (Math.PI * b), b))).toBeLessThan(1e-4);
    expect(3.8317 / Math.PI).toBeCloseTo(1.22, 2);
    expect(diskOtf(0, b)).toBe(1);
  });
});
