/**
 * The blind spot (optic disc) of one eye, in field coordinates around the gaze: centre about 15°
 * temporal and 1.5° below the horizontal, about 5.5° wide and 7.5° high (encyclopaedic summary,
 * checked; Rohrschneider 2004: 15.5° ± 1.1°, 1.5° ± 0.9°, from memory). With both eyes open each eye
 * covers the other's blind spot, so there is none.
 */
import type { Eyes } from '../config/setup.js';
import type { Plane } from '../image/plane.js';
import { expand, reduce } from './pyramid.js';

export const BLIND_SPOT = { temporalDeg: 15, belowDeg: 1.5, widthDeg: 5.5, heightDeg: 7.5 } as const;

/** Centre of the blind spot in the field around the gaze, deg: x right, y up; undefined with both eyes. */
export function blindSpotCentreDeg(eyes: Eyes): [number, number] | undefined {
  if (eyes === 'both') return undefined;
  // Temporal field is to the right of fixation for the right eye, to the left for the left eye.
  return [eyes === 'right' ? BLIND_SPOT.temporalDeg : -BLIND_SPOT.temporalDeg, -BLIND_SPOT.belowDeg];
}

/**
 * Elliptical distance from the blind spot's centre for a field point given by eccentricity and
 * meridian (field x = e·cos m, y = e·sin m): below 1 inside.
 */
export function blindSpotDistance(eccentricityDeg: number, meridianDeg: number, centre: [number, number]): number {
  const m = (meridianDeg * Math.PI) / 180;
  const dx = (eccentricityDeg * Math.cos(m) - centre[0]) / (BLIND_SPOT.widthDeg / 2);
  const dy = (eccentricityDeg * Math.sin(m) - centre[1]) / (BLIND_SPOT.heightDeg / 2);
  return Math.sqrt(dx * dx + dy * dy);
}

/**
 * Fills the masked region of a plane from its surroundings, as perception does: a push–pull
 * pyramid (masked REDUCE, then each level's holes filled from the coarser level). `known` is 1 where
 * the plane holds information, 0 in the hole, fractions at a soft edge. Writes into `out`.
 */
export function fillFromSurround(src: Plane, known: Float32Array, out: Float32Array): Float32Array {
  const levels: { p: Plane; w: Plane }[] = [];
  const premultiplied = new Float32Array(src.data.length);
  for (let i = 0; i < premultiplied.length; i++) premultiplied[i] = src.data[i] * known[i];
  let p: Plane = { width: src.width, height: src.height, data: premultiplied };
  let w: Plane = { width: src.width, height: src.height, data: known };
  levels.push({ p, w });
  while (Math.min(p.width, p.height) > 4) {
    p = reduce(p);
    w = reduce(w);
    levels.push({ p, w });
  }
  // Pull: the coarsest level as a normalised average, then fill each finer level's holes from it.
  const top = levels[levels.length - 1];
  let filled: Float32Array = new Float32Array(top.p.data.length);
  for (let i = 0; i < filled.length; i++) filled[i] = top.w.data[i] > 1e-6 ? top.p.data[i] / top.w.data[i] : 0;
  for (let k = levels.length - 2; k >= 0; k--) {
    const { p: lp, w: lw } = levels[k];
    const up = expand({ width: levels[k + 1].p.width, height: levels[k + 1].p.height, data: filled }, lp.width, lp.height).data;
    const next = k === 0 ? out : new Float32Array(lp.data.length);
    for (let i = 0; i < next.length; i++) {
      const weight = Math.min(1, lw.data[i]);
      // Known parts keep their value; holes take the coarser fill.
      next[i] = weight > 1e-6 ? (lp.data[i] / lw.data[i]) * weight + up[i] * (1 - weight) : up[i];
    }
    filled = next;
  }
  return out;
}
