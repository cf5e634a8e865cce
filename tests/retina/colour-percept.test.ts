/**
 * Colour in the percept, end to end in the written PNG: isoluminant colour patterns near and far
 * from the gaze against the colour threshold model built on published findings (Mullen 1985, 1991;
 * Mullen & Kingdom 2002; Geisler & Perry 1998 constants), and no new hue around a saturated patch.
 */
import Color from 'colorjs.io';
import { describe, expect, test } from 'vitest';
import { LINEAR_SRGB_TO_OPPONENT } from '../../src/colour/cone-space.js';
import { chromaticCutoffCpd } from '../../src/retina/colour-loss.js';
import { gaussianVarianceForCutoff } from '../../src/retina/sharp-lowpass.js';
import type { LinearRgb } from '../../src/image/plane.js';
import { columnAtDeg, proofThroughFiles, screenSetup, uniformFrame } from '../helpers/synthetic.js';

const PARAMS = { redGreenFovealCutoffCpd: 11, blueYellowFovealCutoffCpd: 10, redGreenEccentricityScale: 2, blueYellowEccentricityScale: 1 };

const opponent = (img: LinearRgb, i: number): [number, number, number] => LINEAR_SRGB_TO_OPPONENT.map((row) => row[0] * img.planes[0][i] + row[1] * img.planes[1][i] + row[2] * img.planes[2][i]) as [number, number, number];

/**
 * Red–green amplitude of a checker's fundamental (the product of sines along x and y with the cell's
 * period) over a box, by projection: blur shrinks it by the low-pass's transfer at the fundamental.
 */
function checkerFundamental(img: LinearRgb, box: [number, number, number, number], cell: number, origin: [number, number]): number {
  const [x0, y0, w, h] = box;
  let s = 0;
  let q = 0;
  for (let y = y0; y < y0 + h; y++) {
    for (let x = x0; x < x0 + w; x++) {
      const basis = Math.sin((Math.PI * (x - origin[0] + 0.5)) / cell) * Math.sin((Math.PI * (y - origin[1] + 0.5)) / cell);
      s += basis * opponent(img, y * img.width + x)[1];
      q += basis * basis;
    }
  }
  return s / q;
}

// Red and green of equal luminance (sRGB luminance weights, IEC 61966-2-1): 0.2126·Δr = 0.7152·Δg.
const GREY = 0.178;
const RED: [number, number, number] = [0.6, GREY, GREY];
const GREEN: [number, number, number] = [GREY, GREY + (0.2126 * (0.6 - GREY)) / 0.7152, GREY];
const PPD = 40;
const W = 960;
const H = 240;
const CELL_DEG = 0.25;
/** The checker's fundamental, √2/(2·cell) along its diagonals: 2.83 cpd. */
const FUNDAMENTAL_CPD = Math.SQRT2 / (2 * CELL_DEG);

/** A frame with 6 × 6-cell red–green checkers centred at the given eccentricities, and their cells. */
function checkerFrame(eccentricities: number[]): { frame: LinearRgb; checkers: { box: [number, number, number, number]; origin: [number, number]; cell: number }[] } {
  const frame = uniformFrame(W, H, [0.3, 0.3, 0.3]);
  const cell = Math.round(CELL_DEG * PPD);
  const checkers = eccentricities.map((ecc) => {
    const x0 = columnAtDeg(W, PPD, ecc).x - 3 * cell;
    const y0 = H / 2 - 3 * cell;
    for (let yy = 0; yy < 6 * cell; yy++) for (let xx = 0; xx < 6 * cell; xx++) {
      const c = (Math.floor(xx / cell) + Math.floor(yy / cell)) % 2 === 0 ? RED : GREEN;
      for (let k = 0; k < 3; k++) frame.planes[k][(y0 + yy) * W + x0 + xx] = c[k];
    }
    return { box: [x0 + cell, y0 + cell, 4 * cell, 4 * cell] as [number, number, number, number], origin: [x0, y0] as [number, number], cell };
  });
  return { frame, checkers };
}

/** The colour model's transfer at the fundamental: a Gaussian keeping 5 % at the cutoff (variance in deg²). */
const varianceDeg2 = (ecc: number): number => gaussianVarianceForCutoff(chromaticCutoffCpd('red-green', ecc, PARAMS, 100));
const transfer = (varDeg2: number): number => Math.exp(-2 * Math.PI ** 2 * varDeg2 * FUNDAMENTAL_CPD ** 2);

describe('isoluminant colour near and far from the gaze', () => {
  test('the red and green are isoluminant (sRGB luminance, IEC 61966-2-1)', () => {
    const y = (c: readonly number[]): number => 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
    expect(y(RED)).toBeCloseTo(y(GREEN), 6);
  });

  test('on the same display (viewer = reference), a 0.25° red–green checker at 1.5° and 5° keeps what the threshold model predicts beyond the fovea: cutoff f0/(1 + 2·(α/α_c)·e/e2), Mullen 1991 × Geisler & Perry 1998, variances subtracted', async () => {
    const { frame, checkers } = checkerFrame([1.5, 5]);
    const setup = screenSetup(W, H, PPD, { viewer: { preset: 'age-25' }, percept: { mode: 'same-display', referenceViewer: 'age-25' } });
    const { frame: written, percept } = await proofThroughFiles(frame, setup);
    const kept = checkers.map(({ box, cell, origin }) => checkerFundamental(percept, box, cell, origin) / checkerFundamental(written, box, cell, origin));
    const predicted = [1.5, 5].map((e) => transfer(varianceDeg2(e) - varianceDeg2(0)));
    // Predicted 0.84 and 0.46: colour a quarter degree across is still clearly coloured at 1.5°, half gone at 5°.
    expect(predicted[0]).toBeGreaterThan(0.8);
    kept.forEach((k, i) => expect(Math.abs(k - predicted[i]), `kept ${k.toFixed(3)}, predicted ${predicted[i].toFixed(3)}`).toBeLessThan(0.06));
  });

  test('in the retinal image of a 32-year-old (the CIE 170-1 standard observer, whose lens leaves the frame’s colours as they are), the checker at 5° keeps, relative to one at the gaze, what the threshold model predicts (same sources; the optics are alike on both)', async () => {
    const { frame, checkers } = checkerFrame([0, 5]);
    const setup = screenSetup(W, H, PPD, { viewer: { ageYears: 32 }, percept: { mode: 'retinal-image' } });
    const { percept } = await proofThroughFiles(frame, setup);
    const [atGaze, at5] = checkers.map(({ box, cell, origin }) => checkerFundamental(percept, box, cell, origin));
    const predicted = transfer(varianceDeg2(5)) / transfer(varianceDeg2(0));
    expect(Math.abs(at5 / atGaze - predicted), `ratio ${(at5 / atGaze).toFixed(3)}, predicted ${predicted.toFixed(3)}`).toBeLessThan(0.06);
  });
});

describe('no new hue around a saturated patch', () => {
  // Amber's sRGB luminance (IEC 61966-2-1 weights) is 0.5206: a grey of 0.5206 leaves no luminance edge to bind to.
  test.each([['light grey', [0.71, 0.74, 0.78]], ['a grey of the same luminance', [0.5206, 0.5206, 0.5206]]])('an amber banner on %s 15° from the gaze: within 1° around it, every colour departs from the grey faintly or toward amber (CIELAB hue within 20°) (common practice: blur mixes colours, it makes none)', async (_name, background) => {
    const PPD = 24;
    const W = 1000;
    const H = 300;
    const GREY = background as [number, number, number];
    const AMBER: [number, number, number] = [1, 0.43, 0.015];
    const frame = uniformFrame(W, H, GREY);
    const { x } = columnAtDeg(W, PPD, -15);
    const bw = Math.round(4 * PPD);
    const bh = Math.round(1.2 * PPD);
    const bx = Math.round(x - bw / 2);
    const by = Math.round(H / 2 - bh / 2);
    for (let yy = by; yy < by + bh; yy++) for (let xx = bx; xx < bx + bw; xx++) for (let k = 0; k < 3; k++) frame.planes[k][yy * W + xx] = AMBER[k];
    const { frame: written, percept } = await proofThroughFiles(frame, screenSetup(W, H, PPD, { viewer: { preset: 'age-25' } }));
    // Hue in CIELAB (CIE 15, via colorjs.io): the direction of a colour's departure from the grey in a*b*.
    const lab = (img: LinearRgb, i: number): number[] => new Color('srgb-linear', [img.planes[0][i], img.planes[1][i], img.planes[2][i]]).to('lab').coords.map(Number);
    const grey = lab(written, 0);
    const amber = lab(written, (H / 2) * W + x);
    const amberHue = Math.atan2(amber[2] - grey[2], amber[1] - grey[1]);
    const amberChroma = Math.hypot(amber[1] - grey[1], amber[2] - grey[2]);
    const margin = Math.round(PPD);
    let worst = 0;
    let counted = 0;
    for (let yy = by - margin; yy < by + bh + margin; yy++) {
      for (let xx = bx - margin; xx < bx + bw + margin; xx++) {
        const inside = yy >= by && yy < by + bh && xx >= bx && xx < bx + bw;
        if (inside) continue;
        const [, a, b] = lab(percept, yy * W + xx);
        const [da, db] = [a - grey[1], b - grey[2]];
        if (Math.hypot(da, db) < 0.05 * amberChroma) continue;
        counted++;
        let d = Math.abs(Math.atan2(db, da) - amberHue);
        if (d > Math.PI) d = 2 * Math.PI - d;
        worst = Math.max(worst, (d * 180) / Math.PI);
      }
    }
    // The banner's colour does spread past its edge at 15° (so some pixels count) ...
    expect(counted).toBeGreaterThan(100);
    // ... but only as amber.
    expect(worst).toBeLessThan(20);
  });
});
