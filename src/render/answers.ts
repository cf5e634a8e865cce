/**
 * Pictures of the answers: reach.png (where the gaze may be for each glance label to be read) and
 * audience.png (the share of an audience that reads text of each capital height). Colours are from
 * the Okabe–Ito palette (colour-blind safe, common practice), and every line also carries its name.
 */
import type { LabelVerdict } from '../analysis/labels.js';
import { canvasRgba, drawGazeMarker, drawPictureHeader, font, haloText, newCanvas, putRgba, wrapText } from './canvas.js';

/** Okabe & Ito (2008) colour-blind-safe palette, without black. */
const PALETTE = ['#E69F00', '#56B4E9', '#009E73', '#F0E442', '#0072B2', '#D55E00', '#CC79A7'];

export interface ReachInput {
  width: number;
  height: number;
  frameRgba: Uint8ClampedArray;
  gazePx: [number, number];
  labels?: readonly LabelVerdict[];
  caption: string;
  caution: string;
}

/** The frame dimmed, each glance label's reach outlined and named, the gaze marked. */
export function renderReach(input: ReachInput): { rgba: Uint8ClampedArray; width: number; height: number } {
  const { width, height } = input;
  const text = Math.max(13, Math.round(width / 90));
  const header = Math.round(text * 4.4);
  const { canvas, g } = newCanvas(width, height + header);
  g.fillStyle = '#15171c';
  g.fillRect(0, 0, canvas.width, canvas.height);
  putRgba(g, input.frameRgba, width, height, 0, header);
  g.fillStyle = 'rgba(21,23,28,0.55)';
  g.fillRect(0, header, width, height);
  const glance = (input.labels ?? []).filter((l) => l.reach?.outlinePx);
  g.save();
  g.beginPath();
  g.rect(0, header, width, height);
  g.clip();
  glance.forEach((l, i) => {
    const colour = PALETTE[i % PALETTE.length];
    const outline = l.reach!.outlinePx!;
    const reachable = l.reach!.radiusDeg.some((r) => r > 0);
    const [bx, by, bw, bh] = l.boxPx;
    g.strokeStyle = colour;
    g.lineWidth = 2;
    g.strokeRect(bx, header + by, bw, bh);
    if (reachable) {
      g.fillStyle = `${colour}33`;
      g.beginPath();
      outline.forEach(([x, y], k) => (k === 0 ? g.moveTo(x, header + y) : g.lineTo(x, header + y)));
      g.closePath();
      g.fill();
      g.lineWidth = Math.max(2, text / 6);
      g.setLineDash(i % 2 ? [text * 0.6, text * 0.3] : []);
      g.stroke();
      g.setLineDash([]);
    }
    const farthest = Math.max(...l.reach!.radiusDeg);
    const tag = reachable ? `${l.id}: gaze up to ${farthest.toFixed(1)}° away` : `${l.id}: needs the eyes to move to it`;
    haloText(g, tag, Math.min(bx, width - text * 18), header + Math.max(text * 1.2, by - text * 0.4), text * 0.8, colour);
  });
  drawGazeMarker(g, input.gazePx[0] + 0.5, header + input.gazePx[1] + 0.5, text * 0.8);
  g.restore();
  const title = glance.length
    ? 'Reach: where the gaze can rest for each glance label to be read without moving the eyes (size, crowding, contrast)'
    : 'Reach: no glance labels — give labels "role": "glance" to see where they can be read from';
  drawPictureHeader(g, text, [[title, text * 0.6]], input.caption, input.caution);
  return { rgba: canvasRgba(canvas), width: canvas.width, height: canvas.height };
}

export interface AudienceCurve {
  name: string;
  /** Share (0–1) by capital height, frame px, in increasing height. */
  points: [number, number][];
}

export interface AudienceChartInput {
  curves: AudienceCurve[];
  /** Capital heights of the frame's labels (judged when looked at), px, with ids. */
  labels: { id: string; px: number }[];
  arcminPerPx: number;
  title: string;
  caption: string;
  caution: string;
}

/** Share of the audience that reads text when looking at it, against capital height. */
export function renderAudienceChart(input: AudienceChartInput): { rgba: Uint8ClampedArray; width: number; height: number } {
  const width = 1200;
  const height = 720;
  const text = 16;
  const { canvas, g } = newCanvas(width, height);
  g.fillStyle = '#15171c';
  g.fillRect(0, 0, width, height);
  const left = 90;
  const right = width - 40;
  const top = 128;
  const bottom = height - 130;
  const maxPx = Math.max(...input.curves.flatMap((c) => c.points.map((p) => p[0])));
  const x = (px: number): number => left + (px / maxPx) * (right - left);
  const y = (share: number): number => bottom - share * (bottom - top);
  g.strokeStyle = '#3a3f48';
  g.lineWidth = 1;
  g.font = font(text * 0.85);
  g.fillStyle = '#cfd4dc';
  for (let s = 0; s <= 100; s += 20) {
    g.beginPath();
    g.moveTo(left, y(s / 100));
    g.lineTo(right, y(s / 100));
    g.stroke();
    g.fillText(`${s} %`, left - 52, y(s / 100) + 5);
  }
  const step = niceStep(maxPx / 8);
  for (let px = 0; px <= maxPx + 1e-9; px += step) {
    g.beginPath();
    g.moveTo(x(px), bottom);
    g.lineTo(x(px), bottom + 6);
    g.stroke();
    g.fillText(`${px}`, x(px) - 8, bottom + 24);
    g.fillStyle = '#8d96a3';
    g.fillText(`${(px * input.arcminPerPx).toFixed(0)}′`, x(px) - 8, bottom + 44);
    g.fillStyle = '#cfd4dc';
  }
  g.fillText('capital height, px of the frame (′ = arcmin)', left, bottom + 72);
  for (const l of input.labels) {
    if (l.px > maxPx) continue;
    g.strokeStyle = 'rgba(255,255,255,0.25)';
    g.beginPath();
    g.moveTo(x(l.px), top);
    g.lineTo(x(l.px), bottom);
    g.stroke();
  }
  input.curves.forEach((c, i) => {
    const colour = PALETTE[i === 0 ? 0 : i === 1 ? 1 : 4 + (i % 3)];
    g.strokeStyle = colour;
    g.lineWidth = 3;
    g.setLineDash(i % 2 ? [10, 6] : []);
    g.beginPath();
    c.points.forEach(([px, s], k) => (k === 0 ? g.moveTo(x(px), y(s)) : g.lineTo(x(px), y(s))));
    g.stroke();
    g.setLineDash([]);
    // The name at the curve's middle, on the curve.
    const mid = c.points.find((p) => p[1] >= 0.5) ?? c.points[c.points.length - 1];
    haloText(g, c.name, x(mid[0]) + 8, y(mid[1]) + (i % 2 ? 22 : -10), text, colour);
  });
  g.fillStyle = '#f0f0f0';
  g.font = font(text * 1.2, true);
  g.fillText(input.title, 20, 34);
  g.font = font(text * 0.85);
  g.fillStyle = '#cfd4dc';
  wrapText(g, input.caption, 20, 60, width - 40, text * 1.15);
  g.fillStyle = '#9aa3b0';
  g.font = font(text * 0.75);
  g.fillText(`Faint vertical lines: the capital heights of this frame's labels. ${input.caution}`, 20, height - 18);
  return { rgba: canvasRgba(canvas), width, height };
}

function niceStep(raw: number): number {
  const p = 10 ** Math.floor(Math.log10(Math.max(raw, 1e-9)));
  for (const m of [1, 2, 5, 10]) if (m * p >= raw) return m * p;
  return 10 * p;
}

