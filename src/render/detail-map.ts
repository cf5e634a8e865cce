/**
 * detail-map.png: the smallest legible letter height at every place, on a fixed log viridis scale in arcmin
 * over a faint copy of the frame, with labelled contour lines, the gaze marker and a legend in px
 * and arcmin.
 */
import type { SKRSContext2D } from '@napi-rs/canvas';
import { countedJudgement, type LabelVerdict } from '../analysis/labels.js';
import { canvasRgba, drawGazeMarker, font, haloText, newCanvas, putRgba, wrapText } from './canvas.js';
import { logScale, niceLogTicks, viridisTable } from './colour-scale.js';

export interface DetailMapInput {
  width: number;
  height: number;
  /** The frame as 8-bit sRGB RGBA, shown under the map. */
  frameRgba: Uint8ClampedArray;
  smallestLetterPx: Float32Array;
  /** Angular size of each frame pixel, arcmin: the map's colours are in arcmin, the same for every run. */
  arcminPerPx: Float32Array;
  gazePx: [number, number];
  arcminPerPxAtGaze: number;
  /** The frame's own smallest letter (px); where the map sits at it, the pixels and not the eye are the limit. */
  frameMinLetterPx: number;
  /** Label verdicts to outline on the map. */
  labels?: readonly LabelVerdict[];
  title: string;
}

/**
 * The map's fixed colour scale: capital heights from 4′ (logMAR −0.1, the best young fovea) to 240′
 * (4°, far periphery), logarithmic, so that one colour means one angular size in every run and two
 * viewers' maps can be compared side by side. Contours at fixed heights.
 */
export const DETAIL_SCALE_ARCMIN: readonly [number, number] = [4, 240];
export const DETAIL_CONTOURS_ARCMIN = [5, 10, 20, 40, 80, 160] as const;

/** Share of the frame's grey shown under the colour, so the layout stays recognisable. */
const FRAME_UNDERLAY = 0.35;

export function renderDetailMap(input: DetailMapInput): { rgba: Uint8ClampedArray; width: number; height: number } {
  const { smallestLetterPx: letter, arcminPerPx, gazePx, width, height, frameRgba } = input;
  const n = width * height;
  // The map in arcmin (infinite in the blind spot).
  const arcmin = new Float32Array(n);
  let minPx = Infinity;
  for (let i = 0; i < n; i++) {
    arcmin[i] = letter[i] * arcminPerPx[i];
    if (Number.isFinite(letter[i]) && letter[i] < minPx) minPx = letter[i];
  }
  const hasBlindSpot = letter.some((v) => !Number.isFinite(v));
  const scale = logScale(DETAIL_SCALE_ARCMIN[0], DETAIL_SCALE_ARCMIN[1]);
  const lut = viridisTable();
  const rgba = new Uint8ClampedArray(n * 4);
  const luma = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    const grey = (frameRgba[i * 4] + frameRgba[i * 4 + 1] + frameRgba[i * 4 + 2]) / 3;
    luma[i] = grey;
    if (!Number.isFinite(letter[i])) {
      // Blind spot: dark diagonal hatching, nothing is seen there.
      const x = i % width;
      const y = (i - x) / width;
      const v = (x + y) % 12 < 3 ? 120 : 40;
      rgba[i * 4] = rgba[i * 4 + 1] = rgba[i * 4 + 2] = v;
      rgba[i * 4 + 3] = 255;
      continue;
    }
    const c = Math.round(scale(arcmin[i]) * 255) * 3;
    for (let k = 0; k < 3; k++) rgba[i * 4 + k] = (1 - FRAME_UNDERLAY) * lut[c + k] + FRAME_UNDERLAY * grey;
    rgba[i * 4 + 3] = 255;
  }
  const thickness = Math.max(1, Math.round(width / 1200));
  for (const level of DETAIL_CONTOURS_ARCMIN) drawContour(rgba, arcmin, width, height, level, thickness);

  const text = Math.max(12, Math.round(width / 90));
  const legendHeight = Math.round(text * (input.labels?.length ? 9.4 : 8.2));
  const { canvas, g } = newCanvas(width, height + legendHeight);
  putRgba(g, rgba, width, height, 0, 0);
  // Contour labels where the frame under them is emptiest, never on one another.
  const placed: [number, number, number, number][] = [];
  g.font = font(text, true);
  for (const level of DETAIL_CONTOURS_ARCMIN) {
    const tag = `${level}′ · ${formatPx(level / input.arcminPerPxAtGaze)} px`;
    const w = g.measureText(tag).width + 8;
    const h = text * 1.3;
    let best: { x: number; y: number; busy: number } | undefined;
    for (const [x, y] of contourCrossings(arcmin, width, height, gazePx, level)) {
      const rect: [number, number, number, number] = [x + 4, y - h, w, h];
      if (rect[0] + w > width || rect[1] < 0 || placed.some((p) => rect[0] < p[0] + p[2] && p[0] < rect[0] + rect[2] && rect[1] < p[1] + p[3] && p[1] < rect[1] + rect[3])) continue;
      const busy = busyness(luma, width, rect);
      if (!best || busy < best.busy) best = { x, y, busy };
    }
    if (!best) continue;
    placed.push([best.x + 4, best.y - h, w, h]);
    haloText(g, tag, best.x + 8, best.y - text * 0.3, text);
  }
  if (input.labels) drawLabelBoxes(g, input.labels, text, width, height);
  drawGazeMarker(g, gazePx[0] + 0.5, gazePx[1] + 0.5, text * 0.8);
  const pixelLimited = minPx <= input.frameMinLetterPx * 1.0001;
  drawLegend(g, { y: height, width, height: legendHeight, text, scale, ticks: [...DETAIL_CONTOURS_ARCMIN], arcminPerPx: input.arcminPerPxAtGaze, title: input.title, pixelLimited, frameMinLetterPx: input.frameMinLetterPx, hasLabels: Boolean(input.labels?.length), hasBlindSpot });
  return { rgba: canvasRgba(canvas), width: canvas.width, height: canvas.height };
}

function formatPx(v: number): string {
  return v >= 10 ? v.toFixed(0) : v.toFixed(1).replace(/\.0$/, '');
}

/** Standard deviation of the frame's grey in a rectangle: low where a label would cover nothing. */
function busyness(luma: Float32Array, width: number, rect: readonly number[]): number {
  const height = luma.length / width;
  let sum = 0;
  let sum2 = 0;
  let count = 0;
  for (let y = Math.max(0, Math.floor(rect[1])); y < Math.min(height, rect[1] + rect[3]); y += 2) {
    for (let x = Math.max(0, Math.floor(rect[0])); x < Math.min(width, rect[0] + rect[2]); x += 2) {
      const v = luma[y * width + x];
      sum += v;
      sum2 += v * v;
      count++;
    }
  }
  return count ? Math.sqrt(Math.max(0, sum2 / count - (sum / count) ** 2)) : Infinity;
}

/** Marks pixels below `level` that touch a pixel at or above it, in white with a dark edge. */
function drawContour(rgba: Uint8ClampedArray, map: Float32Array, width: number, height: number, level: number, thickness: number): void {
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      if (map[i] >= level || !Number.isFinite(map[i])) continue;
      const edge = (x > 0 && map[i - 1] >= level) || (x < width - 1 && map[i + 1] >= level) || (y > 0 && map[i - width] >= level) || (y < height - 1 && map[i + width] >= level);
      if (!edge) continue;
      for (let dy = 0; dy < thickness; dy++) {
        for (let dx = 0; dx < thickness; dx++) {
          const xx = Math.min(width - 1, x + dx);
          const yy = Math.min(height - 1, y + dy);
          const j = (yy * width + xx) * 4;
          rgba[j] = rgba[j + 1] = rgba[j + 2] = 255;
        }
      }
    }
  }
}

/** Where a contour crosses rays from the gaze (every 15°): candidate places for its label. */
function contourCrossings(map: Float32Array, width: number, height: number, gaze: [number, number], level: number): [number, number][] {
  const out: [number, number][] = [];
  // A contour around the gaze exists only where the gaze itself is below the level.
  const atGaze = map[Math.min(height - 1, Math.max(0, Math.round(gaze[1]))) * width + Math.min(width - 1, Math.max(0, Math.round(gaze[0])))];
  if (!(atGaze < level)) return out;
  for (let angleDeg = 0; angleDeg < 360; angleDeg += 15) {
    const dx = Math.cos((angleDeg * Math.PI) / 180);
    const dy = Math.sin((angleDeg * Math.PI) / 180);
    for (let r = 1; ; r++) {
      const x = Math.round(gaze[0] + dx * r);
      const y = Math.round(gaze[1] + dy * r);
      if (x < 0 || y < 0 || x >= width || y >= height) break;
      if (map[y * width + x] >= level && Number.isFinite(map[y * width + x])) {
        out.push([x, y]);
        break;
      }
    }
  }
  return out;
}

interface LegendLayout {
  y: number;
  width: number;
  height: number;
  text: number;
  scale: (v: number) => number;
  ticks: number[];
  arcminPerPx: number;
  title: string;
  pixelLimited: boolean;
  frameMinLetterPx: number;
  hasLabels: boolean;
  hasBlindSpot: boolean;
}

/** Colour of boxes around labels that fail (told apart by line weight and a tag too, not by colour alone). */
const FAIL_COLOUR = '#ff4d8d';

/**
 * Label outlines showing each label's verdict by its role (the same as the report and the terminal):
 * solid white = passes (readable), dashed = legible but one limit not met, thick pink with a tag
 * naming the limit = not legible, dotted grey = decorative. Tags are placed above, below or beside
 * the box where they collide with no other tag; where none is free the box keeps its outline only.
 */
export function drawLabelBoxes(g: SKRSContext2D, labels: readonly LabelVerdict[], text: number, width: number, height: number, offsetX = 0, offsetY = 0): void {
  const placed: [number, number, number, number][] = [];
  const overlaps = (r: [number, number, number, number]): boolean => placed.some((p) => r[0] < p[0] + p[2] && p[0] < r[0] + r[2] && r[1] < p[1] + p[3] && p[1] < r[1] + r[3]);
  for (const l of labels) {
    const [bx, by, w, h] = l.boxPx;
    const x = bx + offsetX;
    const y = by + offsetY;
    const pad = 3;
    const failing = l.verdict === 'not legible';
    g.setLineDash(l.verdict === 'legible' ? [6, 4] : l.verdict === 'not judged' ? [2, 3] : []);
    g.lineWidth = failing ? 3 : 1.5;
    g.strokeStyle = failing ? FAIL_COLOUR : l.verdict === 'not judged' ? '#9aa3ad' : '#ffffff';
    g.strokeRect(x - pad, y - pad, w + 2 * pad, h + 2 * pad);
    g.setLineDash([]);
    if (l.passes !== false) continue;
    const judgement = countedJudgement(l);
    const tag = `${failing ? '×' : '–'} ${judgement.limitedBy}${l.role === 'glance' ? ' from gaze' : ''}`;
    const size = text * 0.75;
    g.font = font(size);
    const tw = g.measureText(tag).width + 4;
    const th = size * 1.2;
    const spots: [number, number][] = [[x - pad, y - pad - 4], [x - pad, y + h + pad + th], [x + w + pad + 4, y + th * 0.8], [x - pad - tw - 4, y + th * 0.8]];
    for (const [tx, ty] of spots) {
      const rect: [number, number, number, number] = [tx, ty - th, tw, th];
      if (tx < offsetX || ty - th < offsetY || tx + tw > offsetX + width || ty > offsetY + height || overlaps(rect)) continue;
      placed.push(rect);
      haloText(g, tag, tx, ty, size, failing ? FAIL_COLOUR : '#ffffff');
      break;
    }
  }
}

function drawLegend(g: SKRSContext2D, l: LegendLayout): void {
  g.fillStyle = '#15171c';
  g.fillRect(0, l.y, l.width, l.height);
  const pad = l.text;
  const barX = pad;
  const barW = Math.min(l.width - 2 * pad, l.text * 45);
  const barY = l.y + l.text * 2.2;
  const barH = l.text * 1.1;
  const lut = viridisTable();
  for (let x = 0; x < barW; x++) {
    const c = Math.round((x / (barW - 1)) * 255) * 3;
    g.fillStyle = `rgb(${lut[c]},${lut[c + 1]},${lut[c + 2]})`;
    g.fillRect(barX + x, barY, 1, barH);
  }
  g.fillStyle = '#e8e8e8';
  g.font = font(l.text, true);
  g.fillText(l.title, pad, l.y + l.text * 1.5);
  g.font = font(l.text * 0.9);
  // Ticks in arcmin (the fixed scale) with their px at the gaze below; never clipped at either end.
  const within = (x: number, w: number): number => Math.max(pad, Math.min(x - w / 2, l.width - pad - w));
  for (const t of l.ticks) {
    const x = barX + l.scale(t) * (barW - 1);
    g.fillRect(x, barY + barH, 1, l.text * 0.4);
    const arcmin = `${t}′`;
    const px = `${formatPx(t / l.arcminPerPx)} px`;
    g.fillText(arcmin, within(x, g.measureText(arcmin).width), barY + barH + l.text * 1.4);
    g.fillStyle = '#a8b0bc';
    g.fillText(px, within(x, g.measureText(px).width), barY + barH + l.text * 2.5);
    g.fillStyle = '#e8e8e8';
  }
  g.fillStyle = '#a8b0bc';
  g.font = font(l.text * 0.75);
  const ends = `${DETAIL_SCALE_ARCMIN[0]}′ … ${DETAIL_SCALE_ARCMIN[1]}′, the same scale in every run`;
  if (barX + barW + pad + g.measureText(ends).width < l.width - pad) g.fillText(ends, barX + barW + pad, barY + barH * 0.8);
  g.fillStyle = '#e8e8e8';
  const floor = l.pixelLimited ? ` Where the map shows ${formatPx(l.frameMinLetterPx)} px the frame's pixels, not the eye, are the limit.` : '';
  const boxes = l.hasLabels ? ` Label boxes show each label's verdict by its role (glance: from the gaze; look: when looked at), judged on size, crowding, contrast and the blind spot: solid white = readable, dashed = legible with a limit not met (tagged), thick pink = not legible (tagged with the limit), dotted = decorative. The colours show size only; crowding cannot be seen in the picture.` : '';
  const blind = l.hasBlindSpot ? ' Hatched: the blind spot of the viewing eye.' : '';
  const note = `Smallest legible capital height in arcmin (px of the frame at the gaze below, ${l.arcminPerPx.toFixed(2)}′ per px). White lines: contours at the ticks. Ring: gaze.${floor}${blind}${boxes}`;
  g.font = font(l.text * 0.8);
  g.fillStyle = '#cfd4dc';
  wrapText(g, note, pad, barY + barH + l.text * 3.7, l.width - 2 * pad, l.text * 1.05);
}

