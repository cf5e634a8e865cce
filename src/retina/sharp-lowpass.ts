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
import { ELEMENT_VARIANCES, type LadderCoefficients } from '../image/ladder-pyramid.js';
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
 * sharpCoefficient tabulated for every element of a ladder of `levels` levels, every 1/64 octave of
 * log2 cutoff (linear between): the fast path of the per-pixel filter (tests compare it with the
 * direct formula).
 */
interface SharpTable {
  first: number;
  stepsPerOctave: number;
  /** One table per element. */
  values: Float32Array[];
}

const SHARP_TABLE_STEPS_PER_OCTAVE = 64;
const sharpTables = new Map<number, SharpTable>();

function sharpTable(levels: number): SharpTable {
  let table = sharpTables.get(levels);
  if (!table) {
    const first = LOG2_CUTOFF_MIN;
    const steps = Math.ceil((LOG2_IDENTITY - first) * SHARP_TABLE_STEPS_PER_OCTAVE) + 2;
    const values = Array.from({ length: 2 * levels }, (_, n) => Float32Array.from({ length: steps }, (_, s) => sharpCoefficient(n, first + s / SHARP_TABLE_STEPS_PER_OCTAVE, levels)));
    table = { first, stepsPerOctave: SHARP_TABLE_STEPS_PER_OCTAVE, values };
    sharpTables.set(levels, table);
  }
  return table;
}

/** Tabulated coefficient of element n at log2 cutoff lc (identity beyond the table). */
function tabulated(table: SharpTable, n: number, lc: number): number {
  if (lc >= LOG2_IDENTITY) return n === 0 ? 1 : 0;
  const values = table.values[n];
  const u = Math.max(0, (lc - table.first) * table.stepsPerOctave);
  const i = Math.min(values.length - 2, Math.floor(u));
  return values[i] + (values[i + 1] - values[i]) * (u - i);
}

/** Where splitOnto puts its two shares (kept to avoid an allocation per call in the per-pixel loops). */
const split = new Float64Array(2);

/**
 * Splits coefficient c of an element of variance v (level-0 px²) onto elements m0 and m0 + 1,
 * linearly in variance between the two elements that bracket v: the shares land in `split`.
 * `elements` is the ladder's element count; variance beyond its top goes to the top element.
 */
function splitOnto(c: number, v: number, m0: number, elements: number): void {
  const E = ELEMENT_VARIANCES;
  const top = elements - 1;
  split[0] = 0;
  split[1] = 0;
  if (v >= E[top]) {
    if (m0 === top) split[0] = c;
    else if (m0 + 1 === top) split[1] = c;
  } else if (m0 > 0 && v < E[m0 - 1]) {
    // Lands on finer elements only.
  } else if (v < E[m0]) {
    // Between m0 − 1 and m0: m0 takes the upper share.
    split[0] = (c * (v - E[m0 - 1])) / (E[m0] - E[m0 - 1]);
  } else if (v < E[m0 + 1]) {
    const t = (v - E[m0]) / (E[m0 + 1] - E[m0]);
    split[0] = c * (1 - t);
    split[1] = c * t;
  } else if (m0 + 2 <= top && v < E[m0 + 2]) {
    split[1] = c * (1 - (v - E[m0 + 1]) / (E[m0 + 2] - E[m0 + 1]));
  }
}

/**
 * The coefficients of elements 2k and 2k + 1 with an extra blur folded in, tabulated per level k
 * over log2 cutoff (1/12 octave) and log2(1 + extra variance) (1/6 octave, to 2^20 px²): the gather over finer
 * elements (sharpWithExtra) done once per ladder size instead of per pixel.
 */
interface ExtraTable {
  lcSteps: number;
  extraSteps: number;
  /** Per level, interleaved (c0, c1) over [extra step][lc step]. */
  values: Float32Array[];
}

const EXTRA_LC_PER_OCTAVE = 12;
const EXTRA_LOG_PER_OCTAVE = 6;
const EXTRA_LOG_MAX = 20;
const extraTables = new Map<number, ExtraTable>();

/** The gathered coefficients of elements m0, m0 + 1 at one (lc, extra): the slow reference. */
export function sharpWithExtra(m0: number, lc: number, extra: number, levels: number): [number, number] {
  const table = sharpTable(levels);
  const elements = 2 * levels;
  let a = 0;
  let b = 0;
  for (let src = 0; src <= m0 + 1; src++) {
    const c = tabulated(table, src, lc);
    if (c === 0) continue;
    splitOnto(c, ELEMENT_VARIANCES[src] + extra, m0, elements);
    a += split[0];
    b += split[1];
  }
  return [a, b];
}

function extraTable(levels: number): ExtraTable {
  let table = extraTables.get(levels);
  if (!table) {
    const lcSteps = Math.ceil((LOG2_IDENTITY - LOG2_CUTOFF_MIN) * EXTRA_LC_PER_OCTAVE) + 2;
    const extraSteps = EXTRA_LOG_MAX * EXTRA_LOG_PER_OCTAVE + 2;
    const values = Array.from({ length: levels }, (_, k) => {
      const v = new Float32Array(2 * lcSteps * extraSteps);
      for (let e = 0; e < extraSteps; e++) {
        const extra = 2 ** (e / EXTRA_LOG_PER_OCTAVE) - 1;
        for (let l = 0; l < lcSteps; l++) {
          const [a, b] = sharpWithExtra(2 * k, LOG2_CUTOFF_MIN + l / EXTRA_LC_PER_OCTAVE, extra, levels);
          v[2 * (e * lcSteps + l)] = a;
          v[2 * (e * lcSteps + l) + 1] = b;
        }
      }
      return v;
    });
    table = { lcSteps, extraSteps, values };
    extraTables.set(levels, table);
  }
  return table;
}

/**
 * Coefficients of the sharp low-pass for a ladder, from log2 cutoff maps (cycles per level-0 px) at
 * each level's resolution and, optionally, maps of an extra blur as log2(1 + variance in level-0 px²).
 */
export function sharpLowpassCoefficients(log2CutoffMaps: readonly Float32Array[], levels: number, extraLog2Maps?: readonly Float32Array[]): LadderCoefficients {
  const table = sharpTable(levels);
  const withExtra = extraLog2Maps ? extraTable(levels) : undefined;
  const smallExtraLog2 = Math.log2(1 + 1e-6);
  const identityExtraLog2 = Math.log2(1.01);
  const first = table.first;
  const perOctave = table.stepsPerOctave;
  return (k, c0, c1, width, height) => {
    const lc = log2CutoffMaps[k];
    const extraMap = extraLog2Maps?.[k];
    const n = width * height;
    const m0 = 2 * k;
    const t0 = table.values[m0];
    const t1 = table.values[m0 + 1];
    const last = t0.length - 2;
    const lcSteps = withExtra ? withExtra.lcSteps : 0;
    const extraSteps = withExtra ? withExtra.extraSteps : 0;
    const v = withExtra ? withExtra.values[k] : t0;
    for (let i = 0; i < n; i++) {
      const l = lc[i];
      const extraLog2 = extraMap ? extraMap[i] : 0;
      if (!(extraLog2 > smallExtraLog2) || !withExtra || (l >= LOG2_IDENTITY && extraLog2 < identityExtraLog2)) {
        if (l >= LOG2_IDENTITY) {
          c0[i] = m0 === 0 ? 1 : 0;
          c1[i] = 0;
        } else {
          const u = (l - first) * perOctave;
          const j = u <= 0 ? 0 : u >= last ? last : Math.floor(u);
          const f = u <= 0 ? 0 : u - j;
          c0[i] = t0[j] + (t0[j + 1] - t0[j]) * f;
          c1[i] = t1[j] + (t1[j + 1] - t1[j]) * f;
        }
        continue;
      }
      // Bilinear in (lc, log2(1 + extra)) on the gathered table.
      let lu = (l - LOG2_CUTOFF_MIN) * EXTRA_LC_PER_OCTAVE;
      lu = lu < 0 ? 0 : lu > lcSteps - 1.0001 ? lcSteps - 1.0001 : lu;
      let eu = extraLog2 * EXTRA_LOG_PER_OCTAVE;
      eu = eu > extraSteps - 1.0001 ? extraSteps - 1.0001 : eu;
      const l0 = Math.floor(lu);
      const e0 = Math.floor(eu);
      const lt = lu - l0;
      const et = eu - e0;
      const p00 = 2 * (e0 * lcSteps + l0);
      const p10 = p00 + 2 * lcSteps;
      const w00 = (1 - lt) * (1 - et);
      const w01 = lt * (1 - et);
      const w10 = (1 - lt) * et;
      const w11 = lt * et;
      c0[i] = w00 * v[p00] + w01 * v[p00 + 2] + w10 * v[p10] + w11 * v[p10 + 2];
      c1[i] = w00 * v[p00 + 1] + w01 * v[p00 + 3] + w10 * v[p10 + 1] + w11 * v[p10 + 3];
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
      splitOnto(1, vmap[i] > 0 ? vmap[i] : 0, m0, elements);
      c0[i] = split[0];
      c1[i] = split[1];
    }
  };
}

/** Variance (px²) of a Gaussian that keeps 5 % at `cutoffCyclesPerPx`: exp(−2π²σ²f²) = 0.05. */
export function gaussianVarianceForCutoff(cutoffCyclesPerPx: number): number {
  return Math.log(20) / (2 * Math.PI * Math.PI * cutoffCyclesPerPx * cutoffCyclesPerPx);
}
