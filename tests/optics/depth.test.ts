import { PNG } from 'pngjs';
import { describe, expect, test } from 'vitest';
import { validateSetup } from '../../src/config/validate.js';
import { InputError } from '../../src/errors.js';
import { createLinearRgb } from '../../src/image/plane.js';
import { decodeDepthMap } from '../../src/io/decode-depth.js';
import { depthBlurSigmaPx } from '../../src/optics/depth-blur.js';
import { runProof } from '../../src/pipeline.js';

describe('defocus from depth (standard optics)', () => {
  test('a point at 0.5 m while focused at 2 m is 1.5 D out of focus: a 4 mm pupil blurs it over 20.6′, σ = 5.16′', () => {
    const { sigmaPx, defocusRangeD } = depthBlurSigmaPx({
      depthM: Float32Array.from([0.5, 2]), focusDistanceM: 2, gazeDefocusD: 0, pupilDiameterMm: 4, arcminPerPx: Float32Array.from([1, 1]),
    });
    // Blur circle (rad) = pupil (m) × defocus (D): 0.004 × 1.5 = 6 mrad = 20.63′; σ of a disk = b/4.
    expect(sigmaPx[0]).toBeCloseTo(20.626 / 4, 2);
    expect(sigmaPx[1]).toBe(0);
    expect(defocusRangeD[1]).toBeCloseTo(1.5, 10);
  });

  test('depth maps are read as 16-bit PNG distances in the stated unit; other sizes are refused', async () => {
    // Written with pngjs, an independent PNG encoder: 16-bit greyscale.
    const image = new PNG({ width: 2, height: 2, bitDepth: 16, colorType: 0, inputColorType: 0, inputHasAlpha: false });
    image.data = new Uint16Array([500, 2000, 0, 1000]) as unknown as Buffer;
    const png = PNG.sync.write(image, { bitDepth: 16, colorType: 0, inputColorType: 0, inputHasAlpha: false });
    const m = await decodeDepthMap(png, 'd.png', 'mm', 2, 2);
    expect(Array.from(m.slice(0, 2))).toEqual([0.5, 2]);
    expect(Number.isNaN(m[2])).toBe(true);
    await expect(decodeDepthMap(png, 'd.png', 'mm', 4, 4)).rejects.toThrow(InputError);
  });

  test('with a depth map, near things blur while the gazed-at distance stays sharp', () => {
    const W = 400;
    const H = 200;
    const setup = validateSetup({ display: { kind: 'headset', resolutionPx: [W, H], fieldOfViewDeg: [40, 20], focalDistanceM: 2, peakLuminanceCdM2: 100 }, viewer: { preset: 'age-25' }, gaze: { xPx: 300, yPx: 100 } }, 'depth');
    const frame = createLinearRgb(W, H);
    for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) for (const p of frame.planes) p[y * W + x] = Math.floor(x / 4) % 2 ? 0.8 : 0.2;
    const depthM = new Float32Array(W * H).map((_, i) => ((i % W) < 200 ? 0.25 : 2));
    const contrast = (img: Float32Array, x0: number): number => {
      let lo = Infinity;
      let hi = -Infinity;
      for (let x = x0; x < x0 + 16; x++) { lo = Math.min(lo, img[100 * W + x]); hi = Math.max(hi, img[100 * W + x]); }
      return (hi - lo) / (hi + lo);
    };
    const flat = runProof(frame, setup, 'depth').retinalImage.planes[1];
    const withDepth = runProof(frame, setup, 'depth', { depthM });
    expect(withDepth.depth?.focusDistanceM).toBe(2);
    // 0.25 m while focused at 2 m: 3.5 D of extra defocus.
    expect(contrast(withDepth.retinalImage.planes[1], 100)).toBeLessThan(0.6 * contrast(flat, 100));
    expect(contrast(withDepth.retinalImage.planes[1], 300)).toBeCloseTo(contrast(flat, 300), 2);
  });
});
