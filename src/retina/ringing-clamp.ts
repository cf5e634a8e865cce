/**
 * A low-pass that keeps 0.8 of the contrast at half its cutoff must have negative lobes, and at
 * strong edges those ring: a dark rim inside a dark disc on a light ground, a light one outside it.
 * No eye sees that, so the sharp low-pass is clamped to the range its input spans near each pixel
 * (our proposal; the same clamp image resamplers use against ringing). The range is read from
 * min and max pyramids: level k holds, for each 2^k block, the extremes over that block and its
 * eight neighbours, and a pixel uses the level whose blocks match the period at its cutoff.
 */
import { reducedSize } from '../image/binomial.js';

export interface RangePyramids {
  sizes: [number, number][];
  min: Float32Array[];
  max: Float32Array[];
}

/** Extremes over each block and its 3 × 3 neighbourhood of blocks, for every level. */
export function buildRangePyramids(plane: Float32Array, width: number, height: number, levels: number): RangePyramids {
  const sizes: [number, number][] = [[width, height]];
  for (let k = 1; k < levels; k++) sizes.push(reducedSize(...sizes[k - 1]));
  const rawMin: Float32Array[] = [plane];
  const rawMax: Float32Array[] = [plane];
  for (let k = 1; k < levels; k++) {
    const [pw, ph] = sizes[k - 1];
    const [w, h] = sizes[k];
    const lo = new Float32Array(w * h);
    const hi = new Float32Array(w * h);
    for (let y = 0; y < h; y++) {
      const y0 = 2 * y;
      const y1 = Math.min(ph - 1, y0 + 1);
      for (let x = 0; x < w; x++) {
        const x0 = 2 * x;
        const x1 = Math.min(pw - 1, x0 + 1);
        const a = y0 * pw + x0, b = y0 * pw + x1, c = y1 * pw + x0, d = y1 * pw + x1;
        const pMin = rawMin[k - 1];
        const pMax = rawMax[k - 1];
        lo[y * w + x] = Math.min(pMin[a], pMin[b], pMin[c], pMin[d]);
        hi[y * w + x] = Math.max(pMax[a], pMax[b], pMax[c], pMax[d]);
      }
    }
    rawMin.push(lo);
    rawMax.push(hi);
  }
  const dilate = (src: Float32Array, w: number, h: number, pick: (a: number, b: number) => number): Float32Array => {
    const rows = new Float32Array(w * h);
    const out = new Float32Array(w * h);
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        let v = src[y * w + x];
        if (x > 0) v = pick(v, src[y * w + x - 1]);
        if (x < w - 1) v = pick(v, src[y * w + x + 1]);
        rows[y * w + x] = v;
      }
    }
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        let v = rows[y * w + x];
        if (y > 0) v = pick(v, rows[(y - 1) * w + x]);
        if (y < h - 1) v = pick(v, rows[(y + 1) * w + x]);
        out[y * w + x] = v;
      }
    }
    return out;
  };
  return {
    sizes,
    min: rawMin.map((p, k) => dilate(p, sizes[k][0], sizes[k][1], Math.min)),
    max: rawMax.map((p, k) => dilate(p, sizes[k][0], sizes[k][1], Math.max)),
  };
}

/**
 * Clamps `out` (full size) to the input's range around each pixel; `log2Cutoff` is the local cutoff
 * in cycles per pixel (log2): blocks of at least half its period are used.
 */
export function clampToLocalRange(out: Float32Array, ranges: RangePyramids, log2Cutoff: Float32Array): void {
  const [width, height] = ranges.sizes[0];
  const top = ranges.sizes.length - 1;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      // Half a period at the cutoff, 0.5/f_c px, in blocks of 2^k: k = ceil(log2(0.5/f_c)).
      const k = Math.min(top, Math.max(0, Math.ceil(-1 - log2Cutoff[i])));
      const j = (y >> k) * ranges.sizes[k][0] + (x >> k);
      const lo = ranges.min[k][j];
      const hi = ranges.max[k][j];
      const v = out[i];
      out[i] = v < lo ? lo : v > hi ? hi : v;
    }
  }
}
