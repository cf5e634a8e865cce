/**
 * The retina's sampling-limited low-pass: at every pixel, a filter that keeps 5 % of the contrast at
 * the local cutoff f_c (where the acuity model puts the sampling limit) and about 0.8 at f_c/2 — a
 * sampling limit passes what lies well below it (our proposal for the filter's shape, target
 * exp(ln(0.05)·(f/f_c)⁴)). It is a per-pixel combination of the half-octave ladder
 * (src/image/ladder-pyramid.ts) with coefficients from tables fitted by scripts/fit-retina-filter.ts.
 * Where the cutoff exceeds the frame's own limit (0.5 cycles/px) nothing at all is removed; between
 * 0.5 and 0.6 cycles/px the filter fades to that identity so that no ring appears where it starts.
 *
 * An extra Gaussian blur per pixel (the eye's off-axis optics) is folded in without another pass: a
 * ladder element of variance v blurred by e is the element of variance v + e, so each coefficient is
 * moved up the ladder, split linearly in variance between the two elements that bracket v + e.
 */
import { ladderElementVariance, type LadderCoefficients } from '../image/ladder-pyramid.js';
import { SHARP_DELTA_MIN, SHARP_DELTA_STEP, SHARP_TABLE_NODES, SHARP_TABLES } from './sharp-lowpass-table.js';

/** The frame's own limit: nothing finer than 0.5 cycles/px exists in it. */
export const PIXEL_LIMIT_CYCLES_PER_PX = 0.5;
/** Cutoff (cycles/px) from which the filter is exactly the identity. */
export const IDENTITY_FROM_CYCLES_PER_PX = 0.6;
const LOG2_PIXEL_LIMIT = Math.log2(PIXEL_LIMIT_CYCLES_PER_PX);
const LOG2_IDENTITY = Math.log2(IDENTITY_FROM_CYCLES_PER_PX);
/** Lowest log2 cutoff tabulated for the normaliser; below it the pyramid's top carries the mean. */
const LOG2_CUTOFF_MIN = -14;
const NORMALISER_STEPS_PER_OCTAVE = 64;

/** Table value for a level (set 0, 1 or 2 for coarser) and family at δ; 0 outside the table. */
function tableValue(level: number, family: number, delta: number): number {
  const t = (delta - SHARP_DELTA_MIN) / SHARP_DELTA_STEP;
  if (t <= 0 || t >= SHARP_TABLE_NODES - 1) return 0;
  const i = Math.floor(t);
  const table = SHARP_TABLES[Math.min(level, 2) * 2 + family];
  return table[i] + (table[i + 1] - table[i]) * (t - i);
}

/** 1 / Σ coefficients over the ladder's elements, against log2 cutoff (cycles per level-0 px). */
function createNormaliser(levels: number): Float64Array {
  const steps = Math.ceil((LOG2_IDENTITY - LOG2_CUTOFF_MIN) * NORMALISER_STEPS_PER_OCTAVE) + 2;
  const table = new Float64Array(steps);
  for (let s = 0; s < steps; s++) {
    const lc = LOG2_CUTOFF_MIN + s / NORMALISER_STEPS_PER_OCTAVE;
    let sum = 0;
    for (let k = 0; k < levels; k++) sum += tableValue(k, 0, lc + k) + tableValue(k, 1, lc + k);
    table[s] = sum > 1e-6 ? 1 / sum : 0;
  }
  return table;
}

const normalisers = new Map<number, Float64Array>();

/**
 * Coefficient of ladder element n (level n >> 1, family n & 1) for a pixel whose cutoff is
 * 2^lc cycles per level-0 px, in a ladder of `levels` levels; the coefficients sum to 1.
 */
export function sharpCoefficient(n: number, lc: number, levels: number): number {
  if (lc >= LOG2_IDENTITY) return n === 0 ? 1 : 0;
  let norm = normalisers.get(levels);
  if (!norm) {
    norm = createNormaliser(levels);
    normalisers.set(levels, norm);
  }
  const level = n >> 1;
  const at = Math.max(0, (lc - LOG2_CUTOFF_MIN) * NORMALISER_STEPS_PER_OCTAVE);
  const j = Math.min(norm.length - 2, Math.floor(at));
  const scale = norm[j] + (norm[j + 1] - norm[j]) * (at - j);
  let c = tableValue(level, n & 1, lc + level) * scale;
  // At the coarsest cutoffs the table can run past the ladder's top: the top element takes the rest.
  if (scale === 0 && n === 2 * levels - 2) c = 1;
  if (lc <= LOG2_PIXEL_LIMIT) return c;
  const t = (lc - LOG2_PIXEL_LIMIT) / (LOG2_IDENTITY - LOG2_PIXEL_LIMIT);
  return (1 - t) * c + (n === 0 ? t : 0);
}

/**
 * Where an extra blur of variance `extra` (level-0 px²) moves the coefficient of element n: the two
 * elements bracketing v_n + extra and the share going to the upper one.
 */
export function ladderShift(n: number, extra: number, elements: number): [number, number, number] {
  const v = ladderElementVariance(n) + extra;
  let j = Math.floor(Math.log2(v + 1));
  if (j >= elements - 1) return [elements - 1, elements - 1, 0];
  // Guard against rounding in log2 at exact powers of two.
  if (ladderElementVariance(j + 1) <= v) j++;
  if (j >= elements - 1) return [elements - 1, elements - 1, 0];
  const lo = ladderElementVariance(j);
  const hi = ladderElementVariance(j + 1);
  return [j, j + 1, (v - lo) / (hi - lo)];
}

/**
 * Coefficients of the sharp low-pass for a ladder, from log2 cutoff maps (cycles per level-0 px) at
 * each level's resolution and, optionally, extra-blur variance maps (level-0 px²).
 */
export function sharpLowpassCoefficients(log2CutoffMaps: readonly Float32Array[], levels: number, extraVarianceMaps?: readonly Float32Array[]): LadderCoefficients {
  const elements = 2 * levels;
  return (k, c0, c1, width, height) => {
    const lc = log2CutoffMaps[k];
    const extraMap = extraVarianceMaps?.[k];
    const n = width * height;
    const m0 = 2 * k;
    for (let i = 0; i < n; i++) {
      const extra = extraMap ? extraMap[i] : 0;
      if (!(extra > 1e-6)) {
        c0[i] = sharpCoefficient(m0, lc[i], levels);
        c1[i] = sharpCoefficient(m0 + 1, lc[i], levels);
        continue;
      }
      // Gather from every finer or equal element whose shifted position lands on m0 or m0 + 1.
      let a = 0;
      let b = 0;
      for (let src = 0; src <= m0 + 1; src++) {
        const c = sharpCoefficient(src, lc[i], levels);
        if (c === 0) continue;
        const [lo, hi, t] = ladderShift(src, extra, elements);
        if (lo === m0) a += c * (1 - t);
        else if (lo === m0 + 1) b += c * (1 - t);
        if (hi === m0 && lo !== hi) a += c * t;
        else if (hi === m0 + 1 && lo !== hi) b += c * t;
      }
      c0[i] = a;
      c1[i] = b;
    }
  };
}

/**
 * Coefficients of a Gaussian-like blur of per-pixel variance (level-0 px²): the two ladder elements
 * bracketing the variance, mixed so that the mixture has exactly that variance. Non-negative, so no
 * ringing — for blurs in front of the eye and for colour and rod signals.
 */
export function gaussianLadderCoefficients(varianceMaps: readonly Float32Array[], levels: number): LadderCoefficients {
  const elements = 2 * levels;
  return (k, c0, c1, width, height) => {
    const vmap = varianceMaps[k];
    const n = width * height;
    const m0 = 2 * k;
    for (let i = 0; i < n; i++) {
      const [lo, hi, t] = ladderShift(0, Math.max(0, vmap[i]), elements);
      c0[i] = (lo === m0 ? 1 - t : 0) + (hi === m0 && hi !== lo ? t : 0);
      c1[i] = (lo === m0 + 1 ? 1 - t : 0) + (hi === m0 + 1 && hi !== lo ? t : 0);
      if (lo === hi && lo === m0) c0[i] = 1;
      if (lo === hi && lo === m0 + 1) c1[i] = 1;
    }
  };
}

/** Variance (px²) of a Gaussian that keeps 5 % at `cutoffCyclesPerPx`: exp(−2π²σ²f²) = 0.05. */
export function gaussianVarianceForCutoff(cutoffCyclesPerPx: number): number {
  return Math.log(20) / (2 * Math.PI * Math.PI * cutoffCyclesPerPx * cutoffCyclesPerPx);
}
