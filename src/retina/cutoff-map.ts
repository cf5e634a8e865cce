/**
 * Retinal cutoff frequency at every pixel. The acuity model is evaluated on a grid of eccentricity
 * (spaced in √e, dense near the fovea where acuity changes fastest) by meridian, then interpolated
 * bilinearly per pixel: the same numbers as evaluating the model per pixel to within 0.5 %, for a
 * small fraction of the cost.
 */
import type { Eyes } from '../config/setup.js';
import type { ViewMap } from '../geometry/view-map.js';
import type { AcuityModel } from './acuity-model.js';

const ECCENTRICITY_STEPS = 1024;
const MERIDIAN_STEP_DEG = 2;

/** Tables by model, eyes and eccentricity range: they do not depend on the gaze, so a gaze change reuses them. */
const tables = new Map<string, { maxEcc: number; table: Float32Array }>();
const TABLES_KEPT = 8;

/** The table of a model over eccentricity (to `maxEcc`, rounded up to 5°) and meridian. */
function cutoffTable(model: AcuityModel, eyes: Eyes, wantedMaxEcc: number): { maxEcc: number; table: Float32Array } {
  const maxEcc = Math.max(5, Math.ceil(wantedMaxEcc / 5) * 5);
  const key = `${model.name}|${model.variant ?? ''}|${eyes}|${maxEcc}`;
  let hit = tables.get(key);
  if (!hit) {
    const meridians = 360 / MERIDIAN_STEP_DEG + 1;
    const table = new Float32Array(ECCENTRICITY_STEPS * meridians);
    for (let e = 0; e < ECCENTRICITY_STEPS; e++) {
      const eccDeg = maxEcc * (e / (ECCENTRICITY_STEPS - 1)) ** 2;
      for (let m = 0; m < meridians; m++) table[e * meridians + m] = model.cutoffCpd(eccDeg, m * MERIDIAN_STEP_DEG, eyes);
    }
    hit = { maxEcc, table };
    tables.set(key, hit);
    if (tables.size > TABLES_KEPT) tables.delete(tables.keys().next().value as string);
  }
  return hit;
}

export function computeCutoffMap(viewMap: ViewMap, model: AcuityModel, eyes: Eyes, out: Float32Array): Float32Array {
  const ecc = viewMap.eccentricityDeg;
  const mer = viewMap.meridianDeg;
  let wanted = 1e-3;
  for (let i = 0; i < ecc.length; i++) if (ecc[i] > wanted) wanted = ecc[i];
  const { maxEcc, table } = cutoffTable(model, eyes, wanted);
  const meridians = 360 / MERIDIAN_STEP_DEG + 1;
  const scale = ECCENTRICITY_STEPS - 1;
  const invMax = 1 / maxEcc;
  for (let i = 0; i < ecc.length; i++) {
    const u = Math.sqrt(ecc[i] * invMax) * scale;
    const e0 = Math.min(ECCENTRICITY_STEPS - 2, Math.floor(u));
    const fu = u - e0;
    const v = mer[i] / MERIDIAN_STEP_DEG;
    const m0 = Math.min(meridians - 2, Math.floor(v));
    const fv = v - m0;
    const row0 = e0 * meridians + m0;
    const row1 = row0 + meridians;
    const a = table[row0];
    const b = table[row0 + 1];
    const c = table[row1];
    const d = table[row1 + 1];
    out[i] = (a * (1 - fv) + b * fv) * (1 - fu) + (c * (1 - fv) + d * fv) * fu;
  }
  return out;
}
