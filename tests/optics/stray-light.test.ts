import { describe, expect, test } from 'vitest';
import { validateSetup } from '../../src/config/validate.js';
import { createLinearRgb } from '../../src/image/plane.js';
import { cieGlarePsfPerSr, glareKernel, scatteredFraction } from '../../src/optics/stray-light.js';
import { runProof } from '../../src/pipeline.js';

describe('CIE general disability glare equation (CIE 146/147:2002, CIE 180:2010)', () => {
  test.each([
    [1, 25, 0.5, 15.18053],
    [10, 25, 0.5, 0.06766],
    [10, 70, 0.5, 0.15279],
  ])('θ = %f°, age %i, p = %f → %f sr⁻¹ (derived check values)', (theta, age, p, expected) => {
    expect(cieGlarePsfPerSr(theta, age, p)).toBeCloseTo(expected, 4);
  });

  test('Stiles–Holladay age factor 1 + (A/70)⁴ = 2.0 at 70 is close to the CIE term at 70 (common practice cross-check)', () => {
    expect(1 + (70 / 70) ** 4).toBe(2);
    expect(1 + (70 / 62.5) ** 4).toBeGreaterThan(2);
  });

  test('the glare kernel holds exactly the scattered fraction that the radial integral gives (energy conservation)', () => {
    const { kernel, scatteredFraction: onGrid } = glareKernel(0.1, 150, 40, 0.5, 1);
    expect(kernel.reduce((a, b) => a + b, 0)).toBeCloseTo(onGrid, 10);
    // The square grid reaches 15° along the axes; compare with the integral to 15°.
    expect(onGrid / scatteredFraction(1, 15, 40, 0.5)).toBeCloseTo(1, 1);
  });
});

describe('stray light in the percept', () => {
  const distanceMm = 0.5 / Math.tan((0.05 * Math.PI) / 180);
  const W = 800;
  const H = 400;
  const setup = (ageYears: number) => validateSetup({
    display: { kind: 'screen', widthMm: W * 0.5, heightMm: H * 0.5, resolutionPx: [W, H], viewingDistanceMm: distanceMm, peakLuminanceCdM2: 200, blackLuminanceCdM2: 0 },
    viewer: { ageYears }, gaze: { xPx: 600, yPx: 200 }, light: { adaptingLuminanceCdM2: 50 },
  }, 'test');

  test('a bright banner veils the dark area beside it, more for a 70-year-old than for a 25-year-old (CIE glare, age term)', () => {
    const frame = createLinearRgb(W, H);
    for (let y = 0; y < H; y++) for (let x = 0; x < 300; x++) for (const p of frame.planes) p[y * W + x] = 1;
    const veilAt = (age: number): number => runProof(frame, setup(age), 'test').retinalImage.planes[1][200 * W + 500];
    const young = veilAt(25);
    const old = veilAt(70);
    expect(young).toBeGreaterThan(0.002);
    expect(old).toBeGreaterThan(1.5 * young);
  });
});
