import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { criticalSpacingDeg, crowdingFreeWithinDeg, judgeLabel, type Label, type LabelMaps } from '../../src/analysis/labels.js';
import { InputError } from '../../src/errors.js';
import { parseLabels } from '../../src/io/read-labels.js';

const W = 400;
const H = 100;

interface MapsOptions {
  /** Eccentricity of every pixel, deg, or a function of the column. */
  eccentricityDeg?: number | ((x: number) => number);
  /** Smallest legible letter, px, as a function of eccentricity. */
  letterPx?: (e: number) => number;
  /** Text luminance inside label boxes (background 1). */
  ink?: number;
}

/** Synthetic maps: 1′ per px, a letter rule given as a function, dark bars as text inside [10, 10, 380, 30]. */
function maps(o: MapsOptions = {}): LabelMaps {
  const n = W * H;
  const ecc = new Float32Array(n);
  const e = o.eccentricityDeg ?? 0;
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) ecc[y * W + x] = typeof e === 'number' ? e : e(x);
  const luminance = new Float32Array(n).fill(1);
  for (let y = 14; y < 36; y++) for (let x = 10; x < 390; x++) if (x % 6 < 2) luminance[y * W + x] = o.ink ?? 0;
  const letterPx = o.letterPx ?? ((ec: number) => 5 * (1 + ec / 2.5));
  return {
    width: W, height: H, eccentricityDeg: ecc, meridianDeg: new Float32Array(n), arcminPerPx: new Float32Array(n).fill(1), luminance,
    letterAt: (ec) => ({ px: letterPx(ec), limitedBy: 'retina' }),
    transferAt: () => 1, referenceTransferAt: () => 1, veilAt: () => 0, blackShare: 0, coreFraction: 1,
    units: { pixelRatio: 1, mmPerFramePx: 0.2 },
  };
}

const label: Label = { id: 'a', text: 'ABCDE', boxPx: [10, 10, 100, 30], letterHeightPx: 24 };
const rank = { 'not legible': 0, legible: 1, readable: 2, 'not judged': 3 } as const;

describe('crowding, Song, Levi & Pelli (2014) Eq. 14', () => {
  test('critical spacing 0.135° at the fovea and 3.135° at 10° (Song, Levi & Pelli 2014, derived)', () => {
    expect(criticalSpacingDeg(0)).toBeCloseTo(0.135, 10);
    expect(criticalSpacingDeg(10)).toBeCloseTo(3.135, 10);
    expect(criticalSpacingDeg(crowdingFreeWithinDeg(60))).toBeCloseTo(1, 10);
  });
});

describe('label verdicts by role', () => {
  test('twice the smallest letter with room between letters is readable (reading reserve 2×, Whittaker & Lovie-Kitchin 1993)', () => {
    const v = judgeLabel(label, maps({ letterPx: () => 12 }));
    // Advance 100 px / 5 letters = 20′ against a critical spacing of 8.1′ at the fovea.
    expect(v.letterAdvanceArcmin).toBeCloseTo(20, 10);
    expect(v.whenFixated.criticalSpacingArcmin).toBeCloseTo(8.1, 10);
    expect(v.whenFixated.sizeMargin).toBeCloseTo(2, 10);
    expect(v.role).toBe('look');
    expect(v.verdict).toBe('readable');
    expect(v.passes).toBe(true);
    expect(v.fix).toBeUndefined();
  });

  test('between 1× and 2× the smallest letter is legible, fails on size, and the fix is the capital height that passes', () => {
    const v = judgeLabel(label, maps({ letterPx: () => 16 }));
    expect(v.verdict).toBe('legible');
    expect(v.whenFixated.limitedBy).toBe('size');
    expect(v.fix?.capHeight?.px).toBe(32);
    expect(v.fix?.capHeight?.mm).toBeCloseTo(6.4, 10);
    // 1 pt = 25.4/72 mm (common practice).
    expect(v.fix?.capHeight?.pt).toBeCloseTo(6.4 / (25.4 / 72), 10);
    // The fix is exact: at the height it names the label passes, one px less it does not.
    expect(judgeLabel({ ...label, letterHeightPx: 32 }, maps({ letterPx: () => 16 })).passes).toBe(true);
    expect(judgeLabel({ ...label, letterHeightPx: 31 }, maps({ letterPx: () => 16 })).passes).toBe(false);
  });

  test('a glance label far from the gaze is crowded at ordinary spacing (Bouma 1970; Song, Levi & Pelli 2014) and told how far to move', () => {
    const glance: Label = { ...label, role: 'glance', letterHeightPx: 60, boxPx: [10, 10, 300, 30] };
    const v = judgeLabel(glance, maps({ eccentricityDeg: 10, letterPx: () => 10 }));
    expect(v.fromGaze.sizeMargin).toBeGreaterThan(2);
    expect(v.fromGaze.spacingMargin!).toBeLessThan(1);
    expect(v.verdict).toBe('not legible');
    expect(v.fromGaze.limitedBy).toBe('spacing');
    // Advance 60′: crowding ends at 60/18 − 0.45 = 2.883°.
    expect(v.fix?.passesWithinDeg).toBeCloseTo(crowdingFreeWithinDeg(60), 1);
    expect(v.fix?.moveTowardGazeDeg).toBeCloseTo(10 - crowdingFreeWithinDeg(60), 1);
    // A look label of the same kind passes: it is judged when looked at.
    expect(judgeLabel({ ...glance, role: 'look' }, maps({ eccentricityDeg: 10, letterPx: () => 10 })).passes).toBe(true);
  });

  test('a glance label\'s verdict flips at the eccentricity its fix names (size limit)', () => {
    const glance: Label = { ...label, role: 'glance', letterHeightPx: 30, boxPx: [10, 10, 300, 30] };
    const far = judgeLabel(glance, maps({ eccentricityDeg: 8 }));
    const within = far.fix!.passesWithinDeg!;
    expect(within).toBeGreaterThan(0);
    expect(judgeLabel(glance, maps({ eccentricityDeg: within - 0.02 })).passes).toBe(true);
    expect(judgeLabel(glance, maps({ eccentricityDeg: within + 0.02 })).passes).toBe(false);
  });

  test('decorative labels are not judged', () => {
    const v = judgeLabel({ ...label, role: 'decorative' }, maps({ letterPx: () => 100 }));
    expect(v.verdict).toBe('not judged');
    expect(v.passes).toBeNull();
  });

  test('a single character cannot crowd itself', () => {
    const v = judgeLabel({ ...label, text: '7', boxPx: [10, 10, 20, 30], role: 'glance' }, maps({ eccentricityDeg: 10, letterPx: () => 10 }));
    expect(v.fromGaze.spacingMargin).toBeNull();
  });

  test('the farthest point of the box decides', () => {
    const v = judgeLabel({ ...label, role: 'glance' }, maps({ eccentricityDeg: (x) => x / 20 }));
    expect(v.fromGaze.eccentricityDeg).toBeCloseTo(109 / 20, 5);
  });

  test('dim text fails on contrast with the WCAG 2.2 SC 1.4.3 ratio (4.5:1 for text)', () => {
    // Ink 0.25 on white: (1.05)/(0.30) = 3.5:1; capitals of 16′ are below WCAG's large text (18 pt ≈ 21.5′ of capital).
    const v = judgeLabel({ ...label, letterHeightPx: 16 }, maps({ letterPx: () => 5, ink: 0.25 }));
    expect(v.contrast.frameRatio).toBeCloseTo(3.5, 5);
    expect(v.whenFixated.limitedBy).toBe('contrast');
    expect(v.verdict).toBe('legible');
    expect(v.fix?.contrastRatio).toBeCloseTo(4.5, 5);
    // Large text needs 3:1 only.
    expect(judgeLabel({ ...label, letterHeightPx: 24 }, maps({ letterPx: () => 5, ink: 0.25 })).passes).toBe(true);
  });

  test('stray light over the label lowers the contrast the viewer gets (CIE 180:2010 veil added to text and background)', () => {
    const m = maps({ letterPx: () => 5, ink: 0.05 });
    const clear = judgeLabel(label, m).whenFixated.effectiveContrastRatio;
    const veiled = judgeLabel(label, { ...m, veilAt: () => 0.2 }).whenFixated.effectiveContrastRatio;
    expect(veiled).toBeLessThan(clear);
    // (1 + 0.2 + 0.05) / (0.05 + 0.2 + 0.05), with the frame ratio scaled by the loss.
    expect(veiled).toBeCloseTo(((1.05 / 0.1) * (1.25 / 0.3)) / (1.05 / 0.1), 5);
  });

  test('a label moved toward the gaze never gets a worse verdict (seeded property)', () => {
    fc.assert(fc.property(fc.integer({ min: 0, max: 280 }), fc.integer({ min: 1, max: 100 }), fc.integer({ min: 6, max: 80 }), (x, step, height) => {
      const m = maps({ eccentricityDeg: (col) => col / 15, letterPx: (e) => 4 + 3 * e });
      const at = (bx: number): number => rank[judgeLabel({ ...label, role: 'glance', letterHeightPx: height, boxPx: [bx, 10, 100, 30] }, m).verdict];
      return at(Math.max(0, x - step)) >= at(x);
    }), { seed: 9, numRuns: 200 });
  });
});

describe('labels files', () => {
  test('every problem names the label and the field', () => {
    const text = JSON.stringify({ labels: [{ id: 'ok', text: 'A', boxPx: [0, 0, 10, 10], letterHeightPx: 8 }, { id: 'bad', text: 3, boxPx: [90, 0, 20, 10], letterHeightPx: 0, role: 'skim' }] });
    try {
      parseLabels(text, 'x.labels.json', 100, 50);
      throw new Error('expected an InputError');
    } catch (err) {
      expect(err).toBeInstanceOf(InputError);
      const message = (err as Error).message;
      expect(message).toMatch(/labels\[1\] \("bad"\)\.text/);
      expect(message).toMatch(/labels\[1\] \("bad"\)\.boxPx/);
      expect(message).toMatch(/labels\[1\] \("bad"\)\.letterHeightPx/);
      expect(message).toMatch(/labels\[1\] \("bad"\)\.role: expected one of "glance", "look", "decorative"/);
      expect(message).not.toMatch(/"ok"/);
    }
  });

  test('a file without a labels array is refused', () => {
    expect(() => parseLabels('{"items": []}', 'x.json', 10, 10)).toThrow(/no "labels" array/);
    expect(() => parseLabels('not json', 'x.json', 10, 10)).toThrow(InputError);
  });
});
