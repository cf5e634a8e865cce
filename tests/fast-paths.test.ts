/**
 * Every fast path against its slow reference: tables against the formulas they tabulate, shortcuts
 * against the brute-force computation, reused buffers against fresh ones, the reduced-resolution
 * colour against the full-size one. Tolerances are stated per test.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { describe, expect, test } from 'vitest';
import { letterSizeAt } from '../src/analysis/letter-size.js';
import { srgbToLinear } from '../src/colour/srgb.js';
import { validateSetup } from '../src/config/validate.js';
import { projectionFor, pixelToTan } from '../src/geometry/projection.js';
import { arcminPerPxAt, computeViewMap } from '../src/geometry/view-map.js';
import { createLinearRgb, type LinearRgb } from '../src/image/plane.js';
import { linearToRgba8 } from '../src/io/encode-png.js';
import { offAxisVarianceDeg2 } from '../src/optics/off-axis.js';
import { cieGlarePsfPerSr, glareKernel } from '../src/optics/stray-light.js';
import { lookAt, prepareProof } from '../src/pipeline.js';
import { acuityModels } from '../src/retina/acuity-model.js';
import { chromaticCutoffCpd } from '../src/retina/colour-loss.js';
import { computeGazeMaps } from '../src/retina/gaze-maps.js';
import { prepareRetina, renderPercept } from '../src/retina/percept.js';
import { rodCutoffCpd } from '../src/retina/rod-vision.js';
import { gaussianVarianceForCutoff, sharpCoefficient, sharpLowpassCoefficients, sharpWithExtra } from '../src/retina/sharp-lowpass.js';
import { srgbToLinear as toLinear } from '../src/colour/srgb.js';

const DESKTOP = validateSetup({}, 'test');

describe('per-pixel gaze maps (tables over eccentricity) against the direct formulas', () => {
  const W = 640;
  const H = 360;
  const projection = projectionFor(DESKTOP.display, W, H);
  const viewMap = computeViewMap(projection, [400, 150]);
  const limits = { opticalCutoffCpdByEccentricity: Float32Array.from({ length: 181 }, (_, s) => 40 - 0.3 * s), letterFactor: 0.76, defocusLimited: false };
  const model = acuityModels['rgc-sampling'];
  const params = DESKTOP.models.colourLoss;
  const maps = computeGazeMaps({ viewMap, model, eyes: 'both', colourLoss: params, sameDisplay: false, coneShare: 0.6, limits });

  test('cutoffs, colour and rod variances, off-axis variance and letter sizes within 1 % of chromaticCutoffCpd, gaussianVarianceForCutoff, offAxisVarianceDeg2, rodCutoffCpd and letterSizeAt', () => {
    let worst = 0;
    const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(Math.abs(b), 1e-9);
    for (let i = 0; i < W * H; i += 997) {
      const e = viewMap.eccentricityDeg[i];
      const a = viewMap.arcminPerPx[i];
      const cone = model.cutoffCpd(e, viewMap.meridianDeg[i], 'both');
      const cyc = a / 60;
      const rod = rodCutoffCpd(e, cone);
      worst = Math.max(worst,
        rel(maps.redGreenVariancePx2[i], gaussianVarianceForCutoff(chromaticCutoffCpd('red-green', e, params, cone) * cyc)),
        rel(maps.blueYellowVariancePx2[i], gaussianVarianceForCutoff(chromaticCutoffCpd('blue-yellow', e, params, cone) * cyc)),
        rel(maps.rodVariancePx2![i], gaussianVarianceForCutoff(rod * cyc)),
        rel(2 ** maps.achromaticLog2[i], cone * cyc),
        rel(maps.smallestLetterPx[i], letterSizeAt(0.6 * cone + 0.4 * rod, limits, e, a, false).px));
      const offAxis = offAxisVarianceDeg2(e, Math.min(cone, 30 / a) / 2) / (cyc * cyc);
      if (offAxis > 1e-3) worst = Math.max(worst, rel(maps.offAxisVariancePx2[i], offAxis));
    }
    expect(worst).toBeLessThan(0.01);
  });

  test('the view map’s pixel sizes (cached per projection) are arcminPerPxAt’s, and its eccentricities the angles to the gaze (geometry)', () => {
    const gaze = pixelToTan(projection, 400.5, 150.5);
    const g = [gaze[0], gaze[1], 1];
    for (const [x, y] of [[0, 0], [639, 359], [400, 150], [123, 321]]) {
      const i = y * W + x;
      const [a, b] = pixelToTan(projection, x + 0.5, y + 0.5);
      expect(viewMap.arcminPerPx[i]).toBeCloseTo(arcminPerPxAt(projection, a, b), 4);
      const cos = (a * g[0] + b * g[1] + 1) / (Math.hypot(a, b, 1) * Math.hypot(...g));
      expect(viewMap.eccentricityDeg[i]).toBeCloseTo((Math.acos(Math.min(1, cos)) * 180) / Math.PI, 2);
    }
  });
});

describe('the retina’s coefficient tables against the formula', () => {
  test('without an extra blur, within 2e-3 of sharpCoefficient; with one, within 0.03 of the gathered sharpWithExtra (1/12 octave by 1/6 octave; the largest errors at the kink where the filter turns into the identity)', () => {
    const levels = 10;
    const lcs = [-9.3, -6.1, -4.4, -2.7, -1.3, -0.9];
    const extras = [0, 0.4, 3.1, 27, 410];
    for (let k = 0; k < 4; k++) {
      for (const withExtra of [false, true]) {
        const lc = Float32Array.from(lcs.flatMap((l) => extras.map(() => l)));
        const ex = Float32Array.from(lcs.flatMap(() => extras.map((e) => Math.log2(1 + e))));
        const maps = Array.from({ length: levels }, () => lc);
        const exMaps = Array.from({ length: levels }, () => ex);
        const c0 = new Float32Array(lc.length);
        const c1 = new Float32Array(lc.length);
        sharpLowpassCoefficients(maps, levels, withExtra ? exMaps : undefined)(k, c0, c1, lc.length, 1);
        for (let i = 0; i < lc.length; i++) {
          const extra = extras[i % extras.length];
          if (!withExtra || extra === 0) {
            expect(Math.abs(c0[i] - sharpCoefficient(2 * k, lc[i], levels))).toBeLessThan(2e-3);
            expect(Math.abs(c1[i] - sharpCoefficient(2 * k + 1, lc[i], levels))).toBeLessThan(2e-3);
          } else {
            const [a, b] = sharpWithExtra(2 * k, lc[i], extra, levels);
            expect(Math.abs(c0[i] - a)).toBeLessThan(0.03);
            expect(Math.abs(c1[i] - b)).toBeLessThan(0.03);
          }
        }
      }
    }
  });
});

describe('the glare kernel’s shortcut (one octant, centre values away from the 1° edge)', () => {
  test('matches 4 × 4 sub-sampling of every pixel within 1 % per pixel and 0.5 % in total (CIE 180:2010 equation)', () => {
    const pixelDeg = 0.25;
    const radius = 40;
    const fast = glareKernel(pixelDeg, radius, 60, 0.5, 1);
    const size = 2 * radius + 1;
    const pixelSr = ((pixelDeg * Math.PI) / 180) ** 2;
    let total = 0;
    let worst = 0;
    for (let y = 0; y < size; y++) {
      for (let x = 0; x < size; x++) {
        let acc = 0;
        for (let sy = 0; sy < 4; sy++) for (let sx = 0; sx < 4; sx++) {
          const theta = Math.hypot((x - radius + (sx + 0.5) / 4 - 0.5) * pixelDeg, (y - radius + (sy + 0.5) / 4 - 0.5) * pixelDeg);
          if (theta >= 1) acc += cieGlarePsfPerSr(theta, 60, 0.5);
        }
        const slow = (acc / 16) * pixelSr;
        total += slow;
        if (slow > 0) worst = Math.max(worst, Math.abs(fast.kernel[y * size + x] - slow) / slow);
      }
    }
    expect(worst).toBeLessThan(0.01);
    expect(Math.abs(fast.scatteredFraction - total) / total).toBeLessThan(0.005);
  });
});

async function ferryConsole(width: number, height: number): Promise<LinearRgb> {
  const { data } = await sharp(readFileSync(join(import.meta.dirname, '..', 'sample-scenes', 'ferry-console.png'))).resize(width, height).removeAlpha().raw().toBuffer({ resolveWithObject: true });
  const image = createLinearRgb(width, height);
  for (let i = 0; i < width * height; i++) for (let c = 0; c < 3; c++) image.planes[c][i] = srgbToLinear(data[3 * i + c] / 255);
  return image;
}

describe('buffers and resolutions', () => {
  test('a gaze computed into the arrays of an earlier one equals the same gaze computed fresh (bit for bit)', async () => {
    const frame = await ferryConsole(320, 180);
    const setup = validateSetup({ display: { preset: 'desktop-27in' }, viewer: { preset: 'age-55' } }, 'test');
    const prepared = prepareProof(frame, setup, 'test');
    const first = lookAt(prepared, { gazePx: [60, 40] });
    const reused = lookAt(prepared, { gazePx: [250, 120], reuse: first });
    const fresh = lookAt(prepared, { gazePx: [250, 120] });
    for (let c = 0; c < 3; c++) expect(reused.percept.planes[c]).toEqual(fresh.percept.planes[c]);
    expect(reused.smallestLetterPx).toEqual(fresh.smallestLetterPx);
  });

  test('colour worked at half size (mixed near the gaze with the full-size colour, unblurred and bound over a 1 px² window) stays within 0.01 on average and 0.15 at the 99.9th percentile of colour worked at full size (linear RGB, white = 1)', async () => {
    const W = 480;
    const H = 270;
    const frame = await ferryConsole(W, H);
    const setup = validateSetup({ display: { preset: 'desktop-27in' } }, 'test');
    const projection = projectionFor(setup.display, W, H);
    const viewMap = computeViewMap(projection, [200, 130]);
    const limits = { opticalCutoffCpdByEccentricity: new Float32Array(181).fill(40), letterFactor: 0.76, defocusLimited: false };
    const maps = computeGazeMaps({ viewMap, model: acuityModels['rgc-sampling'], eyes: 'both', colourLoss: setup.models.colourLoss, sameDisplay: false, coneShare: 1, limits });
    const at = (level: number): LinearRgb => renderPercept(prepareRetina(frame, { colourLevel: level }), { cutoffs: maps, coneShare: 1 });
    const [full, half] = [at(0), at(1)];
    const d = new Float32Array(W * H);
    for (let i = 0; i < W * H; i++) d[i] = Math.max(...[0, 1, 2].map((c) => Math.abs(full.planes[c][i] - half.planes[c][i])));
    const mean = d.reduce((a, b) => a + b, 0) / d.length;
    const sorted = Float32Array.from(d).sort();
    // The largest differences (up to about 0.2) sit at the edges of saturated patches, where colour
    // bound at half size over a coarser window spreads a little differently.
    expect(mean).toBeLessThan(0.01);
    expect(sorted[Math.floor(0.999 * sorted.length)]).toBeLessThan(0.15);
  });

  test('the PNG encoder’s look-up equals a binary search over the sRGB code thresholds (IEC 61966-2-1), every code', () => {
    const n = 50000;
    const image = createLinearRgb(n, 1);
    for (let i = 0; i < n; i++) {
      image.planes[0][i] = (i / n) * 1.05 - 0.02;
      image.planes[1][i] = ((i * 7919) % n) / n;
      image.planes[2][i] = toLinear((i % 256) / 255);
    }
    const thresholds = Array.from({ length: 255 }, (_, k) => Math.fround(toLinear((k + 0.5) / 255)));
    const out = linearToRgba8(image);
    for (let i = 0; i < n; i++) {
      for (let c = 0; c < 3; c++) {
        const v = image.planes[c][i];
        let lo = 0;
        let hi = 255;
        while (lo < hi) {
          const mid = (lo + hi) >> 1;
          if (thresholds[mid] <= v) lo = mid + 1;
          else hi = mid;
        }
        expect(out[4 * i + c]).toBe(lo);
      }
    }
  });
});
