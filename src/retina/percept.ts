/**
 * From the retinal image to the percept, in two steps. `prepareRetina` does what depends only on the
 * image: opponent channels and their ladders (src/image/ladder-pyramid.ts). `renderPercept` does what
 * depends on the gaze: per-pixel low-passes at the local cutoffs, evaluated from the ladders.
 *
 * - Luminance (the achromatic channel, L + M): the retina's sharp sampling limit (sharp-lowpass.ts),
 *   with the eye's off-axis optical blur folded in, kept from ringing (ringing-clamp.ts).
 * - Colour (red–green, blue–yellow) is blurred at each channel's cutoff (a Gaussian-like low-pass,
 *   colour-loss.ts), at a reduced resolution (its cutoffs are far below the frame's; near the gaze,
 *   where a channel's blur is smaller than the reduction's own, the full-size colour is mixed in so
 *   the mixture has the channel's variance), and bound to the percept's luminance (bindToLuminance, after the guided filter of
 *   He, Sun & Tang 2010): a patch keeps its colour up to its edge as sharply as the viewer sees the
 *   edge, while colour on detail the colour channel cannot resolve, and colour detail of equal
 *   luminance, fades at the channel's cutoff. Red–green blurs farther than
 *   blue–yellow; where that would make a hue of its own, the colour is held to the hue of the two
 *   channels blurred alike (holdHue): colour may fade toward grey and spread a little, but takes no
 *   hue the frame lacks there.
 * - Rods (in dim light): a colourless, coarse signal, mixed by the CIE 191 mesopic coefficient.
 * - The blind spot of one eye is filled from its surroundings.
 */
import { LINEAR_SRGB_TO_OPPONENT, OPPONENT_TO_LINEAR_SRGB } from '../colour/cone-space.js';
import { transformPlanes } from '../colour/matrix3.js';
import { scotopicOfLinearSrgb } from '../colour/scotopic.js';
import { blur5, expand7, reduce7, reducedSize } from '../image/binomial.js';
import { buildLadder, createLadderSums, createLadderWorkspace, evaluateLadders, ladderWeights, mapPyramid, type LadderPyramid, type LadderWeights, type LadderWorkspace } from '../image/ladder-pyramid.js';
import { createLinearRgb, type LinearRgb } from '../image/plane.js';
import { fillFromSurround } from './blind-spot.js';
import { buildRangePyramids, clampToLocalRange, clampToLocalRanges, type RangePyramids } from './ringing-clamp.js';
import { SCOTOPIC_PER_PHOTOPIC_WHITE } from './rod-vision.js';
import { gaussianLadderCoefficients, IDENTITY_FROM_CYCLES_PER_PX, sharpLowpassCoefficients } from './sharp-lowpass.js';

/** A signal reduced `level` times (a coarser grid), with its ladder. */
export interface CoarseSignal {
  level: number;
  width: number;
  height: number;
  planes: Float32Array[];
  ladders: LadderPyramid[];
  sums: Float32Array[][];
  workspace: LadderWorkspace;
}

export interface PreparedRetina {
  width: number;
  height: number;
  /** The retinal image (linear RGB planes), for the full-size colour near the gaze. */
  retinal: LinearRgb;
  /** Achromatic plane (L + M = luminance) of the retinal image and its ladder. */
  achromatic: Float32Array;
  achromaticLadder: LadderPyramid;
  achromaticSums: Float32Array[];
  /** Local extremes of the achromatic plane, against ringing, and of the colour planes (at the colour resolution), against excess. */
  achromaticRange: RangePyramids;
  colourRanges: [RangePyramids, RangePyramids];
  workspace: LadderWorkspace;
  /** A, RG, BY, A·RG, A·BY, A² at the colour resolution (COLOUR_PLANE). */
  colour: CoarseSignal;
  /** RG and BY at full size over a 1 px² window, bound to luminance (when colour is worked at a reduced size). */
  slightlyBlurred?: [Float32Array, Float32Array];
  /** Scotopic signal (white = 1) at the rod resolution, when rods take part. */
  rods?: CoarseSignal;
  /** Scratch planes and filter weights kept between gazes, by name. */
  pool: Map<string, Float32Array>;
  weights: Map<string, LadderWeights>;
  ladders: Map<string, LadderPyramid>;
}

export interface PrepareRetinaOptions {
  /** Times the colour channels are halved in size (their cutoffs are far below the frame's). */
  colourLevel: number;
  /** Times the rod signal is halved, or undefined when rods play no part (photopic light). */
  rodLevel?: number;
}

/** A scratch plane of the pool, created once per name and size. */
function scratch(prep: PreparedRetina, name: string, size: number): Float32Array {
  let a = prep.pool.get(name);
  if (!a || a.length !== size) {
    a = new Float32Array(size);
    prep.pool.set(name, a);
  }
  return a;
}

function sizesFrom(width: number, height: number, levels: number): [number, number][] {
  const sizes: [number, number][] = [[width, height]];
  for (let k = 1; k < levels; k++) sizes.push(reducedSize(...sizes[k - 1]));
  return sizes;
}

/** A plane reduced `times` times (the plane itself when 0). */
function reduceTimes(plane: Float32Array, width: number, height: number, times: number, rows: Float32Array): Float32Array {
  let cur = plane;
  let [w, h] = [width, height];
  for (let k = 0; k < times; k++) {
    const [nw, nh] = reducedSize(w, h);
    const next = new Float32Array(nw * nh);
    reduce7(cur, w, h, next, rows);
    [cur, w, h] = [next, nw, nh];
  }
  return cur;
}

/** A signal `level` times reduced, from planes `reductions` short of it (full size by default). */
function coarseSignal(planes: Float32Array[], width: number, height: number, level: number, rows: Float32Array, reductions = level): CoarseSignal {
  const [w, h] = sizesFrom(width, height, level + 1)[level];
  const reduced = planes.map((p) => reduceTimes(p, width, height, reductions, rows));
  const workspace = createLadderWorkspace(w, h);
  const ladders = reduced.map((r) => buildLadder(r, w, h, workspace));
  return { level, width: w, height: h, planes: reduced, ladders, sums: ladders.map(createLadderSums), workspace };
}

/** Indices of the colour signal's planes. */
const COLOUR_PLANE = { a: 0, rg: 1, by: 2, aRg: 3, aBy: 4, aa: 5 } as const;

/** The gaze-independent part: opponent planes and their ladders. */
export function prepareRetina(retinal: LinearRgb, options: PrepareRetinaOptions): PreparedRetina {
  const { width, height } = retinal;
  const n = width * height;
  const [r, g, b] = retinal.planes;
  const M = LINEAR_SRGB_TO_OPPONENT;
  const achromatic = new Float32Array(n);
  for (let i = 0; i < n; i++) achromatic[i] = M[0][0] * r[i] + M[0][1] * g[i] + M[0][2] * b[i];
  const workspace = createLadderWorkspace(width, height);
  const achromaticLadder = buildLadder(achromatic, width, height, workspace);
  // The colour signal: A, RG, BY and the products A·RG, A·BY, A² for window statistics (COLOUR_PLANE),
  // each made at full size in one scratch plane and reduced before the next.
  const level = options.colourLevel;
  const rows = workspace.rows;
  const reduced = (plane: Float32Array): Float32Array => (level === 0 ? Float32Array.from(plane) : reduceTimes(plane, width, height, level, rows));
  const rgAt = (i: number): number => M[1][0] * r[i] + M[1][1] * g[i] + M[1][2] * b[i];
  const byAt = (i: number): number => M[2][0] * r[i] + M[2][1] * g[i] + M[2][2] * b[i];
  const full = new Float32Array(n);
  for (let i = 0; i < n; i++) full[i] = achromatic[i] * achromatic[i];
  const reducedAa = reduced(full);
  // Near the gaze colour is blurred less than the reduction does: there the colour bound to luminance
  // over a 1 px² window (the same regression as bindToLuminance, fully bound) is kept at full size.
  let slightlyBlurred: [Float32Array, Float32Array] | undefined;
  let meanA: Float32Array | undefined;
  let varA: Float32Array | undefined;
  if (level > 0) {
    meanA = new Float32Array(n);
    varA = new Float32Array(n);
    blur5(achromatic, width, height, meanA, rows);
    blur5(full, width, height, varA, rows);
    for (let i = 0; i < n; i++) varA[i] = Math.max(0, varA[i] - meanA[i] * meanA[i]) + 0.0009 * meanA[i] * meanA[i] + 4e-6;
    slightlyBlurred = [new Float32Array(n), new Float32Array(n)];
  }
  const channel = (colourAt: (i: number) => number, k: 0 | 1): [Float32Array, Float32Array] => {
    for (let i = 0; i < n; i++) full[i] = colourAt(i);
    const c = reduced(full);
    const out = slightlyBlurred?.[k];
    if (out && meanA && varA) blur5(full, width, height, out, rows);
    for (let i = 0; i < n; i++) full[i] *= achromatic[i];
    const ac = reduced(full);
    if (out && meanA && varA) {
      const meanAc = new Float32Array(n);
      blur5(full, width, height, meanAc, rows);
      for (let i = 0; i < n; i++) {
        const slope = (meanAc[i] - meanA[i] * out[i]) / varA[i];
        out[i] += slope * (achromatic[i] - meanA[i]);
      }
    }
    return [c, ac];
  };
  const [rgPlane, aRgPlane] = channel(rgAt, 0);
  const [byPlane, aByPlane] = channel(byAt, 1);
  const planes = [level === 0 ? achromatic : reduced(achromatic), rgPlane, byPlane, aRgPlane, aByPlane, reducedAa];
  const colour = coarseSignal(planes, width, height, level, workspace.rows, 0);
  const [cw, ch] = [colour.width, colour.height];
  const colourLevels = colour.ladders[0].levels;
  let rods: CoarseSignal | undefined;
  if (options.rodLevel !== undefined) {
    const scotopic = new Float32Array(n);
    // Rods see scotopic luminance; dividing by white's ratio keeps white as bright as for cones.
    for (let i = 0; i < n; i++) scotopic[i] = scotopicOfLinearSrgb(r[i], g[i], b[i]) / SCOTOPIC_PER_PHOTOPIC_WHITE;
    rods = coarseSignal([scotopic], width, height, options.rodLevel, workspace.rows);
  }
  return {
    width, height, retinal, achromatic, achromaticLadder, achromaticSums: createLadderSums(achromaticLadder),
    achromaticRange: buildRangePyramids(achromatic, width, height, achromaticLadder.levels),
    colourRanges: [
      buildRangePyramids(colour.planes[COLOUR_PLANE.rg], cw, ch, colourLevels),
      buildRangePyramids(colour.planes[COLOUR_PLANE.by], cw, ch, colourLevels),
    ],
    workspace, colour, ...(slightlyBlurred ? { slightlyBlurred } : {}), rods, pool: new Map(), weights: new Map(), ladders: new Map(),
  };
}

/** Per-pixel filters for one gaze, full size. */
export interface RetinaCutoffs {
  /** The retina's luminance cutoff, log2 of cycles per frame pixel. */
  achromaticLog2: Float32Array;
  /** Variance (frame px²) of the blur standing in for the eye's off-axis optics. */
  offAxisVariancePx2?: Float32Array;
  /** Variances (frame px²) of the Gaussian-like colour and rod low-passes. */
  redGreenVariancePx2: Float32Array;
  blueYellowVariancePx2: Float32Array;
  rodVariancePx2?: Float32Array;
}

export interface PerceptInput {
  cutoffs: RetinaCutoffs;
  /** Share of cone vision (CIE 191 m): 1 photopic, 0 scotopic. */
  coneShare: number;
  /** 1 where the retina has information, 0 in the blind spot; undefined when there is none. */
  seen?: Float32Array;
}

/**
 * A full-size variance map (frame px²) at every level of a coarse signal's ladder, in the signal's own
 * px², less `lessPx2` (frame px², the variance the reduction itself brings).
 */
function varianceMaps(variancePx2: Float32Array, signal: CoarseSignal, fullWidth: number, fullHeight: number, lessPx2 = 0): Float32Array[] {
  const full = mapPyramid(variancePx2, { levels: signal.level + 1, sizes: sizesFrom(fullWidth, fullHeight, signal.level + 1) });
  const scale = 4 ** signal.level;
  const atSignal = full[signal.level].map((v) => Math.max(0, v - lessPx2) / scale);
  return mapPyramid(atSignal, signal.ladders[0]);
}

/** Expands a coarse plane back to full size into `out`. */
function expandTimes(plane: Float32Array, signal: CoarseSignal, prep: PreparedRetina, out: Float32Array): Float32Array {
  if (signal.level === 0) {
    out.set(plane);
    return out;
  }
  const sizes = sizesFrom(prep.width, prep.height, signal.level + 1);
  let cur = plane;
  for (let k = signal.level - 1; k >= 0; k--) {
    const next = k === 0 ? out : scratch(prep, `expand-${k}`, sizes[k][0] * sizes[k][1]);
    expand7(cur, sizes[k + 1][0], sizes[k + 1][1], next, sizes[k][0], sizes[k][1], prep.workspace.rows);
    cur = next;
  }
  return out;
}

/**
 * Holds a colour to the hue of a reference mixture: v is projected on the reference's direction
 * (never past it to the opposite hue); where the reference is weak beside v (a pattern only the
 * sharper channel keeps) v stands.
 */
export function holdHue(vx: number, vy: number, rx: number, ry: number): [number, number] {
  const r = Math.sqrt(rx * rx + ry * ry);
  const v = Math.sqrt(vx * vx + vy * vy);
  if (v === 0 || r === 0) return [vx, vy];
  const confidence = Math.min(1, r / (0.5 * v));
  const along = Math.max(0, (vx * rx + vy * ry) / r);
  return [confidence * (along * rx) / r + (1 - confidence) * vx, confidence * (along * ry) / r + (1 - confidence) * vy];
}

/** log2 of the cutoff (cycles/px) at which a Gaussian of the given variance keeps 5 %, into `out`. */
function log2CutoffOfVariance(variancePx2: Float32Array, out: Float32Array): Float32Array {
  const half = 0.5 * Math.log2(Math.log(20) / (2 * Math.PI * Math.PI));
  for (let i = 0; i < out.length; i++) out[i] = variancePx2[i] > 0 ? half - 0.5 * Math.log2(variancePx2[i]) : 10;
  return out;
}

/** Blurred luminance below which a region is taken as black and given no chromaticity (linear, 1 = white). */
const CHROMA_FLOOR = 1e-4;

/** Local statistics of the retinal image under one colour channel's blur (window means). */
interface WindowStats {
  /** Means of A, of the colour plane C, of A·C and of A². */
  a: Float32Array;
  c: Float32Array;
  ac: Float32Array;
  aa: Float32Array;
  /** The window's variance of A blurred at the channel's cutoff: the luminance structure the channel resolves. */
  resolvedVariance: Float32Array;
}

/**
 * Binds a colour plane C to the percept's luminance A′ as C′ = a·A′ + b, from window statistics of
 * the retinal image over the colour channel's blur (after the guided filter of He, Sun & Tang 2010),
 * mixing two estimates by how much of the window's luminance structure the colour channel resolves,
 * s = sqrt(var(A_b) / var(A)) (A_b: A at the channel's cutoff):
 * - bound (weight s): C regressed on A over the window, slope cov(A, C)/var(A), rebuilt on A′ — a
 *   patch's colour stays on its side of its edge, as sharply as the viewer sees that edge;
 * - chromaticity (weight 1 − s): A′ times the window's luminance-weighted chromaticity mean(C)/mean(A)
 *   — colour on luminance detail the channel cannot resolve fades (a small dot, a fine pattern)
 *   unless the detail is only darker (dark text on a coloured chip leaves the chip its colour).
 * Where the luminance is flat both give mean(C): the channel's own blur, once.
 * Our proposal; ε (3 % of the local mean, and a floor) keeps flat regions from lending colour to noise.
 */
function bindToLuminance(stats: WindowStats, a: Float32Array, b: Float32Array): void {
  const { a: mA, c: mC, ac: mAC, aa: mAA, resolvedVariance } = stats;
  for (let i = 0; i < mA.length; i++) {
    const m = mA[i];
    const eps = 0.0009 * m * m + 4e-6;
    const varA = Math.max(0, mAA[i] - m * m) + eps;
    const slope = (mAC[i] - m * mC[i]) / varA;
    const s = Math.min(1, Math.sqrt((resolvedVariance[i] + eps) / varA));
    const chromaticity = m > CHROMA_FLOOR ? mC[i] / m : 0;
    a[i] = s * slope + (1 - s) * chromaticity;
    b[i] = s * (mC[i] - slope * m);
  }
}

/** A filter's weights for the colour signal's ladders, from a variance map at its levels (kept in the pool under `tag`). */
function colourWeights(prep: PreparedRetina, tag: string, maps: Float32Array[], scale = 1): LadderWeights {
  const c = prep.colour;
  const levels = c.ladders[0].levels;
  const weights = ladderWeights(c.ladders[0], gaussianLadderCoefficients(scale === 1 ? maps : maps.map((m) => m.map((v) => scale * v)), levels), c.workspace, prep.weights.get(tag));
  prep.weights.set(tag, weights);
  return weights;
}

/** Pooled arrays for the levels above 0 of a pyramid's sizes (level 0 is the caller's own). */
function pooledLevels(prep: PreparedRetina, tag: string, pyr: Pick<LadderPyramid, 'sizes'>): Float32Array[] {
  return pyr.sizes.map(([w, h], k) => (k === 0 ? new Float32Array(0) : scratch(prep, `${tag}-level-${k}`, w * h)));
}

/**
 * Window statistics of the colour signal under one channel's blur: the prepared ladders of A, C, A·C
 * and A² (C, A·C by index; `extra` more planes are evaluated alongside, for the hue reference), and
 * the resolved variance var(A_b) = mean(A_b²) − mean(A_b)², from a ladder of A_b² built for this blur
 * and A under twice the variance (the window mean of A_b).
 */
function windowStats(prep: PreparedRetina, tag: string, maps: Float32Array[], planes: { c: number; ac: number }, extra: number[] = []): { stats: WindowStats; extra: Float32Array[] } {
  const sig = prep.colour;
  const { ladders, sums, width, height } = sig;
  const m = width * height;
  const weights = colourWeights(prep, tag, maps);
  const pick = [COLOUR_PLANE.a, planes.c, planes.ac, COLOUR_PLANE.aa, ...extra];
  const outs = pick.map((_, k) => scratch(prep, `${tag}-${k}`, m));
  evaluateLadders(pick.map((k) => ladders[k]), weights, outs, pick.map((k) => sums[k]), sig.workspace);
  const [a, c, ac, aa, ...extraOuts] = outs;
  const square = scratch(prep, `${tag}-square`, m);
  for (let i = 0; i < m; i++) square[i] = a[i] * a[i];
  const squareLadder = buildLadder(square, width, height, sig.workspace, prep.ladders.get(tag));
  prep.ladders.set(tag, squareLadder);
  const meanOfSquare = scratch(prep, `${tag}-mean-square`, m);
  evaluateLadders([squareLadder], weights, [meanOfSquare], [sig.sums[COLOUR_PLANE.a]], sig.workspace);
  const meanTwice = scratch(prep, `${tag}-mean-twice`, m);
  evaluateLadders([ladders[COLOUR_PLANE.a]], colourWeights(prep, `${tag}-twice`, maps, 2), [meanTwice], [sums[COLOUR_PLANE.a]], sig.workspace);
  const resolvedVariance = meanOfSquare;
  for (let i = 0; i < m; i++) resolvedVariance[i] = Math.max(0, meanOfSquare[i] - meanTwice[i] * meanTwice[i]);
  return { stats: { a, c, ac, aa, resolvedVariance }, extra: extraOuts };
}

/** The gaze-dependent step: the percept for one set of cutoff maps (into `into`'s planes when given). */
export function renderPercept(prep: PreparedRetina, input: PerceptInput, into?: LinearRgb): LinearRgb {
  const { width, height } = prep;
  const n = width * height;
  const { cutoffs, coneShare } = input;
  const percept = into && into.width === width && into.height === height ? into : createLinearRgb(width, height);
  if (percept === into) for (const p of percept.planes) p.fill(0);

  if (coneShare > 0) {
    // Luminance: the sharp sampling limit with the off-axis optics folded in.
    const al = prep.achromaticLadder;
    const lcMaps = mapPyramid(cutoffs.achromaticLog2, al, pooledLevels(prep, 'lc', al));
    let extra: Float32Array[] | undefined;
    if (cutoffs.offAxisVariancePx2) {
      const log2Extra = scratch(prep, 'extra-log2', n);
      for (let i = 0; i < n; i++) log2Extra[i] = Math.log2(1 + cutoffs.offAxisVariancePx2[i]);
      extra = mapPyramid(log2Extra, al, pooledLevels(prep, 'extra', al));
    }
    const lum = scratch(prep, 'luminance', n);
    const weights = ladderWeights(al, sharpLowpassCoefficients(lcMaps, al.levels, extra), prep.workspace, prep.weights.get('luminance'));
    prep.weights.set('luminance', weights);
    evaluateLadders([al], weights, [lum], [prep.achromaticSums], prep.workspace);
    clampToLocalRange(lum, prep.achromaticRange, cutoffs.achromaticLog2);
    // Coarse levels see cutoffs averaged over their blocks, which near the fovea mixes in a little
    // of the periphery's blur: where the cutoff lies above the frame's limit, the frame is kept exactly.
    const identityFrom = Math.log2(IDENTITY_FROM_CYCLES_PER_PX);
    const offAxis = cutoffs.offAxisVariancePx2;
    for (let i = 0; i < n; i++) {
      if (cutoffs.achromaticLog2[i] >= identityFrom && !(offAxis && offAxis[i] > 0.01)) lum[i] = prep.achromatic[i];
    }

    // Colour at its own resolution: window statistics of the retinal image under each channel's
    // blur, bound to the percept's luminance. The reduction to that resolution and back blurs by
    // 4^level − 1 px² already: that much less is asked of the ladder, and below it the full-size
    // colour is mixed in (a mixture of no blur and that blur has the variance asked for).
    const c = prep.colour;
    const intrinsic = 4 ** c.level - 1;
    const rgMaps = varianceMaps(cutoffs.redGreenVariancePx2, c, width, height, intrinsic);
    const byMaps = varianceMaps(cutoffs.blueYellowVariancePx2, c, width, height, intrinsic);
    // Under the red–green blur: A, RG, A·RG, A² and, for the hue reference, BY and A·BY.
    const underRg = windowStats(prep, 'rg', rgMaps, { c: COLOUR_PLANE.rg, ac: COLOUR_PLANE.aRg }, [COLOUR_PLANE.by, COLOUR_PLANE.aBy]);
    const underBy = windowStats(prep, 'by', byMaps, { c: COLOUR_PLANE.by, ac: COLOUR_PLANE.aBy });
    const reference: WindowStats = { ...underRg.stats, c: underRg.extra[0], ac: underRg.extra[1] };
    const m = c.width * c.height;
    const coefficients = [0, 1, 2, 3, 4, 5].map((k) => scratch(prep, `bind-${k}`, m));
    bindToLuminance(underRg.stats, coefficients[0], coefficients[1]);
    bindToLuminance(underBy.stats, coefficients[2], coefficients[3]);
    bindToLuminance(reference, coefficients[4], coefficients[5]);
    const [aRg, bRg, aBy, bBy, aRef, bRef] = coefficients.map((plane, k) => expandTimes(plane, c, prep, scratch(prep, `bind-full-${k}`, n)));
    // The colour rebuilt on the percept's luminance (written over aRg, bRg) and held to the hue of
    // the two channels blurred alike.
    const chromaRg = aRg;
    const chromaBy = bRg;
    const [r, g, b] = prep.retinal.planes;
    const M = LINEAR_SRGB_TO_OPPONENT;
    const rgVar = cutoffs.redGreenVariancePx2;
    const byVar = cutoffs.blueYellowVariancePx2;
    const slight = prep.slightlyBlurred;
    // Below the reduction's own blur: mixtures of the colour unblurred, over a 1 px² window (bound to
    // luminance) and the coarse result (4^level − 1 px²), each pair mixed to the variance asked for.
    const nearGaze = (v: number, coarse: number, original: number, blurred1?: number): number => {
      if (v <= 0) return original;
      if (v >= intrinsic) return coarse;
      if (blurred1 === undefined) return (v / intrinsic) * coarse + (1 - v / intrinsic) * original;
      if (v <= 1) return v * blurred1 + (1 - v) * original;
      const t = (v - 1) / (intrinsic - 1);
      return t * coarse + (1 - t) * blurred1;
    };
    for (let i = 0; i < n; i++) {
      const a = lum[i];
      const vx = aRg[i] * a + bRg[i];
      const vy = aBy[i] * a + bBy[i];
      const rx = vx;
      const ry = aRef[i] * a + bRef[i];
      let x = vx;
      let y = vy;
      const rr = Math.sqrt(rx * rx + ry * ry);
      const vv = Math.sqrt(vx * vx + vy * vy);
      if (rr > 0 && vv > 0) {
        const confidence = Math.min(1, rr / (0.5 * vv));
        const along = Math.max(0, (vx * rx + vy * ry) / rr);
        x = (confidence * along * rx) / rr + (1 - confidence) * vx;
        y = (confidence * along * ry) / rr + (1 - confidence) * vy;
      }
      chromaRg[i] = x;
      chromaBy[i] = y;
    }
    // No colour stronger than the frame has nearby, at the scale of the wider of the two blurs (the
    // held hue lends the narrower channel the wider one's reach; a narrower clamp would undo it).
    const widest = scratch(prep, 'widest', n);
    for (let i = 0; i < n; i++) widest[i] = Math.max(rgVar[i], byVar[i], intrinsic);
    const scale = log2CutoffOfVariance(widest, widest);
    clampToLocalRanges([chromaRg, chromaBy], prep.colourRanges, scale, c.level, width);
    // Near the gaze, after the clamp (whose ranges are the coarse signal's): the full-size colour.
    for (let i = 0; i < n; i++) {
      if (rgVar[i] < intrinsic || byVar[i] < intrinsic) {
        chromaRg[i] = nearGaze(rgVar[i], chromaRg[i], M[1][0] * r[i] + M[1][1] * g[i] + M[1][2] * b[i], slight?.[0][i]);
        chromaBy[i] = nearGaze(byVar[i], chromaBy[i], M[2][0] * r[i] + M[2][1] * g[i] + M[2][2] * b[i], slight?.[1][i]);
      }
    }
    transformPlanes(OPPONENT_TO_LINEAR_SRGB, [lum, chromaRg, chromaBy], percept.planes);
    // A colour the display cannot show (a channel below zero, where blurred colour meets a dark
    // edge) is desaturated toward the grey of its luminance until it can: luminance and hue are kept.
    const [pr, pg, pb] = percept.planes;
    for (let i = 0; i < n; i++) {
      const lo = Math.min(pr[i], pg[i], pb[i]);
      if (lo >= 0) continue;
      const a = lum[i] > 0 ? lum[i] : 0;
      const t = a / (a - lo);
      pr[i] = a + t * (pr[i] - a);
      pg[i] = a + t * (pg[i] - a);
      pb[i] = a + t * (pb[i] - a);
    }
    if (coneShare < 1) for (const p of percept.planes) for (let i = 0; i < n; i++) p[i] *= coneShare;
  }

  if (coneShare < 1 && prep.rods && cutoffs.rodVariancePx2) {
    const rd = prep.rods;
    const seenByRods = scratch(prep, 'rods', rd.width * rd.height);
    const weights = ladderWeights(rd.ladders[0], gaussianLadderCoefficients(varianceMaps(cutoffs.rodVariancePx2, rd, width, height), rd.ladders[0].levels), rd.workspace);
    evaluateLadders([rd.ladders[0]], weights, [seenByRods], [rd.sums[0]], rd.workspace);
    const full = expandTimes(seenByRods, rd, prep, scratch(prep, 'rods-full', n));
    const rodShare = 1 - coneShare;
    for (const p of percept.planes) for (let i = 0; i < n; i++) p[i] += rodShare * full[i];
  }

  if (input.seen) {
    for (const p of percept.planes) fillFromSurround({ width, height, data: p.slice() }, input.seen, p);
  }
  return percept;
}
