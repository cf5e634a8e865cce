/**
 * From the retinal image to the percept, in two steps. `prepareRetina` does what depends only on the
 * image: opponent channels and their ladders (src/image/ladder-pyramid.ts). `renderPercept` does what
 * depends on the gaze: per-pixel low-passes at the local cutoffs, evaluated from the ladders.
 *
 * - Luminance (the achromatic channel, L + M): the retina's sharp sampling limit (sharp-lowpass.ts),
 *   with the eye's off-axis optical blur folded in, kept from ringing (ringing-clamp.ts).
 * - Colour (red–green, blue–yellow) is blurred at each channel's cutoff (a Gaussian-like low-pass,
 *   colour-loss.ts) and bound to the percept's luminance (bindToLuminance, after the guided filter of
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
import { expand7, reduce7, reducedSize } from '../image/binomial.js';
import { buildLadder, createLadderSums, createLadderWorkspace, evaluateLadders, mapPyramid, type LadderCoefficients, type LadderPyramid, type LadderWorkspace } from '../image/ladder-pyramid.js';
import { createLinearRgb, type LinearRgb } from '../image/plane.js';
import { fillFromSurround } from './blind-spot.js';
import { buildRangePyramids, clampToLocalRange, type RangePyramids } from './ringing-clamp.js';
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
  /** Achromatic plane (L + M = luminance) of the retinal image and its ladder. */
  achromatic: Float32Array;
  achromaticLadder: LadderPyramid;
  achromaticSums: Float32Array[];
  /** Local extremes of the achromatic plane, against ringing, and of the colour planes, against excess. */
  achromaticRange: RangePyramids;
  colourRanges: [RangePyramids, RangePyramids];
  workspace: LadderWorkspace;
  /** Achromatic, red–green, blue–yellow planes and their products (COLOUR_PLANE) at the colour resolution. */
  colour: CoarseSignal;
  /** Red–green and blue–yellow planes at full size. */
  opponentColour: [Float32Array, Float32Array];
  /** Scotopic signal (white = 1) at the rod resolution, when rods take part. */
  rods?: CoarseSignal;
  /** Full-size scratch planes. */
  scratch: Float32Array[];
}

export interface PrepareRetinaOptions {
  /** Times the colour channels are halved in size (their cutoffs are far below the frame's). */
  colourLevel: number;
  /** Times the rod signal is halved, or undefined when rods play no part (photopic light). */
  rodLevel?: number;
}

function reduceTimes(plane: Float32Array, width: number, height: number, times: number, rows: Float32Array): { plane: Float32Array; width: number; height: number } {
  let cur = plane;
  let [w, h] = [width, height];
  for (let k = 0; k < times; k++) {
    const [nw, nh] = reducedSize(w, h);
    const next = new Float32Array(nw * nh);
    reduce7(cur, w, h, next, rows);
    [cur, w, h] = [next, nw, nh];
  }
  return { plane: times === 0 ? Float32Array.from(plane) : cur, width: w, height: h };
}

function coarseSignal(planes: Float32Array[], width: number, height: number, level: number, rows: Float32Array): CoarseSignal {
  const reduced = planes.map((p) => reduceTimes(p, width, height, level, rows));
  const { width: w, height: h } = reduced[0];
  const workspace = createLadderWorkspace(w, h);
  const ladders = reduced.map((r) => buildLadder(r.plane, w, h, workspace));
  return { level, width: w, height: h, planes: reduced.map((r) => r.plane), ladders, sums: ladders.map(createLadderSums), workspace };
}

/** The gaze-independent part: opponent planes and their ladders. */
export function prepareRetina(retinal: LinearRgb, options: PrepareRetinaOptions): PreparedRetina {
  const { width, height } = retinal;
  const n = width * height;
  const opponent = [new Float32Array(n), new Float32Array(n), new Float32Array(n)];
  transformPlanes(LINEAR_SRGB_TO_OPPONENT, retinal.planes, opponent);
  const workspace = createLadderWorkspace(width, height);
  const achromaticLadder = buildLadder(opponent[0], width, height, workspace);
  // The colour signal: A, RG, BY and the products A·RG, A·BY, A² for window statistics (COLOUR_PLANE).
  const products = [new Float32Array(n), new Float32Array(n), new Float32Array(n)];
  for (let i = 0; i < n; i++) {
    const lum = opponent[0][i];
    products[0][i] = lum * opponent[1][i];
    products[1][i] = lum * opponent[2][i];
    products[2][i] = lum * lum;
  }
  const colour = coarseSignal([...opponent, ...products], width, height, options.colourLevel, workspace.rows);
  let rods: CoarseSignal | undefined;
  if (options.rodLevel !== undefined) {
    const [r, g, b] = retinal.planes;
    const scotopic = new Float32Array(n);
    // Rods see scotopic luminance; dividing by white's ratio keeps white as bright as for cones.
    for (let i = 0; i < n; i++) scotopic[i] = scotopicOfLinearSrgb(r[i], g[i], b[i]) / SCOTOPIC_PER_PHOTOPIC_WHITE;
    rods = coarseSignal([scotopic], width, height, options.rodLevel, workspace.rows);
  }
  return {
    width, height, achromatic: opponent[0], achromaticLadder, achromaticSums: createLadderSums(achromaticLadder),
    achromaticRange: buildRangePyramids(opponent[0], width, height, achromaticLadder.levels),
    colourRanges: [buildRangePyramids(Float32Array.from(opponent[1]), width, height, achromaticLadder.levels), buildRangePyramids(Float32Array.from(opponent[2]), width, height, achromaticLadder.levels)],
    opponentColour: [Float32Array.from(opponent[1]), Float32Array.from(opponent[2])],
    workspace,
    colour, rods, scratch: [new Float32Array(n), new Float32Array(n), opponent[1], opponent[2]],
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

/** A full-size variance map (frame px²) carried to every level of a coarse signal's ladder (its own px²). */
function varianceMaps(variancePx2: Float32Array, signal: CoarseSignal, fullWidth: number, fullHeight: number): Float32Array[] {
  const full = mapPyramid(variancePx2, { levels: signal.level + 1, sizes: sizesFrom(fullWidth, fullHeight, signal.level + 1) });
  const scale = 4 ** signal.level;
  const atSignal = full[signal.level].map((v) => v / scale);
  return mapPyramid(atSignal, signal.ladders[0]);
}

function sizesFrom(width: number, height: number, levels: number): [number, number][] {
  const sizes: [number, number][] = [[width, height]];
  for (let k = 1; k < levels; k++) sizes.push(reducedSize(...sizes[k - 1]));
  return sizes;
}

/** Expands a coarse plane back to full size. */
function expandTimes(plane: Float32Array, signal: CoarseSignal, prep: PreparedRetina, out: Float32Array): Float32Array {
  const sizes = sizesFrom(prep.width, prep.height, signal.level + 1);
  let cur = plane;
  for (let k = signal.level - 1; k >= 0; k--) {
    const next = k === 0 ? out : new Float32Array(sizes[k][0] * sizes[k][1]);
    expand7(cur, sizes[k + 1][0], sizes[k + 1][1], next, sizes[k][0], sizes[k][1], prep.workspace.rows);
    cur = next;
  }
  if (signal.level === 0) out.set(plane);
  return out;
}

/**
 * Holds a colour to the hue of a reference mixture: v is projected on the reference's direction
 * (never past it to the opposite hue); where the reference is weak beside v (a pattern only the
 * sharper channel keeps) v stands.
 */
export function holdHue(vx: number, vy: number, rx: number, ry: number): [number, number] {
  const r = Math.hypot(rx, ry);
  const v = Math.hypot(vx, vy);
  if (v === 0 || r === 0) return [vx, vy];
  const confidence = Math.min(1, r / (0.5 * v));
  const along = Math.max(0, (vx * rx + vy * ry) / r);
  return [confidence * (along * rx) / r + (1 - confidence) * vx, confidence * (along * ry) / r + (1 - confidence) * vy];
}

/** log2 of the cutoff (cycles/px) at which a Gaussian of the given variance keeps 5 %, into `out`. */
function log2CutoffOfVariance(variancePx2: Float32Array, out: Float32Array): Float32Array {
  const k = Math.log(20) / (2 * Math.PI * Math.PI);
  for (let i = 0; i < out.length; i++) out[i] = variancePx2[i] > 0 ? 0.5 * Math.log2(k / variancePx2[i]) : 10;
  return out;
}

/** Evaluates several ladders of a coarse signal with one set of coefficients. */
function blurMany(signal: CoarseSignal, ladders: LadderPyramid[], sums: Float32Array[][], coefficients: LadderCoefficients): Float32Array[] {
  const m = signal.width * signal.height;
  const outs = ladders.map(() => new Float32Array(m));
  evaluateLadders(ladders, coefficients, outs, sums, signal.workspace);
  return outs;
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
    const eps = (0.03 * mA[i]) ** 2 + 4e-6;
    const varA = Math.max(0, mAA[i] - mA[i] * mA[i]) + eps;
    const slope = (mAC[i] - mA[i] * mC[i]) / varA;
    const s = Math.min(1, Math.sqrt((resolvedVariance[i] + eps) / varA));
    const chromaticity = mA[i] > CHROMA_FLOOR ? mC[i] / mA[i] : 0;
    a[i] = s * slope + (1 - s) * chromaticity;
    b[i] = s * (mC[i] - slope * mA[i]);
  }
}

/** Indices of the colour signal's planes. */
const COLOUR_PLANE = { a: 0, rg: 1, by: 2, aRg: 3, aBy: 4, aa: 5 } as const;

/**
 * Window statistics of the colour signal under a Gaussian-like blur of the given variance maps (at
 * every ladder level): the prepared ladders of A, C, A·C and A² (C, A·C by index), and the resolved
 * variance var(A_b) = mean(A_b²) − mean(A_b)², from a ladder of A_b² built for this blur and A under
 * twice the variance (the window mean of A_b).
 */
function windowStats(signal: CoarseSignal, varianceMaps: Float32Array[], planes: { c: number; ac: number }): WindowStats {
  const { ladders, sums, width, height } = signal;
  const levels = ladders[0].levels;
  const coefficients = gaussianLadderCoefficients(varianceMaps, levels);
  const pick = [COLOUR_PLANE.a, planes.c, planes.ac, COLOUR_PLANE.aa];
  const [a, c, ac, aa] = blurMany(signal, pick.map((k) => ladders[k]), pick.map((k) => sums[k]), coefficients);
  const square = new Float32Array(a.length);
  for (let i = 0; i < a.length; i++) square[i] = a[i] * a[i];
  const squareLadder = buildLadder(square, width, height, signal.workspace);
  const [meanOfSquare] = blurMany(signal, [squareLadder], [createLadderSums(squareLadder)], coefficients);
  const doubled = gaussianLadderCoefficients(varianceMaps.map((m) => m.map((v) => 2 * v)), levels);
  const [meanTwice] = blurMany(signal, [ladders[COLOUR_PLANE.a]], [sums[COLOUR_PLANE.a]], doubled);
  const resolvedVariance = meanOfSquare;
  for (let i = 0; i < a.length; i++) resolvedVariance[i] = Math.max(0, meanOfSquare[i] - meanTwice[i] * meanTwice[i]);
  return { a, c, ac, aa, resolvedVariance };
}

/** The gaze-dependent step: the percept for one set of cutoff maps. */
export function renderPercept(prep: PreparedRetina, input: PerceptInput): LinearRgb {
  const { width, height } = prep;
  const n = width * height;
  const { cutoffs, coneShare } = input;
  const percept = createLinearRgb(width, height);

  if (coneShare > 0) {
    // Luminance: the sharp sampling limit with the off-axis optics folded in.
    const a = prep.achromaticLadder;
    const lcMaps = mapPyramid(cutoffs.achromaticLog2, a);
    const extra = cutoffs.offAxisVariancePx2 ? mapPyramid(cutoffs.offAxisVariancePx2, a) : undefined;
    const lum = prep.scratch[0];
    evaluateLadders([a], sharpLowpassCoefficients(lcMaps, a.levels, extra), [lum], [prep.achromaticSums], prep.workspace);
    clampToLocalRange(lum, prep.achromaticRange, cutoffs.achromaticLog2);
    // Coarse levels see cutoffs averaged over their blocks, which near the fovea mixes in a little
    // of the periphery's blur: where the cutoff lies above the frame's limit, the frame is kept exactly.
    const identityFrom = Math.log2(IDENTITY_FROM_CYCLES_PER_PX);
    for (let i = 0; i < n; i++) {
      if (cutoffs.achromaticLog2[i] >= identityFrom && !(cutoffs.offAxisVariancePx2 && cutoffs.offAxisVariancePx2[i] > 0.01)) lum[i] = prep.achromatic[i];
    }

    // Colour at its own resolution: window statistics of the retinal image under each channel's
    // blur, bound to the percept's luminance (bindToLuminance).
    const c = prep.colour;
    const underRg = windowStats(c, varianceMaps(cutoffs.redGreenVariancePx2, c, width, height), { c: COLOUR_PLANE.rg, ac: COLOUR_PLANE.aRg });
    const underBy = windowStats(c, varianceMaps(cutoffs.blueYellowVariancePx2, c, width, height), { c: COLOUR_PLANE.by, ac: COLOUR_PLANE.aBy });
    // The hue reference: blue–yellow under the red–green blur, so both channels blurred alike.
    const byUnderRg = blurMany(c, [c.ladders[COLOUR_PLANE.by], c.ladders[COLOUR_PLANE.aBy]], [c.sums[COLOUR_PLANE.by], c.sums[COLOUR_PLANE.aBy]],
      gaussianLadderCoefficients(varianceMaps(cutoffs.redGreenVariancePx2, c, width, height), c.ladders[0].levels));
    const reference: WindowStats = { ...underRg, c: byUnderRg[0], ac: byUnderRg[1] };
    const m = c.width * c.height;
    const coefficients = [0, 1, 2, 3, 4, 5].map(() => new Float32Array(m));
    bindToLuminance(underRg, coefficients[0], coefficients[1]);
    bindToLuminance(underBy, coefficients[2], coefficients[3]);
    bindToLuminance(reference, coefficients[4], coefficients[5]);
    const [aRg, bRg, aBy, bBy, aRef, bRef] = coefficients.map((plane, k) => expandTimes(plane, c, prep, k < 2 ? prep.scratch[2 + k] : new Float32Array(n)));
    // The colour rebuilt on the percept's luminance, written over the first two coefficient planes.
    const chromaRg = aRg;
    const chromaBy = bRg;
    for (let i = 0; i < n; i++) {
      const a = lum[i];
      const rg = aRg[i] * a + bRg[i];
      const [x, y] = holdHue(rg, aBy[i] * a + bBy[i], rg, aRef[i] * a + bRef[i]);
      chromaRg[i] = x;
      chromaBy[i] = y;
    }
    // Where a channel loses nothing, its colour is the frame's own, exactly (see the luminance above).
    for (let i = 0; i < n; i++) {
      if (cutoffs.redGreenVariancePx2[i] <= 0 && cutoffs.blueYellowVariancePx2[i] <= 0) {
        chromaRg[i] = prep.opponentColour[0][i];
        chromaBy[i] = prep.opponentColour[1][i];
      }
    }
    // No colour stronger than the frame has nearby, at the scale of the wider of the two blurs (the
    // held hue lends the narrower channel the wider one's reach; a narrower clamp would undo it).
    const widest = prep.scratch[1];
    for (let i = 0; i < n; i++) widest[i] = Math.max(cutoffs.redGreenVariancePx2[i], cutoffs.blueYellowVariancePx2[i]);
    const scale = log2CutoffOfVariance(widest, widest);
    clampToLocalRange(chromaRg, prep.colourRanges[0], scale);
    clampToLocalRange(chromaBy, prep.colourRanges[1], scale);
    transformPlanes(OPPONENT_TO_LINEAR_SRGB, [lum, chromaRg, chromaBy], percept.planes);
    if (coneShare < 1) for (const p of percept.planes) for (let i = 0; i < n; i++) p[i] *= coneShare;
  }

  if (coneShare < 1 && prep.rods && cutoffs.rodVariancePx2) {
    const r = prep.rods;
    const seenByRods = new Float32Array(r.width * r.height);
    evaluateLadders([r.ladders[0]], gaussianLadderCoefficients(varianceMaps(cutoffs.rodVariancePx2, r, width, height), r.ladders[0].levels), [seenByRods], [r.sums[0]], r.workspace);
    const full = expandTimes(seenByRods, r, prep, prep.scratch[1]);
    const rodShare = 1 - coneShare;
    for (const p of percept.planes) for (let i = 0; i < n; i++) p[i] += rodShare * full[i];
  }

  if (input.seen) {
    for (const p of percept.planes) fillFromSurround({ width, height, data: p.slice() }, input.seen, p);
  }
  return percept;
}
