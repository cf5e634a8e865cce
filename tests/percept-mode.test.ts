/**
 * percept.mode: a same-display percept carries the simulated eye's optics relative to the reference
 * viewer's (after Peli 1996, JOSA A 13(6):1131), a retinal-image percept the absolute image. Measured
 * end to end in the written percept.png.
 */
import { describe, expect, test } from 'vitest';
import { linearToSrgb } from '../src/colour/srgb.js';
import { validateSetup } from '../src/config/validate.js';
import type { LinearRgb } from '../src/image/plane.js';
import { boxAround, modulationAt, paintGrating, proofThroughFiles, screenSetup, uniformFrame } from './helpers/synthetic.js';

const W = 480;
const H = 240;
const PPD = 40;

/** A 70-year-old whose −1.43 D myopia puts a screen at 70 cm in focus (as reading glasses would). */
const SEVENTY_IN_FOCUS = { ageYears: 70, refraction: { sphereD: -1 / 0.7, cylinderD: 0, axisDeg: 0 } };

describe('which percept by default', () => {
  test('screens default to same-display, headsets to retinal-image (their eye buffers are reviewed magnified on a monitor)', () => {
    const screen = validateSetup({}, 'test');
    expect(screen.percept).toMatchObject({ mode: 'same-display', modeFrom: 'display kind', referenceViewerName: 'age-25' });
    expect(validateSetup({ display: { preset: 'headset-wide' } }, 'test').percept).toMatchObject({ mode: 'retinal-image', modeFrom: 'display kind' });
    expect(validateSetup({ percept: { mode: 'retinal-image' } }, 'test').percept).toMatchObject({ mode: 'retinal-image', modeFrom: 'setup' });
  });

  test('the reference viewer may be a preset name or a viewer, and is validated like one', () => {
    expect(validateSetup({ percept: { referenceViewer: 'age-45' } }, 'test').percept.referenceViewer.ageYears).toBe(45);
    expect(validateSetup({ percept: { referenceViewer: { ageYears: 33 } } }, 'test').percept.referenceViewer.ageYears).toBe(33);
    expect(() => validateSetup({ percept: { referenceViewer: { ageYears: 300 } } }, 'test')).toThrow(/percept\.referenceViewer\.ageYears/);
  });
});

/** Largest difference between two images in 8-bit sRGB codes over a box: of every channel, or of luminance (IEC 61966-2-1 weights). */
function largestCodeDifference(a: LinearRgb, b: LinearRgb, box: [number, number, number, number], of: 'channels' | 'luminance'): number {
  const [x0, y0, w, h] = box;
  const code = (v: number): number => Math.round(255 * linearToSrgb(v));
  const lum = (img: LinearRgb, i: number): number => 0.2126 * img.planes[0][i] + 0.7152 * img.planes[1][i] + 0.0722 * img.planes[2][i];
  let worst = 0;
  for (let y = y0; y < y0 + h; y++) for (let x = x0; x < x0 + w; x++) {
    const i = y * a.width + x;
    if (of === 'luminance') worst = Math.max(worst, Math.abs(code(lum(a, i)) - code(lum(b, i))));
    else for (let c = 0; c < 3; c++) worst = Math.max(worst, Math.abs(code(a.planes[c][i]) - code(b.planes[c][i])));
  }
  return worst;
}

describe('the same-display percept', () => {
  test('with the simulated viewer equal to the reference viewer, the percept equals the frame at the gaze, and its luminance over the central 1° (to one 8-bit code)', async () => {
    const frame = uniformFrame(W, H, [0.2, 0.3, 0.6]);
    paintGrating(frame, [W / 2 - 40, H / 2 - 40, 80, 40], 8 / PPD, 'vertical', 0.5, 0.45, [1, 0.8, 0.3]);
    paintGrating(frame, [W / 2 - 40, H / 2, 80, 40], 15 / PPD, 'horizontal', 0.4, 0.35);
    const { frame: written, percept } = await proofThroughFiles(frame, screenSetup(W, H, PPD, { viewer: { preset: 'age-25' } }));
    expect(largestCodeDifference(written, percept, [W / 2 - 20, H / 2 - 20, 40, 40], 'luminance')).toBeLessThanOrEqual(1);
    expect(largestCodeDifference(written, percept, [W / 2 - 2, H / 2 - 6, 4, 4], 'channels')).toBeLessThanOrEqual(1);
    // Colour a little off the gaze is already seen a little less sharply than by a fovea (Mullen 1991): the colour
    // edge between the two gratings softens by a fraction of a pixel on its two rows; every other pixel is the frame's.
    expect(largestCodeDifference(written, percept, [W / 2 - 20, H / 2 - 20, 40, 18], 'channels')).toBeLessThanOrEqual(1);
    expect(largestCodeDifference(written, percept, [W / 2 - 20, H / 2 + 2, 40, 18], 'channels')).toBeLessThanOrEqual(1);
    expect(largestCodeDifference(written, percept, [W / 2 - 20, H / 2 - 2, 40, 4], 'channels')).toBeLessThanOrEqual(16);
  });

  test('for a 70-year-old in focus, an 8 cpd grating at the gaze keeps their retinal modulation over the reference viewer’s, so the reference eye sees what theirs does (Peli 1996: ratio of transfer functions)', async () => {
    const f = 8 / PPD;
    const frame = uniformFrame(W, H, [0.4, 0.4, 0.4]);
    paintGrating(frame, [0, 0, W, H], f, 'vertical', 0.4, 0.3);
    const box = boxAround(W / 2, H / 2, f, 20, 'vertical');
    const kept = async (viewer: Record<string, unknown>, mode: string): Promise<number> => {
      const { frame: written, percept } = await proofThroughFiles(frame, screenSetup(W, H, PPD, { viewer, percept: { mode }, light: { surroundLuminanceCdM2: 80 } }));
      return modulationAt(percept, box, f, 'vertical') / modulationAt(written, box, f, 'vertical');
    };
    const [old, young, shown] = await Promise.all([kept(SEVENTY_IN_FOCUS, 'retinal-image'), kept({ preset: 'age-25' }, 'retinal-image'), kept(SEVENTY_IN_FOCUS, 'same-display')]);
    // The older eye loses more (IJspeert et al. 1993; Berrio et al. 2010), and the picture carries only the difference.
    expect(old).toBeLessThan(young);
    expect(Math.abs(shown - old / young), `70 y retina ${old.toFixed(3)}, 25 y retina ${young.toFixed(3)}, shown ${shown.toFixed(3)}`).toBeLessThan(0.06);
  });

  test('the 70-year-old without reading glasses sees the gaze softer than the frame, and softer than one in focus (1.43 D of defocus at 70 cm, Hofstetter 1950)', async () => {
    const f = 4 / PPD;
    const frame = uniformFrame(W, H, [0.4, 0.4, 0.4]);
    paintGrating(frame, [0, 0, W, H], f, 'vertical', 0.4, 0.3);
    const box = boxAround(W / 2, H / 2, f, 20, 'vertical');
    const distanceSetup = (viewer: Record<string, unknown>): Record<string, unknown> => ({ ...screenSetup(W, H, PPD, { viewer }), display: { ...(screenSetup(W, H, PPD).display as object), widthMm: W * (700 * Math.tan(Math.PI / 180 / PPD)), heightMm: H * (700 * Math.tan(Math.PI / 180 / PPD)), viewingDistanceMm: 700 } });
    const keptFor = async (viewer: Record<string, unknown>): Promise<number> => {
      const { frame: written, percept } = await proofThroughFiles(frame, distanceSetup(viewer));
      return modulationAt(percept, box, f, 'vertical') / modulationAt(written, box, f, 'vertical');
    };
    const [unaided, inFocus] = await Promise.all([keptFor({ preset: 'age-70' }), keptFor(SEVENTY_IN_FOCUS)]);
    expect(unaided).toBeLessThan(0.8 * inFocus);
    expect(inFocus).toBeLessThan(1);
  });
});
