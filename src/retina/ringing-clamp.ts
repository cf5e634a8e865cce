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
  return {
    sizes,
    min: rawMin.map((p, k) => dilate3x3(p, sizes[k][0], sizes[k][1], false)),
    max: rawMax.map((p, k) => dilate3x3(p, sizes[k][0], sizes[k][1], true)),
  };
}

/** The minimum (or maximum) over each sample's 3 × 3 neighbourhood (edges: what exists). */
function dilate3x3(src: Float32Array, w: number, h: number, max: boolean): Float32Array {
  const rows = new Float32Array(w * h);
  const out = new Float32Array(w * h);
  for (let y = 0; y < h; y++) {
    const o = y * w;
    for (let x = 0; x < w; x++) {
      let v = src[o + x];
      if (x > 0) { const u = src[o + x - 1]; if (max ? u > v : u < v) v = u; }
      if (x < w - 1) { const u = src[o + x + 1]; if (max ? u > v : u < v) v = u; }
      rows[o + x] = v;
    }
  }
  for (let y = 0; y < h; y++) {
    const o = y * w;
    const up = y > 0 ? o - w : o;
    const down = y < h - 1 ? o + w : o;
    for (let x = 0; x < w; x++) {
      let v = rows[o + x];
      const a = rows[up + x];
      const b = rows[down + x];
      if (max) { if (a > v) v = a; if (b > v) v = b; } else { if (a < v) v = a; if (b < v) v = b; }
      out[o + x] = v;
    }
  }
  return out;
}

/**
 * Clamps `outs` (full size; one per range pyramid) to their inputs' range around each pixel;
 * `log2Cutoff` is the local cutoff in cycles per full-size pixel (log2): blocks of at least half its
 * period are used. `rangeLevel`: the ranges were built on the input reduced that many times (their
 * level 0 holds 2^rangeLevel-px blocks), `fullWidth` the width of the outputs.
 */
export function clampToLocalRanges(outs: readonly Float32Array[], ranges: readonly RangePyramids[], log2Cutoff: Float32Array, rangeLevel = 0, fullWidth = ranges[0].sizes[0][0]): void {
  const width = fullWidth;
  const height = outs[0].length / width;
  const top = ranges[0].sizes.length - 1;
  const widths = ranges[0].sizes.map(([w]) => w);
  const count = outs.length;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      // Half a period at the cutoff, 0.5/f_c px, in blocks of 2^k: k = ceil(log2(0.5/f_c)).
      let k = Math.ceil(-1 - log2Cutoff[i]) - rangeLevel;
      k = k < 0 ? 0 : k > top ? top : k;
      const shift = k + rangeLevel;
      const j = (y >> shift) * widths[k] + (x >> shift);
      for (let p = 0; p < count; p++) {
        const lo = ranges[p].min[k][j];
        const hi = ranges[p].max[k][j];
        const v = outs[p][i];
        outs[p][i] = v < lo ? lo : v > hi ? hi : v;
      }
    }
  }
}

/** One output, one range pyramid: see clampToLocalRanges. */
export function clampToLocalRange(out: Float32Array, ranges: RangePyramids, log2Cutoff: Float32Array, rangeLevel = 0, fullWidth = ranges.sizes[0][0]): void {
  clampToLocalRanges([out], [ranges], log2Cutoff, rangeLevel, fullWidth);
}
