/**
 * compare.png: the frame as displayed (with the label verdicts outlined) and the viewer's percept side by side, with eccentricity rings
 * around the gaze, the gaze marker and a caption of the setup and viewer.
 */
import type { SKRSContext2D } from '@napi-rs/canvas';
import type { Projection } from '../geometry/projection.js';
import { isInsideFrame, pixelAtFieldPoint } from '../geometry/view-map.js';
import { canvasRgba, drawGazeMarker, drawPictureHeader, haloText, newCanvas, putRgba } from './canvas.js';
import { drawLabelBoxes } from './detail-map.js';
import type { LabelVerdict } from '../analysis/labels.js';

/** Eccentricities marked by rings, deg. */
export const RING_ECCENTRICITIES_DEG = [2, 5, 10, 20, 30] as const;

export interface CompareInput {
  width: number;
  height: number;
  /** The frame and the percept as 8-bit sRGB RGBA (encoded once by the caller). */
  frameRgba: Uint8ClampedArray;
  perceptRgba: Uint8ClampedArray;
  projection: Projection;
  gazePx: [number, number];
  caption: string;
  caution: string;
  /** Title over the percept, saying what it shows. */
  perceptTitle: string;
  /** Label verdicts, outlined on the frame as on the detail map. */
  labels?: readonly LabelVerdict[];
  /** The viewing eye's blind spot, outlined on the percept. */
  blindSpot?: { eye: string; centreFieldDeg: [number, number]; widthDeg: number; heightDeg: number };
}

export function renderCompare(input: CompareInput): { rgba: Uint8ClampedArray; width: number; height: number } {
  const { gazePx, width, height } = input;
  const gap = Math.max(8, Math.round(width / 200));
  const text = Math.max(13, Math.round(width / 90));
  const header = Math.round(text * 4.4);
  const { canvas, g } = newCanvas(2 * width + gap, height + header);
  g.fillStyle = '#15171c';
  g.fillRect(0, 0, canvas.width, canvas.height);
  putRgba(g, input.frameRgba, width, height, 0, header);
  putRgba(g, input.perceptRgba, width, height, width + gap, header);
  for (const offsetX of [0, width + gap]) {
    g.save();
    g.beginPath();
    g.rect(offsetX, header, width, height);
    g.clip();
    drawRings(g, input.projection, gazePx, offsetX, header, text);
    if (input.blindSpot && offsetX > 0) drawBlindSpot(g, input.projection, gazePx, input.blindSpot, offsetX, header, text);
    drawGazeMarker(g, offsetX + gazePx[0] + 0.5, header + gazePx[1] + 0.5, text * 0.8);
    g.restore();
  }
  if (input.labels) drawLabelBoxes(g, input.labels, text, width, height, 0, header);
  drawPictureHeader(g, text, [['Frame as displayed', text * 0.6], [input.perceptTitle, width + gap + text * 0.6]], input.caption, input.caution);
  return { rgba: canvasRgba(canvas), width: canvas.width, height: canvas.height };
}

/** The blind spot's outline traced through the projection, dotted, with its name. */
function drawBlindSpot(g: SKRSContext2D, projection: Projection, gaze: [number, number], spot: NonNullable<CompareInput['blindSpot']>, ox: number, oy: number, text: number): void {
  const points: [number, number][] = [];
  for (let t = 0; t <= 360; t += 4) {
    const x = spot.centreFieldDeg[0] + (spot.widthDeg / 2) * Math.cos((t * Math.PI) / 180);
    const y = spot.centreFieldDeg[1] + (spot.heightDeg / 2) * Math.sin((t * Math.PI) / 180);
    const p = pixelAtFieldPoint(projection, gaze, Math.hypot(x, y), (Math.atan2(y, x) * 180) / Math.PI);
    if (p) points.push(p);
  }
  if (points.length < 3) return;
  for (const [colour, width] of [['rgba(0,0,0,0.7)', 3.5], ['#ffd166', 1.8]] as const) {
    g.strokeStyle = colour;
    g.lineWidth = width;
    g.setLineDash([2, 4]);
    g.beginPath();
    points.forEach(([x, y], i) => (i === 0 ? g.moveTo(ox + x, oy + y) : g.lineTo(ox + x, oy + y)));
    g.stroke();
    g.setLineDash([]);
  }
  const top = points.reduce((a, b) => (b[1] < a[1] ? b : a));
  haloText(g, `blind spot (${spot.eye} eye), filled in`, ox + top[0] - text * 5, oy + top[1] - text * 0.5, text * 0.8, '#ffd166');
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
    // The label where the ring is inside the frame, trying the diagonals first, then any direction.
    const margin = text * 0.8;
    const inside = (p: [number, number] | undefined): p is [number, number] => isInsideFrame(projection, p) && p[0] > margin && p[1] > margin && p[0] < projection.widthPx - 3 * margin && p[1] < projection.heightPx - margin;
    for (const m of [45, 135, 315, 225, ...Array.from({ length: 72 }, (_, k) => k * 5)]) {
      const at = pixelAtFieldPoint(projection, gaze, e, m);
      if (!inside(at)) continue;
      haloText(g, `${e}°`, ox + at[0] + 3, oy + at[1] - 3, text * 0.9);
      break;
    }
  }
}
