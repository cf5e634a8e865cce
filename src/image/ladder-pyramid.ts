/**
 * A half-octave ladder of blurs of one plane, for spatially varying low-pass filters whose cost does
 * not grow with the blur. Element n = 2k + family is level k of a 7-tap binomial pyramid (family 0)
 * or that level blurred once more by a 5-tap binomial at its own resolution (family 1). Expanded back
 * to full size, element n is close to a Gaussian of variance 2^n − 1 px² (level k: 4^k − 1; the extra
 * 5-tap blur adds 4^k). A filter is a per-pixel combination Σ c_n(x)·element_n(x); it is evaluated
 * coarse to fine (Horner's scheme), multiplying each level by its coefficients at that level's
 * resolution and expanding the running sum, so one evaluation costs about one expand of the plane.
 *
 * Building the ladder depends only on the plane; the coefficients (and so the gaze) only on the
 * second, cheap step.
 */
import { blur5, expand7, reduce7, reducedSize } from './binomial.js';

export interface LadderPyramid {
  /** Number of pyramid levels; elements 0 … 2·levels − 1. */
  levels: number;
  /** [width, height] of each level. */
  sizes: [number, number][];
  /** Pyramid levels; level 0 is the source plane itself (shared, not copied). */
  base: Float32Array[];
  /** Each level blurred once more by the 5-tap binomial. */
  blurred: Float32Array[];
}

/** Largest number of levels used, and the smallest side a level may have. */
export const MAX_LADDER_LEVELS = 12;
const MIN_LEVEL_SIDE = 4;

/** Variance (level-0 px²) of ladder element n: 2^n − 1. */
export function ladderElementVariance(n: number): number {
  return n < ELEMENT_VARIANCES.length ? ELEMENT_VARIANCES[n] : 2 ** n - 1;
}

/** Element variances 2^n − 1 for every element of the largest ladder, and one beyond. */
export const ELEMENT_VARIANCES: Float64Array = Float64Array.from({ length: 2 * 12 + 2 }, (_, n) => 2 ** n - 1);

export function ladderLevelCount(width: number, height: number): number {
  let levels = 1;
  let [w, h] = [width, height];
  while (levels < MAX_LADDER_LEVELS) {
    [w, h] = reducedSize(w, h);
    if (Math.min(w, h) < MIN_LEVEL_SIDE) break;
    levels++;
  }
  return levels;
}

/** Scratch for building and evaluating ladders of planes up to one size; reuse across calls. */
export interface LadderWorkspace {
  width: number;
  height: number;
  rows: Float32Array;
  /** Running sums of the coefficients, for the ladder size last evaluated. */
  weightSums?: { key: string; planes: Float32Array[] };
}

export function createLadderWorkspace(width: number, height: number): LadderWorkspace {
  return { width, height, rows: new Float32Array(width * height) };
}

/** Running sums for evaluating one ladder (one array per level above 0); reuse across evaluations. */
export function createLadderSums(pyr: Pick<LadderPyramid, 'levels' | 'sizes'>): Float32Array[] {
  return pyr.sizes.map(([w, h], k) => (k === 0 ? new Float32Array(0) : new Float32Array(w * h)));
}

/** Builds the ladder of `src` (width × height). Reuses the arrays of `into` when its size matches. */
export function buildLadder(src: Float32Array, width: number, height: number, ws: LadderWorkspace, into?: LadderPyramid): LadderPyramid {
  const levels = ladderLevelCount(width, height);
  const sizes: [number, number][] = [[width, height]];
  for (let k = 1; k < levels; k++) sizes.push(reducedSize(...sizes[k - 1]));
  const reuse = into && into.levels === levels && into.sizes[0][0] === width && into.sizes[0][1] === height;
  const base: Float32Array[] = [src];
  const blurred: Float32Array[] = [];
  for (let k = 0; k < levels; k++) {
    const [w, h] = sizes[k];
    if (k > 0) {
      const level = reuse ? into.base[k] : new Float32Array(w * h);
      reduce7(base[k - 1], sizes[k - 1][0], sizes[k - 1][1], level, ws.rows);
      base.push(level);
    }
    const extra = reuse ? into.blurred[k] : new Float32Array(w * h);
    blur5(base[k], w, h, extra, ws.rows);
    blurred.push(extra);
  }
  return { levels, sizes, base, blurred };
}

/**
 * Fills the coefficients of elements 2k (`c0`) and 2k + 1 (`c1`) for every pixel of level k
 * (w × h, row-major), e.g. from a cutoff map at that level's resolution.
 */
export type LadderCoefficients = (level: number, c0: Float32Array, c1: Float32Array, width: number, height: number) => void;

/**
 * Coefficients computed once for every level of a ladder's size, with the reciprocal of their
 * expanded sum at level 0 (the evaluation of a ladder of ones; 0 where it vanishes): a filter used
 * for several ladders or several evaluations is set up once.
 */
export interface LadderWeights {
  sizes: [number, number][];
  c0: Float32Array[];
  c1: Float32Array[];
  inverseTotal: Float32Array;
}

/** Fills and keeps a filter's coefficients for ladders of `pyr`'s size (in `into`'s arrays when it fits). */
export function ladderWeights(pyr: Pick<LadderPyramid, 'levels' | 'sizes'>, coefficients: LadderCoefficients, ws: LadderWorkspace, into?: LadderWeights): LadderWeights {
  const top = pyr.levels - 1;
  const reuse = into && into.c0.length === pyr.levels && into.sizes[0][0] === pyr.sizes[0][0] && into.sizes[0][1] === pyr.sizes[0][1];
  const c0: Float32Array[] = reuse ? into.c0 : [];
  const c1: Float32Array[] = reuse ? into.c1 : [];
  const sums = weightSums(ws, pyr);
  for (let k = top; k >= 0; k--) {
    const [w, h] = pyr.sizes[k];
    const n = w * h;
    const a = reuse ? c0[k] : new Float32Array(n);
    const b = reuse ? c1[k] : new Float32Array(n);
    coefficients(k, a, b, w, h);
    c0[k] = a;
    c1[k] = b;
    const wsum = sums[k];
    if (k < top) expand7(sums[k + 1], pyr.sizes[k + 1][0], pyr.sizes[k + 1][1], wsum, w, h, ws.rows);
    else wsum.fill(0, 0, n);
    for (let i = 0; i < n; i++) wsum[i] += a[i] + b[i];
  }
  const total = sums[0];
  const inverseTotal = reuse ? into.inverseTotal : new Float32Array(total.length);
  for (let i = 0; i < total.length; i++) inverseTotal[i] = total[i] > 1e-6 ? 1 / total[i] : 0;
  return { sizes: pyr.sizes, c0, c1, inverseTotal };
}

/**
 * Evaluates Σ c_n·element_n of each ladder (all of one size) into its `out` (level-0 size), with the
 * same coefficients. The coefficients are evaluated at each level's own resolution, so where they
 * change fast their sum at a pixel can stray from 1; the sum is carried along (as the evaluation of
 * a ladder of ones) and divided out, so a uniform plane stays exactly uniform. `sums[p]` are ladder
 * p's running sums (createLadderSums); `out` may be any array but the ladders' own. Coefficients
 * given as a function are computed here (ladderWeights) and not kept.
 */
export function evaluateLadders(pyrs: readonly LadderPyramid[], coefficients: LadderCoefficients | LadderWeights, outs: readonly Float32Array[], sums: readonly Float32Array[][], ws: LadderWorkspace): void {
  const first = pyrs[0];
  const weights = typeof coefficients === 'function' ? ladderWeights(first, coefficients, ws) : coefficients;
  const top = first.levels - 1;
  for (let k = top; k >= 0; k--) {
    const [w, h] = first.sizes[k];
    const n = w * h;
    const c0 = weights.c0[k];
    const c1 = weights.c1[k];
    for (let p = 0; p < pyrs.length; p++) {
      const pyr = pyrs[p];
      const sum = k === 0 ? outs[p] : sums[p][k];
      if (k < top) expand7(sums[p][k + 1], pyr.sizes[k + 1][0], pyr.sizes[k + 1][1], sum, w, h, ws.rows);
      else sum.fill(0, 0, n);
      const g = pyr.base[k];
      const b = pyr.blurred[k];
      for (let i = 0; i < n; i++) sum[i] += c0[i] * g[i] + c1[i] * b[i];
    }
  }
  const inverse = weights.inverseTotal;
  const n0 = first.sizes[0][0] * first.sizes[0][1];
  for (const out of outs) for (let i = 0; i < n0; i++) out[i] *= inverse[i];
}

/** Running sums of the coefficients themselves, sized for a ladder, kept in the workspace. */
function weightSums(ws: LadderWorkspace, pyr: Pick<LadderPyramid, 'levels' | 'sizes'>): Float32Array[] {
  const key = pyr.sizes.map(([w, h]) => `${w}x${h}`).join(',');
  if (ws.weightSums?.key !== key) ws.weightSums = { key, planes: pyr.sizes.map(([w, h]) => new Float32Array(w * h)) };
  return ws.weightSums.planes;
}

/** One ladder: see evaluateLadders. */
export function evaluateLadder(pyr: LadderPyramid, coefficients: LadderCoefficients | LadderWeights, out: Float32Array, sums: Float32Array[], ws: LadderWorkspace): Float32Array {
  evaluateLadders([pyr], coefficients, [out], [sums], ws);
  return out;
}

/**
 * A per-pixel quantity at every level's resolution, by 2 × 2 averaging from level 0 (for maps that
 * vary slowly, such as a log cutoff). `into` arrays are reused when given.
 */
export function mapPyramid(map0: Float32Array, pyr: Pick<LadderPyramid, 'levels' | 'sizes'>, into?: Float32Array[]): Float32Array[] {
  const maps: Float32Array[] = [map0];
  for (let k = 1; k < pyr.levels; k++) {
    const [pw, ph] = pyr.sizes[k - 1];
    const [w, h] = pyr.sizes[k];
    const out = into?.[k] && into[k].length === w * h ? into[k] : new Float32Array(w * h);
    const prev = maps[k - 1];
    for (let y = 0; y < h; y++) {
      const y0 = 2 * y;
      const y1 = Math.min(ph - 1, y0 + 1);
      for (let x = 0; x < w; x++) {
        const x0 = 2 * x;
        const x1 = Math.min(pw - 1, x0 + 1);
        out[y * w + x] = (prev[y0 * pw + x0] + prev[y0 * pw + x1] + prev[y1 * pw + x0] + prev[y1 * pw + x1]) / 4;
      }
    }
    maps.push(out);
  }
  return maps;
}
