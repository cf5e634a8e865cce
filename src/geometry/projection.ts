/**
 * The planar projection shared by flat screens and rectilinear headset eye buffers: a frame pixel
 * (u, v) lies on a plane at unit distance in front of the eye at tan-space coordinates
 * a = (u − cx)·kx + tx (right), b = −(v − cy)·ky + ty (up). Its visual direction is (a, b, 1) normalised.
 */
import type { Display } from '../config/setup.js';
import { degToRad } from '../units.js';

export interface Projection {
  widthPx: number;
  heightPx: number;
  /** Frame pixel centre of the plane's origin column and row (the middle of the frame). */
  cxPx: number;
  cyPx: number;
  /** tan-space size of one frame pixel, horizontally and vertically. */
  kxPerPx: number;
  kyPerPx: number;
  /** tan-space position of the frame centre relative to the eye's straight-ahead axis. */
  txTan: number;
  tyTan: number;
  /** Distance from the eye to the plane along its normal, in mm (the virtual image for a headset). */
  planeDistanceMm: number;
}

/** Builds the projection of a frame of the given size shown full-screen on the display. */
export function projectionFor(display: Display, widthPx: number, heightPx: number): Projection {
  const cxPx = widthPx / 2;
  const cyPx = heightPx / 2;
  if (display.kind === 'screen') {
    const d = display.viewingDistanceMm;
    return {
      widthPx, heightPx, cxPx, cyPx,
      kxPerPx: display.widthMm / widthPx / d,
      kyPerPx: display.heightMm / heightPx / d,
      // The eye sits at eyeOffsetMm from the screen centre, so the centre is at −offset from the eye.
      txTan: -display.eyeOffsetMm[0] / d,
      tyTan: -display.eyeOffsetMm[1] / d,
      planeDistanceMm: d,
    };
  }
  // Rectilinear eye buffer: f = (W/2) / tan(FOV/2), so one pixel spans tan(FOV/2)/(W/2) in tan space.
  return {
    widthPx, heightPx, cxPx, cyPx,
    kxPerPx: Math.tan(degToRad(display.fieldOfViewDeg[0] / 2)) / (widthPx / 2),
    kyPerPx: Math.tan(degToRad(display.fieldOfViewDeg[1] / 2)) / (heightPx / 2),
    txTan: 0,
    tyTan: 0,
    planeDistanceMm: display.focalDistanceM * 1000,
  };
}

/** Tan-space coordinates of the centre of frame pixel (x, y) given in pixel-edge coordinates. */
export function pixelToTan(p: Projection, xPx: number, yPx: number): [number, number] {
  return [(xPx - p.cxPx) * p.kxPerPx + p.txTan, -(yPx - p.cyPx) * p.kyPerPx + p.tyTan];
}

/** Frame pixel coordinates of tan-space point (a, b); the inverse of pixelToTan. */
export function tanToPixel(p: Projection, a: number, b: number): [number, number] {
  return [(a - p.txTan) / p.kxPerPx + p.cxPx, p.cyPx - (b - p.tyTan) / p.kyPerPx];
}
