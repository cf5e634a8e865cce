import { describe, expect, test } from 'vitest';
import { LINEAR_SRGB_TO_OPPONENT } from '../../src/colour/cone-space.js';
import { validateSetup } from '../../src/config/validate.js';
import { createLinearRgb, type LinearRgb } from '../../src/image/plane.js';
import { runProof } from '../../src/pipeline.js';
import { blindSpotCentreDeg } from '../../src/retina/blind-spot.js';
import { chromaticCutoffCpd } from '../../src/retina/colour-loss.js';
import { rodCutoffCpd } from '../../src/retina/rod-vision.js';

// Test screen: 0.5 mm pixels at the distance where one pixel subtends 0.05° straight ahead (20 px/°).
const distanceMm = 0.5 / Math.tan((0.05 * Math.PI) / 180);
const W = 1600;
const H = 400;
const PARAMS = { redGreenFovealCutoffCpd: 11, blueYellowFovealCutoffCpd: 10, redGreenEccentricityScale: 2, blueYellowEccentricityScale: 1 };

function setup(over: Record<string, unknown> = {}) {
  return validateSetup({
    display: { kind: 'screen', widthMm: W * 0.5, heightMm: H * 0.5, resolutionPx: [W, H], viewingDistanceMm: distanceMm, peakLuminanceCdM2: 200, blackLuminanceCdM2: 0 },
    viewer: { preset: 'age-25' },
    gaze: { xPx: W / 2, yPx: H / 2 },
    ...over,
  }, 'test setup');
}

/** Column whose centre lies at the given eccentricity right (+) or left (−) of the gaze. */
const columnAt = (eccDeg: number): number => Math.round(W / 2 + 0.5 + (distanceMm * Math.tan((eccDeg * Math.PI) / 180)) / 0.5);
/** Pixels per degree radially at an eccentricity on the horizontal: 20/cos²θ. */
const pxPerDegAt = (eccDeg: number): number => 20 / Math.cos((eccDeg * Math.PI) / 180) ** 2;

function frameOf(rgb: [number, number, number]): LinearRgb {
  const f = createLinearRgb(W, H);
  f.planes.forEach((p, c) => p.fill(rgb[c]));
  return f;
}

function paint(f: LinearRgb, x0: number, y0: number, w: number, h: number, colourAt: (x: number, y: number) => [number, number, number]): void {
  for (let y = y0; y < y0 + h; y++) for (let x = x0; x < x0 + w; x++) {
    const c = colourAt(x - x0, y - y0);
    for (let k = 0; k < 3; k++) f.planes[k][y * W + x] = c[k];
  }
}

/** Red–green opponent signal of every pixel in a box. */
function redGreenValues(img: LinearRgb, x0: number, y0: number, w: number, h: number): number[] {
  const [a, b, c] = LINEAR_SRGB_TO_OPPONENT[1];
  const out: number[] = [];
  for (let y = y0; y < y0 + h; y++) for (let x = x0; x < x0 + w; x++) {
    const i = y * W + x;
    out.push(a * img.planes[0][i] + b * img.planes[1][i] + c * img.planes[2][i]);
  }
  return out;
}

/** Mean red–green signal over a box: the colour of a field. */
function meanRedGreen(img: LinearRgb, x0: number, y0: number, w: number, h: number): number {
  const v = redGreenValues(img, x0, y0, w, h);
  return v.reduce((a, b) => a + b, 0) / v.length;
}

/** Mean absolute deviation of the red–green signal over a box: the chroma contrast of a pattern. */
function redGreenModulation(img: LinearRgb, x0: number, y0: number, w: number, h: number): number {
  const v = redGreenValues(img, x0, y0, w, h);
  const mean = v.reduce((a, b) => a + b, 0) / v.length;
  return v.reduce((a, b) => a + Math.abs(b - mean), 0) / v.length;
}

const RED: [number, number, number] = [0.9, 0.05, 0.05];
const GREEN: [number, number, number] = [0.05, 0.45, 0.05];
const GREY: [number, number, number] = [0.2, 0.2, 0.2];

describe('colour loss with eccentricity (our proposal on Mullen 1991; Mullen, Sakurai & Chu 2005; Hansen et al. 2009)', () => {
  test('red–green sensitivity falls twice as steeply as blue–yellow with eccentricity (Mullen 1991 vs Mullen & Kingdom 2002, on Geisler & Perry 1998 α = 0.106, e2 = 2.3°)', () => {
    // Threshold ∝ exp(s·α·f·e/e2): at the cutoff of each channel, the eccentricity term of red–green
    // is twice that of blue–yellow at the same frequency and eccentricity.
    const f0 = (ch: 'red-green' | 'blue-yellow'): number => (ch === 'red-green' ? 11 : 10);
    const logThresholdRise = (ch: 'red-green' | 'blue-yellow', e: number): number => {
      const fc = chromaticCutoffCpd(ch, e, PARAMS, 100);
      const alphaC = Math.log(64) / f0(ch);
      // At the cutoff the threshold is 1: ln(1/CT0) = α_c·f + rise ⇒ rise = ln 64 − α_c·f.
      return (Math.log(64) - alphaC * fc) / fc;
    };
    expect(logThresholdRise('red-green', 10) / logThresholdRise('blue-yellow', 10)).toBeCloseTo(2, 6);
    expect(logThresholdRise('blue-yellow', 10)).toBeCloseTo((0.106 * 10) / 2.3, 6);
  });

  test('the S-cone-free centre removes blue–yellow detail finer than 25′ at the gaze (Williams, MacLeod & Hayhoe 1981)', () => {
    expect(chromaticCutoffCpd('blue-yellow', 0, PARAMS, 60)).toBeCloseTo(60 / 50, 10);
    expect(chromaticCutoffCpd('blue-yellow', 1, PARAMS, 60)).toBeGreaterThan(5);
  });

  // A red–green checkerboard of `checkDeg` checks, 6 × 3 checks.
  const checks = (eccDeg: number, checkDeg = 0.75): { frame: LinearRgb; box: [number, number, number, number] } => {
    const frame = frameOf(GREY);
    const ppd = pxPerDegAt(eccDeg);
    const size = Math.round(checkDeg * ppd);
    const w = 6 * size;
    const h = 3 * size;
    const x0 = columnAt(eccDeg) - Math.round(w / 2);
    const y0 = Math.round(H / 2 - h / 2);
    paint(frame, x0, y0, w, h, (x, y) => ((Math.floor(x / size) + Math.floor(y / size)) % 2 === 0 ? RED : GREEN));
    return { frame, box: [x0 + size, y0 + Math.round(size / 2), w - 2 * size, h - size] };
  };

  test('a small saturated red–green pattern at 2° keeps much of its chroma (Mullen 1991)', () => {
    const { frame, box } = checks(2);
    const { percept } = runProof(frame, setup(), 'test');
    expect(redGreenModulation(percept, ...box) / redGreenModulation(frame, ...box)).toBeGreaterThan(0.5);
  });

  test('a small (0.25° checks) red–green pattern at 30° loses nearly all its chroma (Mullen, Sakurai & Chu 2005: absent for small stimuli by 25–30°)', () => {
    const { frame, box } = checks(30, 0.25);
    const { percept } = runProof(frame, setup(), 'test');
    expect(redGreenModulation(percept, ...box) / redGreenModulation(frame, ...box)).toBeLessThan(0.1);
  });

  test('a large red field at 30° keeps much of its colour (Hansen, Pracejus & Gegenfurtner 2009)', () => {
    const frame = frameOf(GREY);
    const ppd = pxPerDegAt(30);
    const w = Math.round(12 * ppd);
    paint(frame, columnAt(30) - w / 2, 0, w, H, () => RED);
    const { percept } = runProof(frame, setup(), 'test');
    const box: [number, number, number, number] = [columnAt(30) - 10, H / 2 - 10, 20, 20];
    expect(meanRedGreen(percept, ...box) / meanRedGreen(frame, ...box)).toBeGreaterThan(0.6);
  });
});

describe('light level (CIE 191:2010; Larson et al. 1997)', () => {
  test('at 0.001 cd/m² vision is scotopic and the percept has no chroma', () => {
    const frame = frameOf(GREY);
    paint(frame, 300, 100, 400, 200, (x) => (x % 40 < 20 ? RED : [0.05, 0.05, 0.9]));
    const result = runProof(frame, setup({ light: { adaptingLuminanceCdM2: 0.001 } }), 'test');
    expect(result.numbers.light.regime).toBe('scotopic');
    expect(result.numbers.light.mesopicFactorM).toBe(0);
    const [r, g, b] = result.percept.planes;
    for (let i = 0; i < r.length; i += 37) {
      expect(Math.abs(r[i] - g[i])).toBeLessThan(1e-5);
      expect(Math.abs(g[i] - b[i])).toBeLessThan(1e-5);
    }
  });

  test('in dim light blue looks brighter than red of the same luminance (Purkinje shift, Larson et al. 1997 ratios)', () => {
    const frame = frameOf([0, 0, 0]);
    // Equal photopic luminance: Y = 0.2126·r for red, 0.0722·b for blue.
    paint(frame, 200, 150, 200, 100, () => [0.3, 0, 0]);
    paint(frame, 1200, 150, 200, 100, () => [0, 0, (0.3 * 0.2126) / 0.0722]);
    const { percept } = runProof(frame, setup({ light: { adaptingLuminanceCdM2: 0.001 } }), 'test');
    const i = (x: number): number => 200 * W + x;
    expect(percept.planes[1][i(1300)] / percept.planes[1][i(300)]).toBeGreaterThan(10);
  });

  test('rods see nothing small in the central 1.25° (rod-free zone, Curcio et al. 1990) but do in the near periphery', () => {
    expect(rodCutoffCpd(0, 60)).toBeLessThan(0.3);
    expect(rodCutoffCpd(3, 20)).toBeCloseTo(3, 10);
  });

  test.each([
    ['photopic', {}],
    ['mesopic', { light: { adaptingLuminanceCdM2: 0.1 } }],
    ['scotopic', { light: { adaptingLuminanceCdM2: 0.001 } }],
    ['one eye, with its blind spot', { viewer: { preset: 'age-25', eyes: 'right' } }],
  ])('a uniform frame stays uniform: %s', (_name, over) => {
    // A surround as bright as the frame, so that no edge of the field shows (common practice).
    const y = 0.2126 * 0.3 + 0.7152 * 0.25 + 0.0722 * 0.2;
    const light = { surroundLuminanceCdM2: 200 * y, ...((over as { light?: object }).light ?? {}) };
    const { percept } = runProof(frameOf([0.3, 0.25, 0.2]), setup({ ...over, light }), 'test');
    percept.planes.forEach((p, c) => {
      const expected = p[0];
      for (let i = 0; i < p.length; i += 13) expect(Math.abs(p[i] - expected)).toBeLessThan(2e-3);
      if (_name === 'photopic') expect(expected).toBeCloseTo([0.3, 0.25, 0.2][c], 3);
    });
  });
});

describe('blind spot (optic disc ≈ 15° temporal, 1.5° below; 5.5° × 7.5°)', () => {
  test('it lies right of fixation for the right eye and left for the left eye; none with both (anatomy, common practice)', () => {
    expect(blindSpotCentreDeg('right')).toEqual([15, -1.5]);
    expect(blindSpotCentreDeg('left')).toEqual([-15, -1.5]);
    expect(blindSpotCentreDeg('both')).toBeUndefined();
  });

  test.each([['right', 15], ['left', -15]] as const)('%s eye: a dark dot at %i° vanishes, the mirrored dot stays', (eye, eccDeg) => {
    const frame = frameOf([0.8, 0.8, 0.8]);
    // Rows of the blind spot's centre: 1.5° below the horizontal.
    const y = Math.round(H / 2 + 1.5 * 20);
    const dot = (x: number): void => paint(frame, x - 15, y - 15, 30, 30, () => [0, 0, 0]);
    dot(columnAt(eccDeg));
    dot(columnAt(-eccDeg));
    const result = runProof(frame, setup({ viewer: { preset: 'age-25', eyes: eye } }), 'test');
    const at = (x: number): number => result.percept.planes[1][y * W + x];
    expect(at(columnAt(eccDeg))).toBeGreaterThan(0.7);
    expect(at(columnAt(-eccDeg))).toBeLessThan(0.6);
    expect(result.numbers.blindSpot?.eye).toBe(eye);
    expect(Math.sign(result.numbers.blindSpot!.centrePx![0] - W / 2)).toBe(Math.sign(eccDeg));
  });
});
