/**
 * Labels from an SVG export of the frame: every <text> (and every <tspan> placed on its own) becomes
 * a label with its box, capital height and letter spacing, so a designer need not measure anything.
 * - Position: x, y (the baseline), text-anchor; translate, scale and matrix transforms without
 *   rotation on the element and its groups; the root viewBox scaled to the frame's pixels.
 * - Font: font-size, font-family, font-weight and letter-spacing from attributes or style, inherited
 *   from groups.
 * - Size: for a face eyeproof bundles (IBM Plex Sans) the advance widths and the capital height are
 *   measured from the font itself; for any other face the capital height is CAP_HEIGHT_PER_EM of the
 *   font size (common practice: about 0.7 em for sans-serif faces; give the face's own ratio with
 *   `capHeightRatios`, e.g. from its cap-height and units-per-em) and the width is
 *   MEAN_ADVANCE_PER_EM per character (our estimate for proportional sans-serif text).
 * - Role: a `data-role` attribute (glance, look, decorative) is kept; the id is the element's id.
 */
import { XMLParser } from 'fast-xml-parser';
import { CAP_HEIGHT_PER_EM } from '../analysis/contrast.js';
import { LABEL_ROLES, type Label, type LabelRole } from '../analysis/labels.js';
import { InputError } from '../errors.js';
import { FONT_FAMILY, newCanvas } from '../render/canvas.js';

/** Mean advance of a character of proportional sans-serif text, per em (our estimate). */
export const MEAN_ADVANCE_PER_EM = 0.55;
/** Faces whose metrics eyeproof has (bundled), by the family names an export may use. */
const BUNDLED_FACES = new Set(['ibm plex sans', 'ibmplexsans', 'ibm plex sans text']);

export interface SvgTextOptions {
  /** Capital height per em by font family (lower case), for faces eyeproof does not bundle. */
  capHeightRatios?: Record<string, number>;
}

type Node = Record<string, unknown>;
type Matrix = [number, number, number, number, number, number];

interface Style {
  fontSizePx: number;
  family: string;
  weight: number;
  letterSpacingPx: number;
  anchor: 'start' | 'middle' | 'end';
}

const FIX = 'Export the frame as SVG with text kept as text (not outlined), or write a labels file (eyeproof labels).';

function multiply(a: Matrix, b: Matrix): Matrix {
  return [a[0] * b[0] + a[2] * b[1], a[1] * b[0] + a[3] * b[1], a[0] * b[2] + a[2] * b[3], a[1] * b[2] + a[3] * b[3], a[0] * b[4] + a[2] * b[5] + a[4], a[1] * b[4] + a[3] * b[5] + a[5]];
}

function parseTransform(text: string | undefined, file: string): Matrix {
  let m: Matrix = [1, 0, 0, 1, 0, 0];
  if (!text) return m;
  for (const [, name, args] of text.matchAll(/(\w+)\s*\(([^)]*)\)/g)) {
    const v = args.split(/[\s,]+/).filter(Boolean).map(Number);
    let t: Matrix;
    if (name === 'translate') t = [1, 0, 0, 1, v[0] ?? 0, v[1] ?? 0];
    else if (name === 'scale') t = [v[0], 0, 0, v[1] ?? v[0], 0, 0];
    else if (name === 'matrix' && v.length === 6) t = v as Matrix;
    else throw new InputError(file, `has a transform "${text}" that eyeproof cannot follow (only translate, scale and matrix without rotation)`, FIX);
    if (Math.abs(t[1]) > 1e-9 || Math.abs(t[2]) > 1e-9) throw new InputError(file, `has a rotated or skewed text transform "${text}"`, 'Judge rotated text with a labels file.');
    m = multiply(m, t);
  }
  return m;
}

function styleOf(attrs: Node, parent: Style): Style {
  const inline: Record<string, string> = {};
  const style = attrs['@_style'];
  if (typeof style === 'string') {
    for (const part of style.split(';')) {
      const [k, v] = part.split(':').map((x) => x?.trim());
      if (k && v) inline[k] = v;
    }
  }
  const get = (name: string): string | undefined => inline[name] ?? (typeof attrs[`@_${name}`] === 'string' || typeof attrs[`@_${name}`] === 'number' ? String(attrs[`@_${name}`]) : undefined);
  const px = (v: string | undefined, em: number): number | undefined => {
    if (v === undefined) return undefined;
    const m = /^(-?[\d.]+)(px|pt|em)?$/.exec(v.trim());
    if (!m) return undefined;
    const n = Number(m[1]);
    return m[2] === 'pt' ? (n * 4) / 3 : m[2] === 'em' ? n * em : n;
  };
  const fontSizePx = px(get('font-size'), parent.fontSizePx) ?? parent.fontSizePx;
  const weightText = get('font-weight');
  const weight = weightText === 'bold' ? 700 : weightText === 'normal' ? 400 : weightText && Number.isFinite(Number(weightText)) ? Number(weightText) : parent.weight;
  const anchor = get('text-anchor');
  return {
    fontSizePx,
    family: (get('font-family') ?? parent.family).split(',')[0].trim().replace(/^['"]|['"]$/g, ''),
    weight,
    letterSpacingPx: px(get('letter-spacing'), fontSizePx) ?? parent.letterSpacingPx,
    anchor: anchor === 'middle' || anchor === 'end' ? anchor : anchor === 'start' ? 'start' : parent.anchor,
  };
}

/** The text of a node's children, in order (text and nested tspans without their own position). */
function textOf(children: Node[]): string {
  return children.map((c) => (typeof c['#text'] !== 'undefined' ? String(c['#text']) : Array.isArray(c.tspan) ? textOf(c.tspan as Node[]) : '')).join(' ').replace(/\s+/g, ' ').trim();
}

interface Metrics {
  widthPx: number;
  ascentPx: number;
  descentPx: number;
  capHeightPx: number;
  measured: boolean;
}

let measure: ReturnType<typeof newCanvas>['g'] | undefined;

function metricsOf(text: string, s: Style, options: SvgTextOptions): Metrics {
  const family = s.family.toLowerCase();
  const spacing = s.letterSpacingPx * Math.max(0, [...text].length - 1);
  if (BUNDLED_FACES.has(family)) {
    measure ??= newCanvas(8, 8).g;
    measure.font = `${s.weight >= 550 ? 600 : 400} ${s.fontSizePx}px ${FONT_FAMILY}`;
    const m = measure.measureText(text);
    const cap = measure.measureText('H').actualBoundingBoxAscent;
    return { widthPx: m.width + spacing, ascentPx: m.actualBoundingBoxAscent, descentPx: m.actualBoundingBoxDescent, capHeightPx: cap, measured: true };
  }
  const ratio = options.capHeightRatios?.[family] ?? CAP_HEIGHT_PER_EM;
  const cap = ratio * s.fontSizePx;
  return { widthPx: [...text].length * MEAN_ADVANCE_PER_EM * s.fontSizePx + spacing, ascentPx: cap, descentPx: /[gjpqy,;]/.test(text) ? 0.2 * s.fontSizePx : 0, capHeightPx: cap, measured: false };
}

/** Labels (in frame px) from the text of an SVG export of a frame of the given size. */
export function labelsFromSvg(svgText: string, file: string, frameWidthPx: number, frameHeightPx: number, options: SvgTextOptions = {}): (Label & { measured: boolean })[] {
  let tree: Node[];
  try {
    tree = new XMLParser({ ignoreAttributes: false, preserveOrder: true, trimValues: false, processEntities: true }).parse(svgText) as Node[];
  } catch (err) {
    throw new InputError(file, `is not readable XML (${(err as Error).message.split('\n')[0]})`, FIX);
  }
  const root = tree.find((n) => Array.isArray(n.svg));
  if (!root) throw new InputError(file, 'has no <svg> element', FIX);
  const rootAttrs = (root[':@'] ?? {}) as Node;
  const viewBox = typeof rootAttrs['@_viewBox'] === 'string' ? (rootAttrs['@_viewBox'] as string).split(/[\s,]+/).map(Number) : undefined;
  const [vx, vy, vw, vh] = viewBox && viewBox.length === 4 && viewBox.every(Number.isFinite) ? viewBox : [0, 0, Number(rootAttrs['@_width'] ?? frameWidthPx) || frameWidthPx, Number(rootAttrs['@_height'] ?? frameHeightPx) || frameHeightPx];
  // The SVG's user space, scaled to the frame (the export's own pixel ratio).
  const toFrame: Matrix = [frameWidthPx / vw, 0, 0, frameHeightPx / vh, (-vx * frameWidthPx) / vw, (-vy * frameHeightPx) / vh];
  const labels: (Label & { measured: boolean })[] = [];
  const base: Style = { fontSizePx: 16, family: 'sans-serif', weight: 400, letterSpacingPx: 0, anchor: 'start' };

  const place = (text: string, x: number, y: number, s: Style, m: Matrix, attrs: Node): void => {
    if (!text) return;
    const metrics = metricsOf(text, s, options);
    const anchorShift = s.anchor === 'middle' ? metrics.widthPx / 2 : s.anchor === 'end' ? metrics.widthPx : 0;
    const left = x - anchorShift;
    // Corners in user space, then to the frame (no rotation: the box stays a box).
    const [a, , , d, e, f] = m;
    const x0 = a * left + e;
    const x1 = a * (left + metrics.widthPx) + e;
    const y0 = d * (y - metrics.ascentPx) + f;
    const y1 = d * (y + metrics.descentPx) + f;
    const role = attrs['@_data-role'];
    const boxPx: [number, number, number, number] = [Math.min(x0, x1), Math.min(y0, y1), Math.abs(x1 - x0), Math.abs(y1 - y0)];
    labels.push({
      id: typeof attrs['@_id'] === 'string' ? attrs['@_id'] : `svg-text-${labels.length + 1}`, text,
      boxPx: boxPx.map((v) => Math.round(v * 10) / 10) as [number, number, number, number],
      letterHeightPx: Math.round(Math.abs(d) * metrics.capHeightPx * 10) / 10, letterSpacingPx: Math.round(Math.abs(a) * s.letterSpacingPx * 10) / 10,
      ...(typeof role === 'string' && (LABEL_ROLES as readonly string[]).includes(role) ? { role: role as LabelRole } : {}),
      measured: metrics.measured,
    });
  };

  const walk = (nodes: Node[], parentStyle: Style, parentMatrix: Matrix): void => {
    for (const n of nodes) {
      const attrs = (n[':@'] ?? {}) as Node;
      const tag = Object.keys(n).find((k) => k !== ':@');
      if (!tag || tag === '#text' || tag === 'defs' || tag === 'style' || tag === 'title' || tag === 'desc') continue;
      const s = styleOf(attrs, parentStyle);
      const m = multiply(parentMatrix, parseTransform(attrs['@_transform'] as string | undefined, file));
      const children = (n[tag] ?? []) as Node[];
      if (tag === 'text') {
        const x = Number(attrs['@_x'] ?? 0);
        const y = Number(attrs['@_y'] ?? 0);
        // tspans with their own position are runs of their own; the rest is this run's text.
        const own = children.filter((c) => !(Array.isArray(c.tspan) && c[':@'] && ((c[':@'] as Node)['@_x'] !== undefined || (c[':@'] as Node)['@_y'] !== undefined)));
        place(textOf(own), x, y, s, m, attrs);
        for (const c of children) {
          if (!Array.isArray(c.tspan) || own.includes(c)) continue;
          const ta = c[':@'] as Node;
          place(textOf(c.tspan as Node[]), Number(ta['@_x'] ?? x), Number(ta['@_y'] ?? y), styleOf(ta, s), m, { ...ta, '@_id': ta['@_id'] ?? attrs['@_id'] });
        }
      } else if (Array.isArray(n[tag])) walk(children, s, m);
    }
  };
  walk(root.svg as Node[], base, toFrame);
  if (labels.length === 0) throw new InputError(file, 'holds no <text> elements (text may have been converted to outlines)', FIX);
  return labels;
}
