/**
 * Where the display's light lies in wavelength: the CIE 1931 observer table, the primaries' hues
 * against sRGB (through colorjs.io, a general colour library), and the off-axis optics table.
 */
import Color from 'colorjs.io';
import { describe, expect, test } from 'vitest';
import { CIE_1931_X, CIE_1931_Y, CIE_1931_Z, cie1931WavelengthNm } from '../../src/colour/data/cie-1931-2deg.js';
import { CHANNEL_WAVELENGTHS, PRIMARY_SPECTRA, primaryEmission } from '../../src/optics/display-spectra.js';
import { navarroMtf, offAxisRatio } from '../../src/optics/off-axis.js';

const sum = (a: Float64Array): number => a.reduce((s, v) => s + v, 0);

describe('CIE 1931 2° observer (CIE 015:2018), as tabulated every 5 nm', () => {
  test('ȳ is V(λ): 1 at 555 nm, its peak (CIE 1924)', () => {
    const i555 = (555 - 380) / 5;
    expect(cie1931WavelengthNm(i555)).toBe(555);
    expect(CIE_1931_Y[i555]).toBeCloseTo(1, 4);
    expect(Math.max(...CIE_1931_Y)).toBe(CIE_1931_Y[i555]);
  });

  test('x̄, ȳ and z̄ have equal areas (the equal-energy white sits at x = y = 1/3, CIE 015)', () => {
    expect(sum(CIE_1931_X) / sum(CIE_1931_Y)).toBeCloseTo(1, 2);
    expect(sum(CIE_1931_Z) / sum(CIE_1931_Y)).toBeCloseTo(1, 2);
  });
});

/** Chromaticity (x, y) of a spectrum given at the table's wavelengths. */
function chromaticity(emission: (nm: number) => number): [number, number] {
  let [x, y, z] = [0, 0, 0];
  for (let i = 0; i < CIE_1931_Y.length; i++) {
    const e = emission(cie1931WavelengthNm(i));
    x += e * CIE_1931_X[i];
    y += e * CIE_1931_Y[i];
    z += e * CIE_1931_Z[i];
  }
  return [x / (x + y + z), y / (x + y + z)];
}

describe('the display primaries (our proposal: Gaussian bands with the sRGB hues)', () => {
  const D65: [number, number] = [0.3127, 0.329];
  const hue = ([x, y]: [number, number]): number => (Math.atan2(y - D65[1], x - D65[0]) * 180) / Math.PI;

  test.each([['red', [1, 0, 0]], ['green', [0, 1, 0]], ['blue', [0, 0, 1]]] as const)('the %s band has the hue around D65 of the sRGB primary (IEC 61966-2-1, via colorjs.io) within 0.5°', (name, rgb) => {
    const band = PRIMARY_SPECTRA.find((b) => b.name === name)!;
    const [X, Y, Z] = new Color('srgb-linear', [...rgb]).to('xyz-d65').coords.map(Number);
    const srgb: [number, number] = [X / (X + Y + Z), Y / (X + Y + Z)];
    expect(Math.abs(hue(chromaticity((nm) => primaryEmission(band, nm))) - hue(srgb))).toBeLessThan(0.5);
  });

  test('each channel is sampled at three wavelengths whose shares sum to 1, inside the visible range, in the order blue < green < red', () => {
    for (const samples of CHANNEL_WAVELENGTHS) {
      expect(samples.reduce((s, v) => s + v.weight, 0)).toBeCloseTo(1, 12);
      for (const s of samples) {
        expect(s.wavelengthNm).toBeGreaterThan(400);
        expect(s.wavelengthNm).toBeLessThan(700);
      }
    }
    const means = CHANNEL_WAVELENGTHS.map((s) => s[0].wavelengthNm);
    expect(means[2]).toBeLessThan(means[1]);
    expect(means[1]).toBeLessThan(means[0]);
  });
});

describe('off-axis optics (Navarro, Artal & Williams 1993, JOSA A 10:201)', () => {
  test('the fitted form at the fovea: (1 − 0.22)·e^(−0.172·10) + 0.22·e^(−0.037·10) = 0.292 at 10 cpd (derived from the table)', () => {
    expect(navarroMtf(0, 10)).toBeCloseTo(0.78 * Math.exp(-1.72) + 0.22 * Math.exp(-0.37), 10);
    expect(navarroMtf(0, 10)).toBeCloseTo(0.292, 3);
  });

  test('image quality declines with eccentricity at 10 cpd and the ratio to the fovea is 1 at the fovea and never above 1', () => {
    let previous = 1;
    for (const e of [0, 5, 20, 30, 40, 60]) {
      const r = offAxisRatio(e, 10);
      expect(r).toBeLessThanOrEqual(previous + 1e-12);
      previous = r;
    }
    expect(offAxisRatio(0, 10)).toBe(1);
    expect(offAxisRatio(40, 10)).toBeLessThan(0.2);
  });
});
