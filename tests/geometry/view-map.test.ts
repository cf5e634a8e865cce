import { describe, expect, test } from 'vitest';
import type { HeadsetDisplay, ScreenDisplay } from '../../src/config/setup.js';
import { virtualImageDistanceM } from '../../src/config/validate.js';
import { pixelToTan, projectionFor } from '../../src/geometry/projection.js';
import { arcminPerPxAt, computeViewMap, fieldOfViewDeg, pixelAtFieldPoint } from '../../src/geometry/view-map.js';
import { visualAngleDeg } from '../../src/units.js';

const screen = (over: Partial<ScreenDisplay> = {}): ScreenDisplay => ({
  kind: 'screen', widthMm: 0.2331 * 1000, heightMm: 0.2331 * 600, resolutionPx: [1000, 600], viewingDistanceMm: 600,
  eyeOffsetMm: [0, 0], peakLuminanceCdM2: 100, blackLuminanceCdM2: 0, ...over,
});

describe('visual angle', () => {
  test('16′ at 600 mm is 2.793 mm; 5′ at 6 m is 8.727 mm (θ = 2·atan(h/2d), derived)', () => {
    expect(visualAngleDeg(2.793, 600) * 60).toBeCloseTo(16, 2);
    expect(visualAngleDeg(8.727, 6000) * 60).toBeCloseTo(5, 3);
  });
});

describe('flat screen geometry', () => {
  test('0.2331 mm pitch at 600 mm gives 44.9 px/° straight ahead (ppd = 1/(2·atan(p/2d)), derived)', () => {
    const p = projectionFor(screen(), 1000, 600);
    const [a, b] = pixelToTan(p, 500, 300);
    expect(60 / arcminPerPxAt(p, a, b)).toBeCloseTo(44.9, 1);
    expect(60 / arcminPerPxAt(p, a, b)).toBeCloseTo(1 / visualAngleDeg(0.2331, 600), 4);
  });

  test('eccentricity of a pixel equals atan of its offset over the distance (trigonometry, derived)', () => {
    const p = projectionFor(screen(), 1000, 600);
    const map = computeViewMap(p, [500, 300]);
    // The gaze pixel's centre lies 0.5 px right of the screen centre, pixel 900's centre 400.5 px.
    const i = 300 * 1000 + 900;
    const expected = Math.atan((400.5 * 0.2331) / 600) - Math.atan((0.5 * 0.2331) / 600);
    expect(map.eccentricityDeg[i]).toBeCloseTo((expected * 180) / Math.PI, 4);
    expect(map.eccentricityDeg[300 * 1000 + 500]).toBeCloseTo(0, 6);
    expect(map.meridianDeg[i]).toBeCloseTo(0, 3);
    expect(map.meridianDeg[0 * 1000 + 500]).toBeCloseTo(90, 3);
  });

  test('an eye sitting off-centre sees the screen centre off-axis (trigonometry, derived)', () => {
    const p = projectionFor(screen({ eyeOffsetMm: [100, 0] }), 1000, 600);
    const fov = fieldOfViewDeg(p);
    const half = (1000 * 0.2331) / 2;
    const expected = ((Math.atan((half + 100) / 600) + Math.atan((half - 100) / 600)) * 180) / Math.PI;
    expect(fov.horizontal).toBeCloseTo(expected, 6);
  });
});

describe('headset eye buffer (rectilinear)', () => {
  const headset: HeadsetDisplay = { kind: 'headset', resolutionPx: [1600, 1600], fieldOfViewDeg: [100, 100], focalDistanceM: 1.3, opticalTransmission: 1, peakLuminanceCdM2: 100, blackLuminanceCdM2: 0 };
  const p = projectionFor(headset, 1600, 1600);

  test('the field of view is the stated one (fx = (W/2)/tan(FOV/2), common practice)', () => {
    expect(fieldOfViewDeg(p).horizontal).toBeCloseTo(100, 6);
    expect(fieldOfViewDeg(p).vertical).toBeCloseTo(100, 6);
  });

  test('px/° at the centre is fx·π/180; off-axis a pixel subtends less, its solid-angle size shrinking as cos^1.5 θ (tangent-space geometry, derived)', () => {
    const fx = 800 / Math.tan((50 * Math.PI) / 180);
    const ppdCentre = 60 / arcminPerPxAt(p, 0, 0);
    // Along a row the radial angle per pixel shrinks as cos²θ and the tangential as cosθ, so the
    // geometric-mean size (square root of the solid angle) shrinks as cos^1.5 θ and px/° grows.
    expect(ppdCentre).toBeCloseTo((fx * Math.PI) / 180, 6);
    const theta = (30 * Math.PI) / 180;
    const ppd30 = 60 / arcminPerPxAt(p, Math.tan(theta), 0);
    expect(ppdCentre / ppd30).toBeCloseTo(Math.cos(theta) ** 1.5, 6);
  });

  test('along a row the angle per pixel falls as cos²θ (tangent-space geometry: dθ/dx = cos²θ / fx, derived)', () => {
    const map = computeViewMap(p, [800, 800]);
    const fx = 800 / Math.tan((50 * Math.PI) / 180);
    // Column whose centre lies near 30° right of the centre.
    const x = Math.round(800 + fx * Math.tan((30 * Math.PI) / 180));
    const row = 800 * 1600;
    const stepDeg = map.eccentricityDeg[row + x + 1] - map.eccentricityDeg[row + x];
    const theta = Math.atan((x + 0.5 - 800) / fx);
    expect(stepDeg).toBeCloseTo(((Math.cos(theta) ** 2 / fx) * 180) / Math.PI, 4);
  });

  test('a point 20° from the gaze maps back to 20° (projection round trip)', () => {
    const map = computeViewMap(p, [800, 800]);
    const at = pixelAtFieldPoint(p, [800, 800], 20, 30)!;
    const i = Math.floor(at[1]) * 1600 + Math.floor(at[0]);
    expect(map.eccentricityDeg[i]).toBeCloseTo(20, 0);
  });

  test('thin lens f = 40 mm, screen at 38 mm → virtual image at 760 mm (thin-lens law, derived)', () => {
    expect(virtualImageDistanceM({ focalLengthMm: 40, screenDistanceMm: 38, eyeReliefMm: 0 })).toBeCloseTo(0.76, 9);
  });
});
