/**
 * Benchmarks with ratios against a baseline measured in the same run, so numbers compare across
 * machines: the baseline is one REDUCE + EXPAND pyramid step over a 1920×1080 plane (a fixed amount of
 * memory-bound work). Run `npm run bench`; each case reports the median of several runs.
 */
import { validateSetup } from '../src/config/validate.js';
import { createLinearRgb, type Plane } from '../src/image/plane.js';
import { applyOtf, createOtfGrid } from '../src/optics/apply-otf.js';
import { runProof } from '../src/pipeline.js';
import { expand, reduce } from '../src/retina/pyramid.js';
import { buildLadder, createLadderSums, createLadderWorkspace, evaluateLadder, mapPyramid } from '../src/image/ladder-pyramid.js';
import { sharpLowpassCoefficients } from '../src/retina/sharp-lowpass.js';

const W = 1920;
const H = 1080;
const runs = Number(process.env.BENCH_RUNS ?? 5);

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function time(fn: () => void): number {
  fn();
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    samples.push(performance.now() - t0);
  }
  return median(samples);
}

const plane: Plane = { width: W, height: H, data: Float32Array.from({ length: W * H }, (_, i) => ((i * 2654435761) % 1000) / 1000) };
const baselineMs = time(() => {
  const r = reduce(plane);
  expand(r, W, H);
});

const rows: [string, number][] = [];
const add = (name: string, fn: () => void): void => {
  rows.push([name, time(fn)]);
};

// Spatially varying low-pass from a half-octave ladder: building it depends only on the plane; the
// evaluation's cost must not grow with the blur, so small and large cutoffs cost alike.
const workspace = createLadderWorkspace(W, H);
add('ladder build, one plane', () => buildLadder(plane.data, W, H, workspace));
const ladder = buildLadder(plane.data, W, H, workspace);
const sums = createLadderSums(ladder);
for (const finestPeriodPx of [4, 32, 256]) {
  // log2 cutoff (cycles/px) falling across the frame from 1/4 to 1/finestPeriodPx.
  const log2Cutoff = Float32Array.from({ length: W * H }, (_, i) => -2 - Math.log2(finestPeriodPx / 4) * ((i % W) / W));
  const coefficients = sharpLowpassCoefficients(mapPyramid(log2Cutoff, ladder), ladder.levels);
  const out = new Float32Array(W * H);
  add(`sharp low-pass from the ladder, one plane, periods down to 1/${finestPeriodPx} px⁻¹`, () => evaluateLadder(ladder, coefficients, out, sums, workspace));
}

// Optics: tiled overlap-save FFT against one whole-frame transform padded to a power of two.
const transfer = (f: number): number => Math.exp(-((f / 10) ** 2));
const outs = [new Float32Array(W * H), new Float32Array(W * H)];
const tiled = createOtfGrid(W, H, transfer, { pxPerDegX: 50, pxPerDegY: 50, marginPx: 32 });
add(`optics FFT, two planes, tiles of ${tiled.fftWidth}×${tiled.fftHeight}`, () => applyOtf([plane, plane], outs, tiled));
const whole = createOtfGrid(W, H, transfer, { pxPerDegX: 50, pxPerDegY: 50, marginPx: 32, tilePx: 2048 });
add('optics FFT, two planes, one 2048×2048 transform', () => applyOtf([plane, plane], outs, whole));

// The whole proof of a 1920×1080 frame on the laptop preset scaled to 16:9.
const setup = validateSetup({ display: { preset: 'laptop-14in', resolutionPx: [1920, 1080] } }, 'bench');
const frame = createLinearRgb(W, H);
for (const p of frame.planes) p.set(plane.data);
add('whole proof 1920×1080 (no encoding)', () => runProof(frame, setup, 'bench'));

const lines = [
  `baseline: one REDUCE + EXPAND step over ${W}×${H} = ${baselineMs.toFixed(1)} ms (median of ${runs})`,
  '',
  '| case | ms | × baseline |',
  '|---|---:|---:|',
  ...rows.map(([name, ms]) => `| ${name} | ${ms.toFixed(0)} | ${(ms / baselineMs).toFixed(1)} |`),
];
process.stdout.write(`${lines.join('\n')}\n`);
