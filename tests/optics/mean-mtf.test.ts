import { describe, expect, test } from 'vitest';
import { diffractionCutoffCpd, diffractionMtf, watsonMeanMtf } from '../../src/optics/mean-mtf.js';

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
