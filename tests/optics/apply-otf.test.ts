import { describe, expect, test } from 'vitest';
import { applyOtf, createOtfGrid } from '../../src/optics/apply-otf.js';
import type { Plane } from '../../src/image/plane.js';

/** Seeded pseudo-random numbers (mulberry32) so the tests are repeatable. */
function random(seed: number): () => number {
  let a = seed;
  return () => {
    a |= 0;
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function randomPlane(width: number, height: number, seed: number): Plane {
  const r = random(seed);
  return { width, height, data: Float32Array.from({ length: width * height }, r) };
}

const mirror = (i: number, n: number): number => {
  const period = 2 * n;
  let m = ((i % period) + period) % period;
  return m < n ? m : period - 1 - m;
};

/** The slow, obvious reference: direct 2D convolution with a sampled Gaussian and mirrored borders. */
function directGaussian(src: Plane, sigmaPx: number): Float32Array {
  const radius = Math.ceil(6 * sigmaPx);
  const k: number[] = [];
  for (let i = -radius; i <= radius; i++) k.push(Math.exp(-(i * i) / (2 * sigmaPx * sigmaPx)));
  const sum = k.reduce((a, b) => a + b, 0);
  const w = k.map((v) => v / sum);
  const out = new Float32Array(src.width * src.height);
  for (let y = 0; y < src.height; y++) {
    for (let x = 0; x < src.width; x++) {
      let acc = 0;
      for (let dy = -radius; dy <= radius; dy++) {
        for (let dx = -radius; dx <= radius; dx++) {
          acc += w[dy + radius] * w[dx + radius] * src.data[mirror(y + dy, src.height) * src.width + mirror(x + dx, src.width)];
        }
      }
      out[y * src.width + x] = acc;
    }
  }
  return out;
}

describe('FFT filtering against direct convolution (fast path vs slow reference)', () => {
  // A Gaussian PSF of σ px has the transfer exp(−2π²σ²f²), f in cycles/px (Fourier pair, common practice).
  const sigmaPx = 1.5;
  const pxPerDeg = 1; // transfer given in cycles/px when one degree is one pixel
  const transfer = (f: number): number => Math.exp(-2 * Math.PI * Math.PI * sigmaPx * sigmaPx * f * f);

  test('one tile: FFT equals direct convolution to 1e-3', () => {
    const src = randomPlane(40, 30, 1);
    const out = new Float32Array(src.data.length);
    applyOtf([src], [out], createOtfGrid(40, 30, transfer, { pxPerDegX: pxPerDeg, pxPerDegY: pxPerDeg, marginPx: 12 }));
    const ref = directGaussian(src, sigmaPx);
    for (let i = 0; i < ref.length; i++) expect(Math.abs(out[i] - ref[i])).toBeLessThan(1e-3);
  });

  test('many tiles and two planes per transform: equals direct convolution to 1e-3', () => {
    const a = randomPlane(300, 270, 2);
    const b = randomPlane(300, 270, 3);
    const outA = new Float32Array(a.data.length);
    const outB = new Float32Array(b.data.length);
    const grid = createOtfGrid(300, 270, transfer, { pxPerDegX: pxPerDeg, pxPerDegY: pxPerDeg, marginPx: 12 });
    expect(grid.fftWidth).toBeLessThan(300 + 24);
    applyOtf([a, b], [outA, outB], grid);
    const refA = directGaussian(a, sigmaPx);
    const refB = directGaussian(b, sigmaPx);
    for (let i = 0; i < refA.length; i++) {
      expect(Math.abs(outA[i] - refA[i])).toBeLessThan(1e-3);
      expect(Math.abs(outB[i] - refB[i])).toBeLessThan(1e-3);
    }
  });

  test('a normalised transfer conserves the mean (energy conservation of the kernel)', () => {
    const src = randomPlane(200, 120, 4);
    const out = new Float32Array(src.data.length);
    applyOtf([src], [out], createOtfGrid(200, 120, transfer, { pxPerDegX: 1, pxPerDegY: 1, marginPx: 12 }));
    const mean = (d: Float32Array): number => d.reduce((s, v) => s + v, 0) / d.length;
    expect(mean(out)).toBeCloseTo(mean(src.data), 3);
  });
});
