/**
 * Binomial filtering steps on planes, with half-sample-symmetric (mirrored) borders:
 * - reduce7: the 7-tap binomial [1 6 15 20 15 6 1]/64 (transfer cos⁶(πf)), keeping every second sample;
 * - expand7: doubling the size with the same kernel (even outputs (3, 10, 3)/16, odd (1, 15, 15, 1)/32);
 * - blur5: the 5-tap binomial [1 4 6 4 1]/16 (transfer cos⁴(πf), variance 1 px²) at the plane's own size.
 * The 7-tap kernel attenuates what a decimation folds back (cos⁶(0.3π) = 0.04) much better than the
 * 5-tap one of Burt & Adelson (1983), which matters when pyramid levels are combined with weights
 * other than those of a plain reconstruction. Each step writes into `out` (which must not alias the
 * input) and allocates only a row-sized scratch when none is given.
 */

/** Mirror index for a line of n samples (edge sample repeated: half-sample symmetric). */
function mirror(i: number, n: number): number {
  if (i < 0) return Math.min(-i - 1, n - 1);
  if (i >= n) return Math.max(2 * n - i - 1, 0);
  return i;
}

/** Output size of one reduce step. */
export function reducedSize(width: number, height: number): [number, number] {
  return [Math.ceil(width / 2), Math.ceil(height / 2)];
}

/**
 * One reduce step of `src` (w × h) into `out` (ceil(w/2) × ceil(h/2)). `rows` is scratch of at least
 * ceil(w/2) × h samples.
 */
export function reduce7(src: Float32Array, w: number, h: number, out: Float32Array, rows: Float32Array): void {
  const ow = Math.ceil(w / 2);
  const oh = Math.ceil(h / 2);
  for (let y = 0; y < h; y++) {
    const r = y * w;
    const o = y * ow;
    for (let x = 0; x < ow; x++) {
      const c = 2 * x;
      if (c >= 3 && c + 3 < w) {
        const i = r + c;
        rows[o + x] = (src[i - 3] + src[i + 3] + 6 * (src[i - 2] + src[i + 2]) + 15 * (src[i - 1] + src[i + 1]) + 20 * src[i]) / 64;
      } else {
        rows[o + x] = (src[r + mirror(c - 3, w)] + src[r + mirror(c + 3, w)] + 6 * (src[r + mirror(c - 2, w)] + src[r + mirror(c + 2, w)])
          + 15 * (src[r + mirror(c - 1, w)] + src[r + mirror(c + 1, w)]) + 20 * src[r + c]) / 64;
      }
    }
  }
  for (let y = 0; y < oh; y++) {
    const c = 2 * y;
    const r0 = mirror(c - 3, h) * ow, r1 = mirror(c - 2, h) * ow, r2 = mirror(c - 1, h) * ow, r3 = c * ow;
    const r4 = mirror(c + 1, h) * ow, r5 = mirror(c + 2, h) * ow, r6 = mirror(c + 3, h) * ow;
    const o = y * ow;
    for (let x = 0; x < ow; x++) {
      out[o + x] = (rows[r0 + x] + rows[r6 + x] + 6 * (rows[r1 + x] + rows[r5 + x]) + 15 * (rows[r2 + x] + rows[r4 + x]) + 20 * rows[r3 + x]) / 64;
    }
  }
}

/**
 * One expand step of `src` (w × h) to `out` (width × height, with width ∈ {2w − 1, 2w} and likewise
 * for height): output sample 2j sits on input sample j. If `accumulate` is true the result is added
 * to `out` instead of replacing it. `rows` is scratch of at least width × h samples.
 */
export function expand7(src: Float32Array, w: number, h: number, out: Float32Array, width: number, height: number, rows: Float32Array, accumulate = false): void {
  for (let y = 0; y < h; y++) {
    const r = y * w;
    const o = y * width;
    for (let x = 0; x < width; x++) {
      const j = x >> 1;
      if ((x & 1) === 0) {
        rows[o + x] = j >= 1 && j + 1 < w
          ? (3 * (src[r + j - 1] + src[r + j + 1]) + 10 * src[r + j]) / 16
          : (3 * (src[r + mirror(j - 1, w)] + src[r + mirror(j + 1, w)]) + 10 * src[r + j]) / 16;
      } else {
        rows[o + x] = j >= 1 && j + 2 < w
          ? (src[r + j - 1] + src[r + j + 2] + 15 * (src[r + j] + src[r + j + 1])) / 32
          : (src[r + mirror(j - 1, w)] + src[r + mirror(j + 2, w)] + 15 * (src[r + mirror(j, w)] + src[r + mirror(j + 1, w)])) / 32;
      }
    }
  }
  for (let y = 0; y < height; y++) {
    const j = y >> 1;
    const o = y * width;
    if ((y & 1) === 0) {
      const a = mirror(j - 1, h) * width, b = mirror(j, h) * width, c = mirror(j + 1, h) * width;
      if (accumulate) for (let x = 0; x < width; x++) out[o + x] += (3 * (rows[a + x] + rows[c + x]) + 10 * rows[b + x]) / 16;
      else for (let x = 0; x < width; x++) out[o + x] = (3 * (rows[a + x] + rows[c + x]) + 10 * rows[b + x]) / 16;
    } else {
      const a = mirror(j - 1, h) * width, b = mirror(j, h) * width, c = mirror(j + 1, h) * width, d = mirror(j + 2, h) * width;
      if (accumulate) for (let x = 0; x < width; x++) out[o + x] += (rows[a + x] + rows[d + x] + 15 * (rows[b + x] + rows[c + x])) / 32;
      else for (let x = 0; x < width; x++) out[o + x] = (rows[a + x] + rows[d + x] + 15 * (rows[b + x] + rows[c + x])) / 32;
    }
  }
}

/** The 5-tap binomial blur of `src` (w × h) into `out`; `rows` is scratch of w × h samples. */
export function blur5(src: Float32Array, w: number, h: number, out: Float32Array, rows: Float32Array): void {
  for (let y = 0; y < h; y++) {
    const r = y * w;
    for (let x = 0; x < w; x++) {
      rows[r + x] = x >= 2 && x + 2 < w
        ? (src[r + x - 2] + src[r + x + 2] + 4 * (src[r + x - 1] + src[r + x + 1]) + 6 * src[r + x]) / 16
        : (src[r + mirror(x - 2, w)] + src[r + mirror(x + 2, w)] + 4 * (src[r + mirror(x - 1, w)] + src[r + mirror(x + 1, w)]) + 6 * src[r + x]) / 16;
    }
  }
  for (let y = 0; y < h; y++) {
    const a = mirror(y - 2, h) * w, b = mirror(y - 1, h) * w, c = y * w, d = mirror(y + 1, h) * w, e = mirror(y + 2, h) * w;
    for (let x = 0; x < w; x++) out[c + x] = (rows[a + x] + rows[e + x] + 4 * (rows[b + x] + rows[d + x]) + 6 * rows[c + x]) / 16;
  }
}
