import { describe, expect, test } from 'vitest';
import { applyOtf, otfGridFromKernel } from '../../src/optics/apply-otf.js';
import { kernelScales, MAX_SCALE_STEP, scaleWeights } from '../../src/optics/scale-blend.js';

function gaussianKernel(sigma: number, half: number): Float32Array {
  const size = 2 * half + 1;
  const k = new Float32Array(size * size);
  let sum = 0;
  for (let y = 0; y < size; y++) for (let x = 0; x < size; x++) {
    const v = Math.exp(-((x - half) ** 2 + (y - half) ** 2) / (2 * sigma * sigma));
    k[y * size + x] = v;
    sum += v;
  }
  return k.map((v) => v / sum);
}

describe('kernels for several pixel scales, blended per pixel', () => {
  test('one scale when the frame spans less than 25 %; geometric steps up to 4 scales otherwise', () => {
    expect(kernelScales(Float32Array.from([1, 1.1, 1.2]))).toHaveLength(1);
    const scales = kernelScales(Float32Array.from([1, 2]));
    expect(scales[0]).toBeCloseTo(1, 10);
    expect(scales[scales.length - 1]).toBeCloseTo(2, 10);
    // A range of 2 needs more than four 1.25 steps, so the four scales share it evenly.
    expect(scales).toHaveLength(4);
    for (let i = 1; i < scales.length; i++) expect(scales[i] / scales[i - 1]).toBeCloseTo(2 ** (1 / 3), 10);
    const near = kernelScales(Float32Array.from([1, 1.5]));
    for (let i = 1; i < near.length; i++) expect(near[i] / near[i - 1]).toBeLessThanOrEqual(MAX_SCALE_STEP + 1e-9);
  });

  test('the blend equals direct convolution with the per-pixel interpolated kernel (fast path vs slow reference)', () => {
    const width = 48;
    const height = 32;
    const half = 6;
    const size = 2 * half + 1;
    const src = Float32Array.from({ length: width * height }, (_, i) => ((i * 7919) % 101) / 100);
    const arcmin = Float32Array.from({ length: width * height }, (_, i) => 1 + (i % width) / width);
    const scales = [1, 2];
    const kernels = [gaussianKernel(1, half), gaussianKernel(2.5, half)];
    const { lower, upperWeight } = scaleWeights(arcmin, scales);
    const fast = new Float32Array(width * height);
    kernels.forEach((kernel, k) => {
      const out = new Float32Array(width * height);
      applyOtf([{ width, height, data: src }], [out], otfGridFromKernel(width, height, kernel, size));
      for (let i = 0; i < out.length; i++) fast[i] += (lower[i] === k ? 1 - upperWeight[i] : lower[i] + 1 === k ? upperWeight[i] : 0) * out[i];
    });
    const mirror = (i: number, n: number): number => {
      const p = 2 * n;
      const m = ((i % p) + p) % p;
      return m < n ? m : p - 1 - m;
    };
    for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) {
      const i = y * width + x;
      const w = upperWeight[i];
      let acc = 0;
      for (let ky = 0; ky < size; ky++) for (let kx = 0; kx < size; kx++) {
        const k = (1 - w) * kernels[0][ky * size + kx] + w * kernels[1][ky * size + kx];
        acc += k * src[mirror(y + ky - half, height) * width + mirror(x + kx - half, width)];
      }
      expect(Math.abs(fast[i] - acc)).toBeLessThan(1e-4);
    }
  });
});
