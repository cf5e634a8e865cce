import Color from 'colorjs.io';
import { describe, expect, test } from 'vitest';
import { contrastRatio, LARGE_TEXT_CAP_ARCMIN, requiredRatio, retinalContrastRatio, textClasses } from '../../src/analysis/contrast.js';
import { srgbToLinear } from '../../src/colour/srgb.js';

/** WCAG relative luminance of an 8-bit sRGB grey, via our own decoding. */
const grey = (v: number): number => srgbToLinear(v / 255);

describe('WCAG 2.2 contrast ratio', () => {
  test('black on white is 21:1 (WCAG 2.2, definition of contrast ratio)', () => {
    expect(contrastRatio(0, 1)).toBeCloseTo(21, 10);
  });

  test('matches colorjs.io\'s WCAG 2.1 contrast for greys and colours (general-purpose colour library)', () => {
    for (const [a, b] of [['#767676', '#ffffff'], ['#777777', '#ffffff'], ['#4a5563', '#ffffff'], ['#10263f', '#dfe3e8'], ['#ff9a60', '#5a1500']]) {
      const la = new Color(a).luminance;
      const lb = new Color(b).luminance;
      expect(contrastRatio(la, lb)).toBeCloseTo(new Color(a).contrast(new Color(b), 'WCAG21'), 6);
    }
    // #767676 on white is the lightest grey passing 4.5:1 (common practice, from memory: 4.54:1).
    expect(contrastRatio(grey(0x76), 1)).toBeGreaterThan(4.5);
    expect(contrastRatio(grey(0x77), 1)).toBeLessThan(4.5);
  });

  test('text of 18 pt and larger needs 3:1, smaller text 4.5:1 (WCAG 2.2 SC 1.4.3; CSS reference pixel 0.0213°)', () => {
    // 24 CSS px of font size × 0.7 capital per em × 1.278′ per CSS px.
    expect(LARGE_TEXT_CAP_ARCMIN).toBeCloseTo(24 * 0.7 * 1.278, 2);
    expect(requiredRatio(LARGE_TEXT_CAP_ARCMIN)).toBe(3);
    expect(requiredRatio(LARGE_TEXT_CAP_ARCMIN - 0.01)).toBe(4.5);
  });
});

describe('text and background of a box (Otsu 1979)', () => {
  test('splits a two-level box exactly and takes the smaller class as text', () => {
    const w = 50;
    const lum = new Float32Array(w * 20).fill(0.9);
    for (let y = 5; y < 15; y++) for (let x = 0; x < w; x += 5) lum[y * w + x] = 0.1;
    const c = textClasses(lum, w, [0, 0, w, 20]);
    expect(c.text).toBeCloseTo(0.1, 6);
    expect(c.background).toBeCloseTo(0.9, 6);
    expect(c.textShare).toBeCloseTo(0.1, 6);
  });

  test('a uniform box has no text contrast', () => {
    const c = textClasses(new Float32Array(100).fill(0.4), 10, [0, 0, 10, 10]);
    expect(contrastRatio(c.text, c.background)).toBe(1);
  });
});

describe('contrast reaching the retina', () => {
  test('a perfect eye without stray light keeps the frame\'s ratio; blur and veil lower it (standard optics)', () => {
    const classes = { text: 0, background: 1, textShare: 0.2 };
    const perfect = retinalContrastRatio({ classes, strokeTransfer: 1, coreFraction: 1, veil: 0, blackShare: 0 });
    expect(perfect).toBeCloseTo(21, 10);
    const blurred = retinalContrastRatio({ classes, strokeTransfer: 0.5, coreFraction: 1, veil: 0, blackShare: 0 });
    // Text at 0.5 of the way to the background: (1.05)/(0.55).
    expect(blurred).toBeCloseTo(1.05 / 0.55, 10);
    const veiled = retinalContrastRatio({ classes, strokeTransfer: 1, coreFraction: 0.9, veil: 0.1, blackShare: 0 });
    expect(veiled).toBeCloseTo((0.9 + 0.1 + 0.05) / (0.1 + 0.05), 10);
  });
});
