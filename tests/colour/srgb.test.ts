import Color from 'colorjs.io';
import { describe, expect, test } from 'vitest';
import { LINEAR_SRGB_TO_XYZ, linearSrgbToXyz, linearToSrgb, srgbToLinear } from '../../src/colour/srgb.js';

describe('sRGB transfer (IEC 61966-2-1:1999)', () => {
  test.each([
    [10, 0.003035],
    [50, 0.031896],
    [128, 0.215861],
    [188, 0.502886],
  ])('8-bit %i decodes to %f (IEC 61966-2-1, derived)', (code, linear) => {
    expect(srgbToLinear(code / 255)).toBeCloseTo(linear, 6);
  });

  test('the decoding branches meet at 0.04045 to 1e-8, the encoding ones at 0.0031308 to 5e-8 (IEC 61966-2-1, derived)', () => {
    const t = 0.04045;
    expect(Math.abs(t / 12.92 - ((t + 0.055) / 1.055) ** 2.4)).toBeLessThan(1e-8);
    expect(Math.abs(12.92 * 0.0031308 - (1.055 * 0.0031308 ** (1 / 2.4) - 0.055))).toBeLessThan(5e-8);
  });

  test('encode inverts decode over all 8-bit codes (IEC 61966-2-1)', () => {
    for (let v = 0; v < 256; v++) expect(linearToSrgb(srgbToLinear(v / 255)) * 255).toBeCloseTo(v, 9);
  });
});

describe('linear sRGB to XYZ (D65)', () => {
  test('white maps to the D65 white point (0.95046, 1, 1.08906) (derived from IEC 61966-2-1 primaries)', () => {
    const xyz = linearSrgbToXyz([0, 0, 0], [1, 1, 1]);
    expect(xyz[0]).toBeCloseTo(0.95046, 4);
    expect(xyz[1]).toBeCloseTo(1, 6);
    expect(xyz[2]).toBeCloseTo(1.08906, 4);
  });

  test('matrix matches the IEC 4-decimal matrix (IEC 61966-2-1)', () => {
    const iec = [[0.4124, 0.3576, 0.1805], [0.2126, 0.7152, 0.0722], [0.0193, 0.1192, 0.9505]];
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(Math.abs(LINEAR_SRGB_TO_XYZ[i][j] - iec[i][j])).toBeLessThan(1e-4);
  });

  test.each([
    [1, 0, 0], [0, 1, 0], [0, 0, 1], [0.2, 0.5, 0.8], [0.9, 0.1, 0.4],
  ])('linear (%f, %f, %f) agrees with colorjs.io srgb-linear → xyz-d65 to 2e-4 (general colour library)', (r, g, b) => {
    const ours = linearSrgbToXyz([0, 0, 0], [r, g, b]);
    const ref = new Color('srgb-linear', [r, g, b]).to('xyz-d65').coords;
    for (let i = 0; i < 3; i++) expect(Math.abs(ours[i] - (ref[i] as number))).toBeLessThan(2e-4);
  });
});
