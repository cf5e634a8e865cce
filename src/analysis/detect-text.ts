/**
 * Finds runs of text in a rendered frame, so a proof can judge labels without a hand-made labels
 * file. Our method, built from common image-analysis steps:
 * 1. local contrast: a pixel is dark ink where its luma is below the mean of a window around it by
 *    more than a threshold, light ink where above (both polarities: dark text on light panels and
 *    light text on dark ones), with integral images (Viola & Jones 2001) for the window means;
 * 2. connected components (8-neighbour, union–find) of each polarity, keeping glyph-sized ones:
 *    between MIN_GLYPH_PX and MAX_GLYPH_PX high, not long thin rules or rings;
 * 3. glyphs grouped into lines: same polarity, vertical overlap, similar height, and a horizontal gap
 *    under GAP_PER_HEIGHT of the line's height;
 * 4. per line: the box; the baseline as the median glyph bottom; the capital height as the median
 *    height above the baseline of the tallest glyphs standing on it (capitals, digits, ascenders —
 *    ascenders are a few per cent taller than capitals in most faces); the characters counted as
 *    glyphs plus word spaces; a confidence from the number of glyphs and the regularity of their
 *    heights and baselines.
 * Runs of one glyph are not reported (marks and drawing fragments look alike). Text cannot be read back (no OCR): a detected run has `text: ""` and a character count, and the
 * labels file written from it is for the user to correct, name and give roles.
 */
import type { Label } from './labels.js';

const WINDOW_PX = 41;
/** Difference from the window's mean luma (0–1, sRGB-encoded) that marks ink. */
const INK_THRESHOLD = 0.08;
const MIN_GLYPH_PX = 4;
const MAX_GLYPH_PX = 240;
const GAP_PER_HEIGHT = 1.3;

export interface DetectedRun extends Label {
  characters: number;
  /** 0–1: how much the run looks like a line of text. */
  confidence: number;
  polarity: 'dark on light' | 'light on dark';
}

interface Box {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
  pixels: number;
}

/** Luma (0–1) of sRGB-encoded 8-bit RGBA. */
function lumaOf(rgba: Uint8Array | Uint8ClampedArray, n: number): Float32Array {
  const out = new Float32Array(n);
  for (let i = 0; i < n; i++) out[i] = (0.2126 * rgba[4 * i] + 0.7152 * rgba[4 * i + 1] + 0.0722 * rgba[4 * i + 2]) / 255;
  return out;
}

/** Mean of a square window around every pixel (clamped at the edges), from an integral image. */
function windowMeans(luma: Float32Array, width: number, height: number, size: number): Float32Array {
  const w1 = width + 1;
  const sat = new Float64Array(w1 * (height + 1));
  for (let y = 0; y < height; y++) {
    let row = 0;
    for (let x = 0; x < width; x++) {
      row += luma[y * width + x];
      sat[(y + 1) * w1 + x + 1] = sat[y * w1 + x + 1] + row;
    }
  }
  const r = size >> 1;
  const out = new Float32Array(width * height);
  for (let y = 0; y < height; y++) {
    const ya = Math.max(0, y - r);
    const yb = Math.min(height, y + r + 1);
    for (let x = 0; x < width; x++) {
      const xa = Math.max(0, x - r);
      const xb = Math.min(width, x + r + 1);
      const sum = sat[yb * w1 + xb] - sat[ya * w1 + xb] - sat[yb * w1 + xa] + sat[ya * w1 + xa];
      out[y * width + x] = sum / ((yb - ya) * (xb - xa));
    }
  }
  return out;
}

/** Bounding boxes of the 8-connected components of a mask (union–find over runs of one row). */
function components(mask: Uint8Array, width: number, height: number): Box[] {
  const label = new Int32Array(width * height).fill(-1);
  const parent: number[] = [];
  const find = (a: number): number => {
    while (parent[a] !== a) a = parent[a] = parent[parent[a]];
    return a;
  };
  const union = (a: number, b: number): void => {
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
  };
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      if (!mask[i]) continue;
      let l = -1;
      const neighbours = [x > 0 ? i - 1 : -1, y > 0 && x > 0 ? i - width - 1 : -1, y > 0 ? i - width : -1, y > 0 && x < width - 1 ? i - width + 1 : -1];
      for (const n of neighbours) {
        if (n < 0 || label[n] < 0) continue;
        if (l < 0) l = label[n];
        else union(l, label[n]);
      }
      if (l < 0) {
        l = parent.length;
        parent.push(l);
      }
      label[i] = l;
    }
  }
  const boxes = new Map<number, Box>();
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const l = label[y * width + x];
      if (l < 0) continue;
      const root = find(l);
      const b = boxes.get(root);
      if (!b) boxes.set(root, { x0: x, y0: y, x1: x + 1, y1: y + 1, pixels: 1 });
      else {
        if (x < b.x0) b.x0 = x;
        if (x + 1 > b.x1) b.x1 = x + 1;
        if (y + 1 > b.y1) b.y1 = y + 1;
        b.pixels++;
      }
    }
  }
  return [...boxes.values()];
}

function isGlyph(b: Box): boolean {
  const w = b.x1 - b.x0;
  const h = b.y1 - b.y0;
  if (h > MAX_GLYPH_PX || w > MAX_GLYPH_PX * 1.5) return false;
  if (Math.max(w, h) < MIN_GLYPH_PX && b.pixels < 4) return false;
  // Rules and frame edges: long and thin.
  if (w > 8 * h && w > 40) return false;
  if (h > 8 * w && h > 40) return false;
  // Rings and outlines: large and nearly empty.
  if (w * h > 2500 && b.pixels < 0.06 * w * h) return false;
  return true;
}

const median = (values: number[]): number => {
  const s = [...values].sort((a, b) => a - b);
  return s.length ? (s[(s.length - 1) >> 1] + s[s.length >> 1]) / 2 : 0;
};

/**
 * The capital height among the heights above the baseline: the tallest height class that several
 * glyphs share (within ±8 %: capitals, digits and ascenders), so one tall icon or symbol does not set
 * it; the tallest height when no class is shared (one or two glyphs).
 */
function capHeightOf(heights: number[]): number {
  const desc = [...heights].sort((a, b) => b - a);
  const needed = Math.max(2, Math.ceil(0.15 * heights.length));
  for (const h of desc) {
    const near = heights.filter((v) => v >= 0.92 * h && v <= 1.08 * h);
    if (near.length >= needed) return median(near);
  }
  return desc[0];
}

/** Groups glyph boxes of one polarity into lines of text. */
function linesOf(glyphs: Box[]): Box[][] {
  const sorted = [...glyphs].sort((a, b) => a.x0 - b.x0);
  const lines: { boxes: Box[]; y0: number; y1: number; x1: number; height: number }[] = [];
  for (const g of sorted) {
    const h = g.y1 - g.y0;
    let best: (typeof lines)[number] | undefined;
    for (const line of lines) {
      const overlap = Math.min(line.y1, g.y1) - Math.max(line.y0, g.y0);
      const gap = g.x0 - line.x1;
      // Small marks (dots, degree signs, accents) join a line they overlap; glyphs must be of a similar height.
      const similar = h >= 0.3 * line.height && h <= 2.2 * line.height;
      const small = h < 0.5 * line.height && overlap > 0;
      if (overlap >= 0.5 * Math.min(h, line.height) && gap <= GAP_PER_HEIGHT * line.height && gap > -line.height && (similar || small)) {
        best = line;
        break;
      }
    }
    if (best) {
      best.boxes.push(g);
      best.y0 = Math.min(best.y0, g.y0);
      best.y1 = Math.max(best.y1, g.y1);
      best.x1 = Math.max(best.x1, g.x1);
      best.height = Math.max(best.height, h);
    } else lines.push({ boxes: [g], y0: g.y0, y1: g.y1, x1: g.x1, height: h });
  }
  return lines.map((l) => l.boxes);
}

function runOf(boxes: Box[], polarity: DetectedRun['polarity'], index: number): DetectedRun | undefined {
  const x0 = Math.min(...boxes.map((b) => b.x0));
  const x1 = Math.max(...boxes.map((b) => b.x1));
  const y0 = Math.min(...boxes.map((b) => b.y0));
  const y1 = Math.max(...boxes.map((b) => b.y1));
  const tall = Math.max(...boxes.map((b) => b.y1 - b.y0));
  const glyphs = boxes.filter((b) => b.y1 - b.y0 >= 0.45 * tall);
  if (glyphs.length === 0) return undefined;
  const baseline = median(glyphs.map((b) => b.y1));
  const onBaseline = glyphs.filter((b) => Math.abs(b.y1 - baseline) <= Math.max(1, 0.08 * tall));
  const heights = onBaseline.map((b) => baseline - b.y0);
  const top = Math.max(...heights);
  const capHeight = capHeightOf(heights);
  if (!(capHeight >= MIN_GLYPH_PX)) return undefined;
  // Characters: glyphs (small marks count once each) plus a space for each wide gap.
  const ordered = [...boxes].sort((a, b) => a.x0 - b.x0);
  let spaces = 0;
  for (let k = 1; k < ordered.length; k++) if (ordered[k].x0 - ordered[k - 1].x1 > 0.3 * capHeight) spaces++;
  const characters = ordered.length + spaces;
  const spread = heights.length > 1 ? (Math.max(...heights) - Math.min(...heights)) / top : 0.5;
  const confidence = Math.max(0, Math.min(1, 0.35 + 0.12 * Math.min(glyphs.length, 4) - 0.3 * spread + (onBaseline.length / glyphs.length - 0.5) * 0.3));
  // One glyph alone is more often a mark, an icon or a piece of a drawing than text: runs start at two.
  if (ordered.length < 2) return undefined;
  return {
    id: `text-${index + 1}`, text: '', characters, boxPx: [x0, y0, x1 - x0, y1 - y0], letterHeightPx: Math.round(capHeight * 10) / 10,
    confidence: Math.round(confidence * 100) / 100, polarity,
  };
}

/** Text runs found in an 8-bit sRGB RGBA frame, top to bottom, left to right. */
export function detectTextRuns(rgba: Uint8Array | Uint8ClampedArray, width: number, height: number): DetectedRun[] {
  const n = width * height;
  const luma = lumaOf(rgba, n);
  const mean = windowMeans(luma, width, height, WINDOW_PX);
  const runs: DetectedRun[] = [];
  for (const polarity of ['dark on light', 'light on dark'] as const) {
    const mask = new Uint8Array(n);
    for (let i = 0; i < n; i++) {
      const d = luma[i] - mean[i];
      mask[i] = polarity === 'dark on light' ? (d < -INK_THRESHOLD ? 1 : 0) : (d > INK_THRESHOLD ? 1 : 0);
    }
    const glyphs = components(mask, width, height).filter(isGlyph);
    for (const line of linesOf(glyphs)) {
      const run = runOf(line, polarity, 0);
      if (run && run.confidence >= 0.3) runs.push(run);
    }
  }
  // Where both polarities found the same place, one is the text and the other the background showing
  // between its letters (fewer, blobbier pieces): keep the run of more characters, then the surer one.
  const better = (o: DetectedRun, r: DetectedRun, j: number, i: number): boolean => o.characters > r.characters
    || (o.characters === r.characters && (o.confidence > r.confidence || (o.confidence === r.confidence && j < i)));
  const firstPass = runs.filter((r, i) => !runs.some((o, j) => j !== i && o.polarity !== r.polarity && iou(r.boxPx, o.boxPx) > 0.3 && better(o, r, j, i)));
  // Background around text seen as ink of the other polarity: a run lying mostly inside a run of more
  // characters, or one whose box holds runs of the other polarity with as many characters.
  const noHalos = firstPass.filter((r) => {
    const inside = firstPass.filter((o) => o !== r && o.polarity !== r.polarity && overlapShare(o.boxPx, r.boxPx) > 0.5);
    return inside.reduce((a, o) => a + o.characters, 0) < r.characters;
  });
  const kept = noHalos.filter((r) => !noHalos.some((o) => o !== r && overlapShare(r.boxPx, o.boxPx) > 0.5 && o.characters > r.characters));
  kept.sort((a, b) => a.boxPx[1] - b.boxPx[1] || a.boxPx[0] - b.boxPx[0]);
  return kept.map((r, i) => ({ ...r, id: `text-${i + 1}` }));
}

/** Intersection over union of two boxes [x, y, width, height]. */
export function iou(a: readonly number[], b: readonly number[]): number {
  const inter = overlapShare(a, b) * a[2] * a[3];
  return inter / (a[2] * a[3] + b[2] * b[3] - inter);
}

/** Share of box a's area covered by box b. */
export function overlapShare(a: readonly number[], b: readonly number[]): number {
  const w = Math.min(a[0] + a[2], b[0] + b[2]) - Math.max(a[0], b[0]);
  const h = Math.min(a[1] + a[3], b[1] + b[3]) - Math.max(a[1], b[1]);
  return w > 0 && h > 0 ? (w * h) / (a[2] * a[3]) : 0;
}
