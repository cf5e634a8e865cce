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

/**
 * Builds the projection of a frame of the given size shown on the display: filling it, or at
 * `placementPx` ([x, y, width, height] in display pixels) for a crop or a widget.
 */
export function projectionFor(display: Display, widthPx: number, heightPx: number, placementPx?: readonly [number, number, number, number]): Projection {
  const cxPx = widthPx / 2;
  const cyPx = heightPx / 2;
  const [dw, dh] = display.resolutionPx;
  const [px, py, pw, ph] = placementPx ?? [0, 0, dw, dh];
  // tan-space size of one display pixel, and of the display's centre relative to the eye's axis.
  const screen = display.kind === 'screen';
  const d = screen ? display.viewingDistanceMm : display.focalDistanceM * 1000;
  const kx = screen ? display.widthMm / dw / d : Math.tan(degToRad(display.fieldOfViewDeg[0] / 2)) / (dw / 2);
  const ky = screen ? display.heightMm / dh / d : Math.tan(degToRad(display.fieldOfViewDeg[1] / 2)) / (dh / 2);
  // The eye sits at eyeOffsetMm from the screen centre, so the centre is at −offset from the eye.
  const tx = screen ? -display.eyeOffsetMm[0] / d : 0;
  const ty = screen ? -display.eyeOffsetMm[1] / d : 0;
  // The frame's centre in display pixels, from the display's centre (rectilinear eye buffers: f = (W/2) / tan(FOV/2)).
  const ox = px + pw / 2 - dw / 2;
  const oy = py + ph / 2 - dh / 2;
  return {
    widthPx, heightPx, cxPx, cyPx,
    kxPerPx: (kx * pw) / widthPx,
    kyPerPx: (ky * ph) / heightPx,
    txTan: tx + ox * kx,
    tyTan: ty - oy * ky,
    planeDistanceMm: d,
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
