/**
 * Gaussian pyramid steps with the 5-tap binomial kernel [1 4 6 4 1]/16 (Burt & Adelson 1983) and
 * mirrored borders. REDUCE filters and keeps every second sample; EXPAND doubles the size and
 * interpolates with the same kernel (gain 2 per axis).
 */
import type { Plane } from '../image/plane.js';

/** Mirror index for a line of n samples (edge sample repeated: half-sample symmetric). */
function mirror(i: number, n: number): number {
  if (i < 0) return Math.min(-i - 1, n - 1);
  if (i >= n) return Math.max(2 * n - i - 1, 0);
  return i;
}

/** One REDUCE step: output is ceil(w/2) × ceil(h/2). */
export function reduce(src: Plane): Plane {
  const { width: w, height: h, data } = src;
  const ow = Math.ceil(w / 2);
  const oh = Math.ceil(h / 2);
  // Horizontal pass at full height, then vertical pass, each keeping every second sample.
  const tmp = new Float32Array(ow * h);
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let x = 0; x < ow; x++) {
      const c = 2 * x;
      tmp[y * ow + x] = (data[row + mirror(c - 2, w)] + data[row + mirror(c + 2, w)] + 4 * (data[row + mirror(c - 1, w)] + data[row + mirror(c + 1, w)]) + 6 * data[row + c]) / 16;
    }
  }
  const out = new Float32Array(ow * oh);
  for (let y = 0; y < oh; y++) {
    const c = 2 * y;
    const r0 = mirror(c - 2, h) * ow, r1 = mirror(c - 1, h) * ow, r2 = c * ow, r3 = mirror(c + 1, h) * ow, r4 = mirror(c + 2, h) * ow;
    for (let x = 0; x < ow; x++) {
      out[y * ow + x] = (tmp[r0 + x] + tmp[r4 + x] + 4 * (tmp[r1 + x] + tmp[r3 + x]) + 6 * tmp[r2 + x]) / 16;
    }
  }
  return { width: ow, height: oh, data: out };
}

/**
 * One EXPAND step to a target size (2w or 2w − 1): sample 2j of the output sits on input sample j;
 * even outputs take (1, 6, 1)/8 of inputs j−1, j, j+1 and odd outputs (4, 4)/8 of j and j+1.
 */
export function expand(src: Plane, width: number, height: number): Plane {
  const { width: w, height: h, data } = src;
  const tmp = new Float32Array(width * h);
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let x = 0; x < width; x++) {
      const j = x >> 1;
      tmp[y * width + x] = (x & 1) === 0
        ? (data[row + mirror(j - 1, w)] + 6 * data[row + mirror(j, w)] + data[row + mirror(j + 1, w)]) / 8
        : (data[row + mirror(j, w)] + data[row + mirror(j + 1, w)]) / 2;
    }
  }
  const out = new Float32Array(width * height);
  for (let y = 0; y < height; y++) {
    const j = y >> 1;
    if ((y & 1) === 0) {
      const r0 = mirror(j - 1, h) * width, r1 = mirror(j, h) * width, r2 = mirror(j + 1, h) * width;
      for (let x = 0; x < width; x++) out[y * width + x] = (tmp[r0 + x] + 6 * tmp[r1 + x] + tmp[r2 + x]) / 8;
    } else {
      const r1 = mirror(j, h) * width, r2 = mirror(j + 1, h) * width;
      for (let x = 0; x < width; x++) out[y * width + x] = (tmp[r1 + x] + tmp[r2 + x]) / 2;
    }
  }
  return { width, height, data: out };
}

/**
 * Gaussian-equivalent sigma (in level-0 pixels) of level k after k REDUCE and k EXPAND steps: each
 * binomial step at level j adds variance 4^j, so σ_k² = 2·(4^k − 1)/3.
 */
export function levelSigmaPx(level: number): number {
  return Math.sqrt((2 * (4 ** level - 1)) / 3);
}
