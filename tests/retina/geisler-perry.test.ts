import { describe, expect, test } from 'vitest';
import { geislerPerryCutoffCpd, geislerPerryThreshold } from '../../src/retina/geisler-perry.js';

describe('contrast-threshold model, Geisler & Perry (1998)', () => {
  test('cutoff f_c(0) = 39.235 cpd, f_c(10°) = 7.337 cpd (Geisler & Perry 1998, derived)', () => {
    expect(geislerPerryCutoffCpd(0)).toBeCloseTo(39.235, 3);
    expect(geislerPerryCutoffCpd(10)).toBeCloseTo(7.337, 3);
  });
  test('the threshold is 1 at the cutoff and CT0 = 1/64 at zero frequency (Geisler & Perry 1998)', () => {
    expect(geislerPerryThreshold(geislerPerryCutoffCpd(5), 5)).toBeCloseTo(1, 10);
    expect(geislerPerryThreshold(0, 5)).toBeCloseTo(1 / 64, 12);
  });
});
