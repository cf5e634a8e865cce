import { describe, expect, test } from 'vitest';
import { LUMINANCE_WEIGHTS } from '../src/colour/srgb.js';
import { validateSetup } from '../src/config/validate.js';
import { neuralAcuityFactor } from '../src/retina/neural-ageing.js';
import { createLinearRgb, type LinearRgb } from '../src/image/plane.js';
import { computeNumbers, runProof } from '../src/pipeline.js';
import { geislerPerryCutoffCpd } from '../src/retina/geisler-perry.js';

// A test screen: 0.5 mm pixels at 1145.9 mm, so one pixel subtends 0.025° (40 px/°) straight ahead.
const distanceMm = 0.5 / Math.tan((0.025 * Math.PI) / 180);
const W = 1200;
const H = 400;
const setupWith = (acuity: 'rgc-sampling' | 'contrast-threshold' = 'rgc-sampling') => validateSetup({
  display: { kind: 'screen', widthMm: W * 0.5, heightMm: H * 0.5, resolutionPx: [W, H], viewingDistanceMm: distanceMm, peakLuminanceCdM2: 200, blackLuminanceCdM2: 0 },
  viewer: { preset: 'age-25', eyes: 'right' },
  gaze: { xPx: W / 2, yPx: H / 2 },
  models: { acuity },
}, 'test setup');

/** Column (pixel centre) at a given eccentricity right of the gaze, and the local radial px/°: 40/cos²θ. */
function columnAt(eccDeg: number): { x: number; pxPerDeg: number } {
  const theta = (eccDeg * Math.PI) / 180;
  return { x: Math.round(W / 2 + 0.5 + (distanceMm * Math.tan(theta)) / 0.5), pxPerDeg: 40 / Math.cos(theta) ** 2 };
}

function greyFrame(level: number): LinearRgb {
  const f = createLinearRgb(W, H);
  for (const p of f.planes) p.fill(level);
  return f;
}

/** Paints a vertical sinusoidal grating of `cpd` around column x (rows H/2 ± 60) over mid grey. */
function withGrating(frame: LinearRgb, x: number, widthPx: number, cyclesPerPx: number): LinearRgb {
  for (let y = H / 2 - 60; y < H / 2 + 60; y++) {
    for (let xx = x - widthPx / 2; xx < x + widthPx / 2; xx++) {
      const v = 0.5 + 0.45 * Math.sin(2 * Math.PI * cyclesPerPx * (xx - x));
      for (const p of frame.planes) p[y * W + xx] = v;
    }
  }
  return frame;
}

/** Michelson contrast of the row-averaged profile over columns x ± half, rows H/2 ± 20. */
function contrastAround(image: LinearRgb, x: number, half: number): number {
  let min = Infinity;
  let max = -Infinity;
  for (let xx = x - half; xx <= x + half; xx++) {
    let sum = 0;
    for (let y = H / 2 - 20; y < H / 2 + 20; y++) sum += image.planes[1][y * W + xx];
    const v = sum / 40;
    min = Math.min(min, v);
    max = Math.max(max, v);
  }
  return (max - min) / (max + min);
}

describe('end to end: what survives in the percept', () => {
  const nyquist10 = 7.974; // Watson (2014), temporal field at 10°, right eye looking right of fixation
  const { x, pxPerDeg } = columnAt(10);

  test('a grating 1.5× finer than the Nyquist frequency at 10° is flattened (Watson 2014 sampling limit: 7.974 cpd)', () => {
    const frame = withGrating(greyFrame(0.5), x, 160, (1.5 * nyquist10) / pxPerDeg);
    const before = contrastAround(frame, x, 20);
    const { percept } = runProof(frame, setupWith(), 'test');
    expect(before).toBeGreaterThan(0.85);
    expect(contrastAround(percept, x, 20)).toBeLessThan(0.05 * before);
  });

  test('a grating at a third of the Nyquist frequency at 10° keeps most of its contrast (Watson 2014)', () => {
    const frame = withGrating(greyFrame(0.5), x, 160, nyquist10 / 3 / pxPerDeg);
    const before = contrastAround(frame, x, 20);
    const { percept } = runProof(frame, setupWith(), 'test');
    expect(contrastAround(percept, x, 20) / before).toBeGreaterThan(0.55);
  });

  test('the contrast-threshold model flattens detail above its cutoff at 10° (Geisler & Perry 1998: 7.337 cpd)', () => {
    const cutoff = geislerPerryCutoffCpd(10);
    expect(cutoff).toBeCloseTo(7.337, 3);
    const frame = withGrating(greyFrame(0.5), x, 160, (1.5 * cutoff) / pxPerDeg);
    const { percept } = runProof(frame, setupWith('contrast-threshold'), 'test');
    expect(contrastAround(percept, x, 20)).toBeLessThan(0.05 * contrastAround(frame, x, 20));
  });

  test('a uniform grey frame stays uniform (conservation, common practice)', () => {
    const { percept } = runProof(greyFrame(0.3), setupWith(), 'test');
    for (const p of percept.planes) for (let i = 0; i < p.length; i += 97) expect(p[i]).toBeCloseTo(0.3, 4);
  });

  test('the percept keeps the mean luminance of the frame to 0.5 % (energy conservation of every kernel)', () => {
    const frame = greyFrame(0.1);
    // Bright panels and text-like bars all over the frame.
    for (let y = 0; y < H; y++) for (let xx = 0; xx < W; xx++) {
      const on = (Math.floor(xx / 37) + Math.floor(y / 23)) % 3 === 0 || (xx % 11 < 2 && y % 50 < 30);
      if (on) { frame.planes[0][y * W + xx] = 0.9; frame.planes[1][y * W + xx] = 0.7; frame.planes[2][y * W + xx] = 0.2; }
    }
    const { percept } = runProof(frame, setupWith(), 'test');
    const meanY = (img: LinearRgb): number => {
      let s = 0;
      for (let i = 0; i < W * H; i++) s += LUMINANCE_WEIGHTS[0] * img.planes[0][i] + LUMINANCE_WEIGHTS[1] * img.planes[1][i] + LUMINANCE_WEIGHTS[2] * img.planes[2][i];
      return s / (W * H);
    };
    expect(meanY(percept) / meanY(frame)).toBeCloseTo(1, 2);
    expect(Math.abs(meanY(percept) / meanY(frame) - 1)).toBeLessThan(0.005);
  });

  test('report figures: 40 px/° at the gaze, Watson 2014 cutoffs on the temporal meridian (derived) times the neural factor fitted for age 25', () => {
    const n = computeNumbers(setupWith());
    expect(n.display.pixelsPerDegreeAtGaze).toBeCloseTo(40, 2);
    const row10 = n.acuity.find((r) => r.eccentricityDeg === 10 && r.meridian === 'temporal')!;
    expect(row10.cutoffCpd).toBeCloseTo(7.974 * neuralAcuityFactor(25), 3);
    expect(Math.abs(neuralAcuityFactor(25) - 1)).toBeLessThan(0.03);
    expect(n.acuity.map((r) => r.eccentricityDeg)).toContain(0);
  });
});
