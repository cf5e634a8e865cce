import { describe, expect, test } from 'vitest';
import { validateSetup } from '../../src/config/validate.js';
import { createLinearRgb } from '../../src/image/plane.js';
import { gaussianSigmaDegForMtf50, lensMtf50At } from '../../src/optics/headset-lens.js';
import { computeNumbers, runProof } from '../../src/pipeline.js';

describe('headset lens sharpness and transmission', () => {
  test('a Gaussian of σ = sqrt(ln2/2)/(π·f50) has MTF 0.5 at f50 (Gaussian MTF exp(−2π²σ²f²), derived)', () => {
    const s = gaussianSigmaDegForMtf50(10);
    expect(Math.exp(-2 * Math.PI ** 2 * s * s * 100)).toBeCloseTo(0.5, 12);
  });

  test('MTF50 is interpolated between field angles and held beyond them', () => {
    const sharp = { fieldAnglesDeg: [0, 20, 40], mtf50Cpd: [20, 10, 4] };
    expect(lensMtf50At(10, sharp)).toBeCloseTo(15, 12);
    expect(lensMtf50At(30, sharp)).toBeCloseTo(7, 12);
    expect(lensMtf50At(60, sharp)).toBe(4);
  });

  test('transmission scales the luminances the eye adapts to', () => {
    const full = computeNumbers(validateSetup({ display: { preset: 'headset-wide' } }, 'x'));
    const half = computeNumbers(validateSetup({ display: { preset: 'headset-wide', opticalTransmission: 0.5 } }, 'x'));
    expect(half.light.adaptingLuminanceCdM2 / full.light.adaptingLuminanceCdM2).toBeCloseTo(0.5, 6);
  });

  test('a soft lens edge blurs a grating far off-axis more than one near the axis (lens MTF by field angle)', () => {
    const setup = validateSetup({
      display: { kind: 'headset', resolutionPx: [800, 400], fieldOfViewDeg: [100, 50], focalDistanceM: 2, peakLuminanceCdM2: 100, lensSharpness: { fieldAnglesDeg: [0, 30], mtf50Cpd: [30, 0.5] } },
      viewer: { preset: 'age-25' }, gaze: { xPx: 400, yPx: 200 },
    }, 'lens');
    const frame = createLinearRgb(800, 400);
    // Vertical square-wave bars 6 px wide everywhere.
    for (let y = 0; y < 400; y++) for (let x = 0; x < 800; x++) for (const p of frame.planes) p[y * 800 + x] = Math.floor(x / 6) % 2 ? 0.8 : 0.2;
    const { retinalImage } = runProof(frame, setup, 'lens');
    const contrast = (x0: number): number => {
      let lo = Infinity;
      let hi = -Infinity;
      for (let x = x0; x < x0 + 24; x++) {
        const v = retinalImage.planes[1][200 * 800 + x];
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
      return (hi - lo) / (hi + lo);
    };
    expect(contrast(20)).toBeLessThan(0.5 * contrast(400));
  });
});
