/**
 * compare.png: the frame as displayed and the viewer's percept side by side, with eccentricity rings
 * around the gaze, the gaze marker and a caption of the setup and viewer.
 */
import type { SKRSContext2D } from '@napi-rs/canvas';
import type { Projection } from '../geometry/projection.js';
import { isInsideFrame, pixelAtFieldPoint } from '../geometry/view-map.js';
import type { LinearRgb } from '../image/plane.js';
import { linearToRgba8 } from '../io/encode-png.js';
import { canvasRgba, drawGazeMarker, font, haloText, newCanvas, putRgba } from './canvas.js';

/** Eccentricities marked by rings, deg. */
export const RING_ECCENTRICITIES_DEG = [2, 5, 10, 20, 30] as const;

export interface CompareInput {
  frame: LinearRgb;
  percept: LinearRgb;
  projection: Projection;
  gazePx: [number, number];
  caption: string;
  caution: string;
}

export function renderCompare(input: CompareInput): { rgba: Uint8ClampedArray; width: number; height: number } {
  const { frame, percept, gazePx } = input;
  const { width, height } = frame;
  const gap = Math.max(8, Math.round(width / 200));
  const text = Math.max(13, Math.round(width / 90));
  const header = Math.round(text * 4.4);
  const { canvas, g } = newCanvas(2 * width + gap, height + header);
  g.fillStyle = '#15171c';
  g.fillRect(0, 0, canvas.width, canvas.height);
  putRgba(g, linearToRgba8(frame), width, height, 0, header);
  putRgba(g, linearToRgba8(percept), width, height, width + gap, header);
  for (const offsetX of [0, width + gap]) {
    g.save();
    g.beginPath();
    g.rect(offsetX, header, width, height);
    g.clip();
    drawRings(g, input.projection, gazePx, offsetX, header, text);
    drawGazeMarker(g, offsetX + gazePx[0] + 0.5, header + gazePx[1] + 0.5, text * 0.8);
    g.restore();
  }
  g.fillStyle = '#f0f0f0';
  g.font = font(text * 1.05, true);
  g.fillText('Frame as displayed', text * 0.6, text * 1.5);
  g.fillText('What this viewer resolves (gaze fixed at the ring)', width + gap + text * 0.6, text * 1.5);
  g.font = font(text * 0.9);
  g.fillStyle = '#cfd4dc';
  g.fillText(input.caption, text * 0.6, text * 2.8);
  g.fillStyle = '#9aa3b0';
  g.font = font(text * 0.75);
  g.fillText(input.caution, text * 0.6, text * 3.9);
  return { rgba: canvasRgba(canvas), width: canvas.width, height: canvas.height };
}

/** Iso-eccentricity rings traced through the display's projection, labelled where they cross the upper right. */
function drawRings(g: SKRSContext2D, projection: Projection, gaze: [number, number], ox: number, oy: number, text: number): void {
  for (const e of RING_ECCENTRICITIES_DEG) {
    const points: ([number, number] | undefined)[] = [];
    for (let m = 0; m <= 360; m += 2) points.push(pixelAtFieldPoint(projection, gaze, e, m));
    for (const [colour, lineWidth] of [['rgba(0,0,0,0.6)', 3], ['rgba(255,255,255,0.85)', 1.4]] as const) {
      g.strokeStyle = colour;
      g.lineWidth = lineWidth;
      g.setLineDash([6, 5]);
      g.beginPath();
      let pen = false;
      for (const p of points) {
        if (!p) {
          pen = false;
          continue;
        }
        if (pen) g.lineTo(ox + p[0], oy + p[1]);
        else g.moveTo(ox + p[0], oy + p[1]);
        pen = true;
      }
      g.stroke();
      g.setLineDash([]);
    }
    const at = pixelAtFieldPoint(projection, gaze, e, 45);
    if (isInsideFrame(projection, at)) haloText(g, `${e}°`, ox + at[0] + 3, oy + at[1] - 3, text * 0.9);
  }
}
