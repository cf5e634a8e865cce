/**
 * Spatially varying low-pass whose cost does not grow with the blur: a Gaussian pyramid, each level
 * expanded back to full size, blended per pixel between the two levels that bracket the wanted blur.
 * The wanted blur is a Gaussian that keeps 5 % of the contrast at the local cutoff; the blend between
 * levels approximates it (our proposal; Geisler & Perry 1998 blend pyramid levels in the same spirit).
 */
import type { Plane } from '../image/plane.js';
import { expand, levelSigmaPx, reduce } from './pyramid.js';

/** Response of the low-pass at the cutoff frequency: detail at the cutoff keeps 5 % of its contrast. */
export const RESPONSE_AT_CUTOFF = 0.05;

/**
 * Gaussian sigma (px) whose response at `cutoffCyclesPerPx` is RESPONSE_AT_CUTOFF:
 * exp(−2π²σ²f²) = r ⇒ σ = sqrt(ln(1/r) / 2) / (π·f). At a third of the cutoff the response is r^(1/9) ≈ 0.72.
 */
export function sigmaForCutoffPx(cutoffCyclesPerPx: number): number {
  return Math.sqrt(Math.log(1 / RESPONSE_AT_CUTOFF) / 2) / (Math.PI * cutoffCyclesPerPx);
}

/** Where, as a fraction of the cutoff, the level blend is matched to the wanted Gaussian (our proposal). */
export const MATCH_AT_FRACTION_OF_CUTOFF = 0.5;

/** Per-pixel blend between pyramid levels: the lower level and the weight of the level above it. */
export interface LevelBlend {
  lowerLevel: Uint8Array;
  upperWeight: Float32Array;
  levels: number;
}

/**
 * For each pixel, picks levels k, k+1 with σ_k ≤ σ < σ_{k+1} and the weight t such that the blend's
 * response at half the pixel's cutoff, f = f_c/2, matches the wanted Gaussian's there:
 * (1 − t)·m_k + t·m_{k+1} = g, with m_j = exp(−2π²σ_j²f²). Matching in the middle of the fall keeps
 * the pass band (a blend matched at f_c itself leans on the blurrier level and loses too much below
 * the cutoff) while detail above f_c is still removed. A match frequency above the frame's Nyquist
 * (0.5 cycles/px) is taken at 0.5, since the frame holds nothing finer.
 */
export function planLevelBlend(sigmaPx: Float32Array, maxLevels: number): LevelBlend {
  const sigmas = Array.from({ length: maxLevels + 1 }, (_, k) => levelSigmaPx(k));
  let top = 0;
  for (let i = 0; i < sigmaPx.length; i++) {
    while (top < maxLevels && sigmas[top] < sigmaPx[i]) top++;
  }
  const lowerLevel = new Uint8Array(sigmaPx.length);
  const upperWeight = new Float32Array(sigmaPx.length);
  // The blend depends on σ alone, so it is tabulated once as a continuous level k + t against log2 σ
  // (continuous across level boundaries, so linear interpolation is safe) and looked up per pixel.
  const table = levelTable(sigmas, top);
  for (let i = 0; i < sigmaPx.length; i++) {
    const s = sigmaPx[i];
    if (!(s > 0)) continue;
    if (s >= sigmas[top]) {
      lowerLevel[i] = top;
      continue;
    }
    const u = (Math.log2(s) - TABLE_LOG2_MIN) * TABLE_STEPS_PER_OCTAVE;
    let level: number;
    if (u <= 0) level = table[0];
    else {
      const j = Math.min(table.length - 2, Math.floor(u));
      level = table[j] + (table[j + 1] - table[j]) * (u - j);
    }
    const k = Math.min(top - 1, Math.floor(level));
    lowerLevel[i] = k;
    upperWeight[i] = Math.min(1, Math.max(0, level - k));
  }
  return { lowerLevel, upperWeight, levels: top };
}

const TABLE_LOG2_MIN = -8;
const TABLE_STEPS_PER_OCTAVE = 256;

/** Continuous level k + t for σ = 2^(TABLE_LOG2_MIN + j/TABLE_STEPS_PER_OCTAVE), up to σ_top. */
function levelTable(sigmas: number[], top: number): Float64Array {
  const steps = Math.ceil((Math.log2(Math.max(sigmas[top], 1)) - TABLE_LOG2_MIN) * TABLE_STEPS_PER_OCTAVE) + 2;
  const table = new Float64Array(steps);
  const gaussianResponse = (sigma: number, f: number): number => Math.exp(-2 * Math.PI * Math.PI * sigma * sigma * f * f);
  const cutoffTimesSigma = Math.sqrt(Math.log(1 / RESPONSE_AT_CUTOFF) / 2) / Math.PI;
  for (let j = 0; j < steps; j++) {
    const s = Math.min(2 ** (TABLE_LOG2_MIN + j / TABLE_STEPS_PER_OCTAVE), sigmas[top]);
    let k = 0;
    while (k < top - 1 && sigmas[k + 1] <= s) k++;
    const f = Math.min((MATCH_AT_FRACTION_OF_CUTOFF * cutoffTimesSigma) / s, 0.5);
    const target = gaussianResponse(s, f);
    const mk = gaussianResponse(sigmas[k], f);
    const mk1 = gaussianResponse(sigmas[k + 1], f);
    table[j] = k + Math.min(1, Math.max(0, (mk - target) / (mk - mk1)));
  }
  return table;
}

/** Number of pyramid levels worth building for a frame: until a level would be smaller than 4 px. */
export function maxPyramidLevels(width: number, height: number): number {
  let levels = 0;
  for (let w = width, h = height; Math.min(w, h) >= 8 && levels < 12; w = Math.ceil(w / 2), h = Math.ceil(h / 2)) levels++;
  return levels;
}

/** Applies a planned blend to one plane, writing into `out` (may not alias `src.data`). */
export function blurVariable(src: Plane, blend: LevelBlend, out: Float32Array): Float32Array {
  const { width, height } = src;
  const n = width * height;
  const { lowerLevel, upperWeight } = blend;
  const usesLevel = new Array<boolean>(blend.levels + 1).fill(false);
  for (let i = 0; i < n; i++) {
    usesLevel[lowerLevel[i]] = true;
    if (upperWeight[i] > 0) usesLevel[lowerLevel[i] + 1] = true;
  }
  out.fill(0);
  const sizes: [number, number][] = [[width, height]];
  let level: Plane = src;
  for (let k = 0; k <= blend.levels; k++) {
    if (k > 0) {
      level = reduce(level);
      sizes.push([level.width, level.height]);
    }
    if (!usesLevel[k]) continue;
    let full = level;
    for (let j = k - 1; j >= 0; j--) full = expand(full, sizes[j][0], sizes[j][1]);
    const data = full.data;
    for (let i = 0; i < n; i++) {
      const lower = lowerLevel[i];
      const t = upperWeight[i];
      const w = lower === k ? 1 - t : lower + 1 === k ? t : 0;
      if (w !== 0) out[i] += w * data[i];
    }
  }
  return out;
}
