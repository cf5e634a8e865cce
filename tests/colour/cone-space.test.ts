import Color from 'colorjs.io';
import { describe, expect, test } from 'vitest';
import { HPE_D65_XYZ_TO_LMS, LINEAR_SRGB_TO_OPPONENT, LINEAR_SRGB_TO_LMS, OPPONENT_TO_LINEAR_SRGB, SMITH_POKORNY_XYZ_TO_LMS } from '../../src/colour/cone-space.js';
import { apply3 } from '../../src/colour/matrix3.js';
import { scotopicLuminance, scotopicOfLinearSrgb } from '../../src/colour/scotopic.js';

describe('cone fundamentals', () => {
  test('Smith & Pokorny: L + M = Y for any XYZ, to the 5-decimal rounding of the published matrix (Smith & Pokorny 1975)', () => {
    for (const xyz of [[0.95047, 1, 1.08883], [0.2, 0.5, 0.1], [0.4, 0.2, 0.9]] as [number, number, number][]) {
      const [l, m] = apply3(SMITH_POKORNY_XYZ_TO_LMS, xyz);
      expect(Math.abs(l + m - xyz[1])).toBeLessThan(1e-4);
    }
  });

  test('Hunt–Pointer–Estévez (D65-normalised) takes D65 (×100) to (100.00, 100.00, 99.98) (checked matrix)', () => {
    const [l, m, s] = apply3(HPE_D65_XYZ_TO_LMS, [95.047, 100, 108.883]);
    expect(l).toBeCloseTo(100.0, 1);
    expect(m).toBeCloseTo(100.0, 1);
    expect(s).toBeCloseTo(99.98, 1);
  });

  test('sRGB → LMS agrees with colorjs.io sRGB → XYZ followed by the Smith & Pokorny matrix (general colour library)', () => {
    for (const rgb of [[1, 0, 0], [0.2, 0.6, 0.3], [0.9, 0.9, 0.1]] as [number, number, number][]) {
      const xyz = new Color('srgb-linear', rgb).to('xyz-d65').coords as [number, number, number];
      const ref = apply3(SMITH_POKORNY_XYZ_TO_LMS, xyz);
      const ours = apply3(LINEAR_SRGB_TO_LMS, rgb);
      for (let i = 0; i < 3; i++) expect(Math.abs(ours[i] - ref[i])).toBeLessThan(2e-4);
    }
  });
});

describe('opponent channels', () => {
  test('the achromatic channel is luminance Y and greys have no chroma (design of the weights)', () => {
    const [a, rg, by] = apply3(LINEAR_SRGB_TO_OPPONENT, [0.5, 0.5, 0.5]);
    expect(Math.abs(a - 0.5)).toBeLessThan(1e-4);
    expect(rg).toBeCloseTo(0, 12);
    expect(by).toBeCloseTo(0, 12);
  });

  test('red is +RG, green −RG, blue +BY, yellow −BY (opponent construction, common practice)', () => {
    expect(apply3(LINEAR_SRGB_TO_OPPONENT, [1, 0, 0])[1]).toBeGreaterThan(0);
    expect(apply3(LINEAR_SRGB_TO_OPPONENT, [0, 1, 0])[1]).toBeLessThan(0);
    expect(apply3(LINEAR_SRGB_TO_OPPONENT, [0, 0, 1])[2]).toBeGreaterThan(0);
    expect(apply3(LINEAR_SRGB_TO_OPPONENT, [1, 1, 0])[2]).toBeLessThan(0);
  });

  test('the round trip RGB → opponent → RGB is exact to 1e-12', () => {
    for (const rgb of [[1, 0, 0], [0.2, 0.6, 0.3], [0.01, 0.9, 0.4]] as [number, number, number][]) {
      const back = apply3(OPPONENT_TO_LINEAR_SRGB, apply3(LINEAR_SRGB_TO_OPPONENT, rgb));
      for (let i = 0; i < 3; i++) expect(back[i]).toBeCloseTo(rgb[i], 12);
    }
  });
});

describe('scotopic luminance, Larson, Rushmeier & Piatko (1997)', () => {
  test('Y_s/Y: D65 → 2.5729 (derived)', () => {
    expect(scotopicLuminance(0.95047, 1, 1.08883) / 1).toBeCloseTo(2.5729, 3);
  });
  test.each([
    [[1, 0, 0], 0.398],
    [[0, 1, 0], 2.753],
    [[0, 0, 1], 7.186],
  ] as const)('sRGB primary %j → Y_s/Y = %f (derived)', (rgb, ratio) => {
    // Y of the primaries: the middle row of the sRGB matrix (IEC 61966-2-1).
    const y = 0.2126729 * rgb[0] + 0.7151522 * rgb[1] + 0.072175 * rgb[2];
    expect(scotopicOfLinearSrgb(...(rgb as [number, number, number])) / y).toBeCloseTo(ratio, 2);
  });
});
