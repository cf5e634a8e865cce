/**
 * The retina's spatially varying low-pass: its shape on gratings (kernel level), the Gaussian-like
 * variant against an explicit Gaussian (fast path vs slow reference), and end to end through the
 * pipeline: nothing lost at the gaze below the pixel limit, and the kept contrast at half and at the
 * local cutoff away from the gaze, on two meridians (cutoffs from Watson 2014, off-axis optics from
 * Navarro, Artal & Williams 1993).
 */
import { describe, expect, test } from 'vitest';
import { buildLadder, createLadderSums, createLadderWorkspace, evaluateLadder, mapPyramid } from '../../src/image/ladder-pyramid.js';
import { gaussianLadderCoefficients, gaussianVarianceForCutoff, sharpLowpassCoefficients } from '../../src/retina/sharp-lowpass.js';
import { rgcNyquistCpd } from '../../src/retina/watson-rgc.js';
import { offAxisRatio } from '../../src/optics/off-axis.js';
import { boxAround, modulationAt, paintGrating, proofThroughFiles, screenSetup, uniformFrame } from '../helpers/synthetic.js';

const N = 384;
const ws = createLadderWorkspace(N, N);

/** Response of a ladder filter with uniform coefficients to a grating, by projection. */
function response(cyclesPerPx: number, angleDeg: number, coefficientsFor: (ladder: ReturnType<typeof buildLadder>) => Parameters<typeof evaluateLadder>[1]): number {
  const a = (angleDeg * Math.PI) / 180;
  const src = new Float32Array(N * N);
  for (let y = 0; y < N; y++) for (let x = 0; x < N; x++) src[y * N + x] = 0.5 + 0.4 * Math.sin(2 * Math.PI * cyclesPerPx * (x * Math.cos(a) + y * Math.sin(a)));
  const ladder = buildLadder(src, N, N, ws);
  const out = evaluateLadder(ladder, coefficientsFor(ladder), new Float32Array(N * N), createLadderSums(ladder), ws);
  let s = 0;
  let c = 0;
  let n = 0;
  for (let y = 96; y < 288; y++) for (let x = 96; x < 288; x++) {
    const ph = 2 * Math.PI * cyclesPerPx * (x * Math.cos(a) + y * Math.sin(a));
    s += (out[y * N + x] - 0.5) * Math.sin(ph);
    c += (out[y * N + x] - 0.5) * Math.cos(ph);
    n++;
  }
  return (2 * Math.hypot(s, c)) / n / 0.4;
}

const sharp = (cutoff: number) => (ladder: ReturnType<typeof buildLadder>) => sharpLowpassCoefficients(mapPyramid(new Float32Array(N * N).fill(Math.log2(cutoff)), ladder), ladder.levels);
const gentle = (cutoff: number) => (ladder: ReturnType<typeof buildLadder>) => gaussianLadderCoefficients(mapPyramid(new Float32Array(N * N).fill(gaussianVarianceForCutoff(cutoff)), ladder), ladder.levels);

describe('sharp sampling low-pass (our design: 5 % at the cutoff, about 0.8 at half of it)', () => {
  test.each([0.02, 0.05, 0.1, 0.2, 0.3])('cutoff %f cycles/px: ≥ 0.76 at half the cutoff, ≤ 0.13 at it, ≥ 0.9 at a quarter; alike for oblique gratings', (cutoff) => {
    expect(response(cutoff / 2, 0, sharp(cutoff))).toBeGreaterThan(0.76);
    expect(response(cutoff, 0, sharp(cutoff))).toBeLessThan(0.13);
    expect(response(cutoff / 4, 0, sharp(cutoff))).toBeGreaterThan(0.9);
    expect(response(cutoff / 2, 45, sharp(cutoff))).toBeGreaterThan(0.76);
  });

  test('above the frame’s own limit (cutoff ≥ 0.6 cycles/px) nothing at all is removed', () => {
    const src = Float32Array.from({ length: N * N }, (_, i) => ((i * 2654435761) % 1000) / 1000);
    const ladder = buildLadder(src, N, N, ws);
    const out = evaluateLadder(ladder, sharp(0.65)(ladder), new Float32Array(N * N), createLadderSums(ladder), ws);
    let worst = 0;
    for (let i = 0; i < src.length; i++) worst = Math.max(worst, Math.abs(out[i] - src[i]));
    expect(worst).toBeLessThan(1e-5);
  });
});

describe('Gaussian-like ladder blur (fast path) against an explicit Gaussian (slow reference)', () => {
  test.each([[2, 0.12], [4, 0.04], [9, 0.04]])('σ = %f px: within %f RMS of direct convolution with a sampled Gaussian (a mixture of two ladder elements)', (sigma, tolerance) => {
    const M = 160;
    const src = Float32Array.from({ length: M * M }, (_, i) => (((i % M) * 7 + Math.floor(i / M) * 13) % 37) / 37);
    const wsSmall = createLadderWorkspace(M, M);
    const ladder = buildLadder(src, M, M, wsSmall);
    const out = evaluateLadder(ladder, gaussianLadderCoefficients(mapPyramid(new Float32Array(M * M).fill(sigma * sigma), ladder), ladder.levels), new Float32Array(M * M), createLadderSums(ladder), wsSmall);
    const r = Math.ceil(4 * sigma);
    const k = Array.from({ length: 2 * r + 1 }, (_, i) => Math.exp(-((i - r) ** 2) / (2 * sigma * sigma)));
    const ks = k.reduce((a, b) => a + b, 0);
    const mirror = (i: number): number => (i < 0 ? -i - 1 : i >= M ? 2 * M - i - 1 : i);
    let err = 0;
    let ref2 = 0;
    for (let y = 2 * r; y < M - 2 * r; y++) for (let x = 2 * r; x < M - 2 * r; x++) {
      let v = 0;
      for (let dy = -r; dy <= r; dy++) for (let dx = -r; dx <= r; dx++) v += k[dy + r] * k[dx + r] * src[mirror(y + dy) * M + mirror(x + dx)];
      v /= ks * ks;
      err += (out[y * M + x] - v) ** 2;
      ref2 += (v - 0.5) ** 2;
    }
    expect(Math.sqrt(err / ref2)).toBeLessThan(tolerance);
  });
});

describe('end to end: the retina stage in percept.png', () => {
  test('no loss at the gaze below the pixel limit: a viewer who is the reference viewer sees the frame itself there (Watson 2014: 65 cpd at the fovea > 26 cpd on this screen)', async () => {
    const W = 320;
    const H = 200;
    const frame = uniformFrame(W, H, [0.5, 0.5, 0.5]);
    paintGrating(frame, [0, 0, W, H], 0.45, 'vertical', 0.5, 0.45);
    const { frame: written, percept } = await proofThroughFiles(frame, screenSetup(W, H, 52, { viewer: { preset: 'age-25' }, percept: { mode: 'same-display', referenceViewer: 'age-25' }, light: { surroundLuminanceCdM2: 100 } }));
    let worst = 0;
    for (let y = H / 2 - 10; y < H / 2 + 10; y++) for (let x = W / 2 - 10; x < W / 2 + 10; x++) worst = Math.max(worst, Math.abs(percept.planes[1][y * W + x] - written.planes[1][y * W + x]));
    expect(worst).toBeLessThan(1e-6);
  });

  // A grating at f on a screen of about four pixels per cycle of the local cutoff, at e° on a meridian.
  test.each([
    [5, 'horizontal'], [10, 'horizontal'], [20, 'horizontal'], [5, 'vertical'], [10, 'vertical'], [20, 'vertical'],
  ] as const)('%i° on the %s meridian: ≈ 0.8 × the off-axis optics at half the cutoff, ≤ 0.15 at it (Watson 2014; Navarro et al. 1993)', async (ecc, meridian) => {
    const meridianDeg = meridian === 'horizontal' ? 0 : 90;
    const cutoffCpd = rgcNyquistCpd(ecc, meridianDeg, 'both');
    const ppd = Math.round(4 * cutoffCpd);
    const distanceMm = 0.5 / Math.tan(((1 / ppd) * Math.PI) / 180);
    const offsetPx = Math.round((distanceMm * Math.tan((ecc * Math.PI) / 180)) / 0.5);
    const side = 2 * (offsetPx + Math.round(1.2 * ppd)) + 8;
    const rows: string[] = [];
    for (const [fraction, check] of [[0.5, (k: number) => k > 0.8 * offAxisRatio(ecc, cutoffCpd / 2) - 0.12 && k < 0.8 * offAxisRatio(ecc, cutoffCpd / 2) + 0.12], [1, (k: number) => k < 0.15]] as const) {
      // Local px/° along the radial direction at e: ppd / cos²e.
      const localPpd = ppd / Math.cos((ecc * Math.PI) / 180) ** 2;
      const cyclesPerPx = (fraction * cutoffCpd) / localPpd;
      const orientation = meridian === 'horizontal' ? 'vertical' : 'horizontal';
      const frame = uniformFrame(side, side, [0.5, 0.5, 0.5]);
      const [cx, cy] = meridian === 'horizontal' ? [side / 2 + offsetPx, side / 2] : [side / 2, side / 2 - offsetPx];
      // Over the whole frame: a small patch would spread its spectrum across the filter's edge.
      paintGrating(frame, [0, 0, side, side], cyclesPerPx, orientation, 0.5, 0.4);
      const { frame: written, percept } = await proofThroughFiles(frame, screenSetup(side, side, ppd, {
        viewer: { preset: 'age-25' }, percept: { mode: 'same-display', referenceViewer: 'age-25' }, light: { surroundLuminanceCdM2: 100 },
      }));
      // 1.5° along the grating: long enough to tell the grating from the pyramid's folded-back copy beside it.
      const box = boxAround(cx, cy, cyclesPerPx, Math.round(0.75 * ppd), orientation);
      const kept = modulationAt(percept, box, cyclesPerPx, orientation) / modulationAt(written, box, cyclesPerPx, orientation);
      rows.push(`${fraction} × cutoff (${cutoffCpd.toFixed(2)} cpd): kept ${kept.toFixed(3)}, off-axis optics ${offAxisRatio(ecc, fraction * cutoffCpd).toFixed(3)}`);
      expect(check(kept), rows.join('\n')).toBe(true);
    }
  });
});
