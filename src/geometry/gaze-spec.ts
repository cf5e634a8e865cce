/**
 * Gaze as people give it, turned into frame pixels:
 * - `x,y` frame pixels (outside the frame allowed: the road above a cluster);
 * - `x%,y%` shares of the frame's width and height;
 * - `label:<id>` the centre of a label's box;
 * - `<h>deg,<v>deg` (or `°`) a direction from the display's centre: h right, v up, as tangent
 *   coordinates seen from the eye looking at the centre;
 * - `labels` each label in turn;
 * several separated by `;` (a list of fixations).
 */
import type { Label } from '../analysis/labels.js';
import { ConfigError } from '../errors.js';
import { degToRad } from '../units.js';
import type { Projection } from './projection.js';
import { pixelAtFieldPoint } from './view-map.js';

export interface GazeContext {
  frameSizePx: [number, number];
  projection: Projection;
  /** The display's centre in frame pixels (differs from the frame's centre for a placed crop). */
  displayCentrePx: [number, number];
  labels?: readonly Label[];
}

export interface ResolvedGaze {
  /** The spec as given, for captions. */
  given: string;
  gazePx: [number, number];
  /** True when the point is outside the frame. */
  outsideFrame: boolean;
}

const NUMBER = '(-?\\d+(?:\\.\\d+)?)';
const pixels = new RegExp(`^${NUMBER}\\s*,\\s*${NUMBER}$`);
const percent = new RegExp(`^${NUMBER}\\s*%\\s*,\\s*${NUMBER}\\s*%$`);
const degrees = new RegExp(`^${NUMBER}\\s*(?:deg|°)\\s*,\\s*${NUMBER}\\s*(?:deg|°)$`);

export const GAZE_FORMS = 'x,y in frame pixels (e.g. 1280,720), x%,y% (e.g. 50%,40%), label:<id>, h°,v° from the display centre (e.g. 0deg,12deg), or labels (each label in turn); several separated by ";"';

function fail(spec: string, why: string): never {
  throw new ConfigError('--gaze', [{ path: '--gaze', received: spec, expected: why }]);
}

/** Whether a spec needs the frame (anything but plain pixels). */
export function isPlainPixels(spec: string): boolean {
  return spec.split(';').length === 1 && pixels.test(spec.trim());
}

export function resolveGazeSpec(spec: string, ctx: GazeContext): ResolvedGaze[] {
  const parts = spec.split(';').map((p) => p.trim()).filter((p) => p.length > 0);
  if (parts.length === 0) fail(spec, GAZE_FORMS);
  if (parts.length > 64) fail(spec, 'at most 64 fixations');
  const [w, h] = ctx.frameSizePx;
  const out: ResolvedGaze[] = [];
  for (const part of parts) {
    let m: RegExpExecArray | null;
    const push = (x: number, y: number, given = part): void => {
      out.push({ given, gazePx: [x, y], outsideFrame: x < 0 || y < 0 || x >= w || y >= h });
    };
    if ((m = pixels.exec(part))) push(Number(m[1]), Number(m[2]));
    else if ((m = percent.exec(part))) push(Math.min(w - 1, (Number(m[1]) / 100) * w), Math.min(h - 1, (Number(m[2]) / 100) * h));
    else if ((m = degrees.exec(part))) {
      const [th, tv] = [Math.tan(degToRad(Number(m[1]))), Math.tan(degToRad(Number(m[2])))];
      if (Math.abs(Number(m[1])) >= 80 || Math.abs(Number(m[2])) >= 80) fail(part, 'directions within 80° of the display centre');
      const e = (Math.atan(Math.hypot(th, tv)) * 180) / Math.PI;
      const meridian = (Math.atan2(tv, th) * 180) / Math.PI;
      const at = pixelAtFieldPoint(ctx.projection, ctx.displayCentrePx, e, meridian);
      if (!at) fail(part, 'a direction that meets the display plane');
      // pixelAtFieldPoint gives edge coordinates; a gaze names the pixel whose centre it is.
      push(at[0] - 0.5, at[1] - 0.5);
    } else if (part.startsWith('label:')) {
      const id = part.slice('label:'.length);
      const label = ctx.labels?.find((l) => l.id === id);
      if (!label) {
        fail(part, ctx.labels?.length ? `the id of a label: ${ctx.labels.map((l) => l.id).slice(0, 20).join(', ')}${ctx.labels.length > 20 ? ', …' : ''}` : 'a label id, but no labels were given (--labels)');
      }
      push(label.boxPx[0] + label.boxPx[2] / 2, label.boxPx[1] + label.boxPx[3] / 2);
    } else if (part === 'labels') {
      if (!ctx.labels?.length) fail(part, 'labels to look at in turn, but no labels were given (--labels)');
      for (const l of ctx.labels) push(l.boxPx[0] + l.boxPx[2] / 2, l.boxPx[1] + l.boxPx[3] / 2, `label:${l.id}`);
    } else fail(part, GAZE_FORMS);
  }
  for (const g of out) {
    const [x, y] = g.gazePx;
    if (x < -2 * w || x > 3 * w - 1 || y < -2 * h || y > 3 * h - 1) fail(g.given, `a point inside the frame or up to two frame sizes beyond it (it is at ${Math.round(x)},${Math.round(y)} px)`);
  }
  return out.slice(0, 64);
}
