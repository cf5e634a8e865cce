import { describe, expect, test } from 'vitest';
import { criticalSpacingDeg, judgeLabel, type LabelMaps } from '../../src/analysis/labels.js';
import { InputError } from '../../src/errors.js';
import { parseLabels } from '../../src/io/read-labels.js';

/** Uniform maps: every pixel 1′, at a given eccentricity, needing `smallest` px letters. */
function maps(smallest: number, eccentricityDeg: number, fixatedPx = 5): LabelMaps {
  const width = 200;
  const height = 100;
  const n = width * height;
  return {
    width, height,
    smallestLetterPx: new Float32Array(n).fill(smallest),
    eccentricityDeg: new Float32Array(n).fill(eccentricityDeg),
    arcminPerPx: new Float32Array(n).fill(1),
    limitAt: () => 'retina',
    fixated: () => ({ px: fixatedPx, limitedBy: 'display pixels' }),
  };
}

describe('crowding, Song, Levi & Pelli (2014) Eq. 14', () => {
  test('critical spacing 0.135° at the fovea and 3.135° at 10° (Song, Levi & Pelli 2014, derived)', () => {
    expect(criticalSpacingDeg(0)).toBeCloseTo(0.135, 10);
    expect(criticalSpacingDeg(10)).toBeCloseTo(3.135, 10);
  });
});

describe('label verdicts', () => {
  const label = { id: 'a', text: 'ABCDE', boxPx: [10, 10, 100, 30] as [number, number, number, number], letterHeightPx: 24 };

  test('twice the smallest letter with room between letters is readable (reading reserve 2×, Whittaker & Lovie-Kitchin 1993)', () => {
    const v = judgeLabel(label, maps(12, 0));
    // Advance 100 px / 5 letters = 20′ against a critical spacing of 8.1′ at the fovea.
    expect(v.letterAdvanceArcmin).toBeCloseTo(20, 10);
    expect(v.fromGaze.criticalSpacingArcmin).toBeCloseTo(8.1, 10);
    expect(v.fromGaze.sizeMargin).toBeCloseTo(2, 10);
    expect(v.fromGaze.verdict).toBe('readable');
  });

  test('between 1× and 2× the smallest letter is legible but not readable', () => {
    expect(judgeLabel(label, maps(16, 0)).fromGaze.verdict).toBe('legible');
  });

  test('below the smallest letter is not legible, limited by size and by what sets it', () => {
    const v = judgeLabel(label, maps(30, 0));
    expect(v.fromGaze.verdict).toBe('not legible');
    expect(v.fromGaze.limitedBy).toBe('size (retina)');
    expect(v.whenFixated.verdict).toBe('readable');
  });

  test('big letters 10° from the gaze are still crowded at ordinary spacing (Bouma 1970; Song, Levi & Pelli 2014)', () => {
    const v = judgeLabel(label, maps(10, 10));
    expect(v.fromGaze.sizeMargin).toBeGreaterThan(2);
    expect(v.fromGaze.spacingMargin!).toBeLessThan(1);
    expect(v.fromGaze.verdict).toBe('not legible');
    expect(v.fromGaze.limitedBy).toBe('spacing');
  });

  test('a single character cannot crowd itself', () => {
    const v = judgeLabel({ ...label, text: '7', boxPx: [10, 10, 20, 30] }, maps(10, 10));
    expect(v.fromGaze.spacingMargin).toBeNull();
    expect(v.fromGaze.verdict).toBe('readable');
  });

  test('the worst place in the box decides', () => {
    const m = maps(10, 0);
    m.smallestLetterPx[20 * 200 + 105] = 40;
    expect(judgeLabel(label, m).fromGaze.smallestLetterPx).toBe(40);
  });
});

describe('labels files', () => {
  test('every problem names the label and the field', () => {
    const text = JSON.stringify({ labels: [{ id: 'ok', text: 'A', boxPx: [0, 0, 10, 10], letterHeightPx: 8 }, { id: 'bad', text: 3, boxPx: [90, 0, 20, 10], letterHeightPx: 0 }] });
    try {
      parseLabels(text, 'x.labels.json', 100, 50);
      throw new Error('expected an InputError');
    } catch (err) {
      expect(err).toBeInstanceOf(InputError);
      const message = (err as Error).message;
      expect(message).toMatch(/labels\[1\] \("bad"\)\.text/);
      expect(message).toMatch(/labels\[1\] \("bad"\)\.boxPx/);
      expect(message).toMatch(/labels\[1\] \("bad"\)\.letterHeightPx/);
      expect(message).not.toMatch(/"ok"/);
    }
  });

  test('a file without a labels array is refused', () => {
    expect(() => parseLabels('{"items": []}', 'x.json', 10, 10)).toThrow(/no "labels" array/);
    expect(() => parseLabels('not json', 'x.json', 10, 10)).toThrow(InputError);
  });
});
