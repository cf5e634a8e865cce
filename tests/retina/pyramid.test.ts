import { describe, expect, test } from 'vitest';
import type { Plane } from '../../src/image/plane.js';
import { expand, levelSigmaPx, reduce } from '../../src/retina/pyramid.js';

function throughLevel(src: Plane, level: number): Float32Array {
  const sizes: [number, number][] = [[src.width, src.height]];
  let p = src;
  for (let k = 0; k < level; k++) {
    p = reduce(p);
    sizes.push([p.width, p.height]);
  }
  for (let k = level - 1; k >= 0; k--) p = expand(p, sizes[k][0], sizes[k][1]);
  return p.data;
}

/** Explicit 1D Gaussian blur along rows only (the slow reference). */
function gaussianRows(src: Plane, sigma: number): Float32Array {
  const r = Math.ceil(5 * sigma);
  const w = Array.from({ length: 2 * r + 1 }, (_, i) => Math.exp(-((i - r) ** 2) / (2 * sigma * sigma)));
  const s = w.reduce((a, b) => a + b, 0);
  const out = new Float32Array(src.data.length);
  for (let y = 0; y < src.height; y++) {
    for (let x = 0; x < src.width; x++) {
      let acc = 0;
      for (let i = -r; i <= r; i++) acc += (w[i + r] / s) * src.data[y * src.width + Math.min(src.width - 1, Math.max(0, x + i))];
      out[y * src.width + x] = acc;
    }
  }
  return out;
}

describe('Gaussian pyramid (Burt & Adelson 1983) against an explicit Gaussian', () => {
  test.each([1, 2, 3])('level %i: impulse response variance matches σ_k² = 2(4^k − 1)/3 within 10 %, averaged over phases', (level) => {
    const size = 256;
    let variance = 0;
    const phases = 2 ** level;
    for (let phase = 0; phase < phases; phase++) {
      const data = new Float32Array(size);
      const c = 128 + phase;
      data[c] = 1;
      const out = throughLevel({ width: size, height: 1, data }, level);
      let sum = 0;
      let m2 = 0;
      for (let i = 0; i < size; i++) {
        sum += out[i];
        m2 += out[i] * (i - c) ** 2;
      }
      expect(sum).toBeCloseTo(1, 5);
      variance += m2 / sum / phases;
    }
    // A 1-row image is filtered along x only; the variance per axis is what levelSigmaPx states.
    expect(Math.sqrt(variance) / levelSigmaPx(level)).toBeGreaterThan(0.9);
    expect(Math.sqrt(variance) / levelSigmaPx(level)).toBeLessThan(1.1);
  });

  test('level 3 blur of a mix of gratings (periods 25, 40, 90 px) matches an explicit Gaussian of σ_3 to 5 % RMS', () => {
    const width = 512;
    const data = new Float32Array(width);
    for (let i = 0; i < width; i++) data[i] = 0.5 + 0.2 * Math.sin((2 * Math.PI * i) / 25) + 0.2 * Math.sin((2 * Math.PI * i) / 40 + 1) + 0.2 * Math.sin((2 * Math.PI * i) / 90 + 2);
    const src = { width, height: 1, data };
    const ours = throughLevel(src, 3);
    const ref = gaussianRows(src, levelSigmaPx(3));
    let err = 0;
    let dev = 0;
    const mean = ref.reduce((a, b) => a + b, 0) / width;
    for (let i = 40; i < width - 40; i++) {
      err += (ours[i] - ref[i]) ** 2;
      dev += (ref[i] - mean) ** 2;
    }
    expect(Math.sqrt(err / dev)).toBeLessThan(0.05);
  });
});
