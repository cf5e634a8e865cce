/** Photometry of display pixels. */
import type { Display } from '../config/setup.js';
import type { LinearRgb, Plane } from '../image/plane.js';
import { LUMINANCE_WEIGHTS } from './srgb.js';

/** Relative luminance (0 = display black, 1 = display white) of each pixel of a linear sRGB image. */
export function relativeLuminance(image: LinearRgb): Float32Array {
  const [wr, wg, wb] = LUMINANCE_WEIGHTS;
  const [r, g, b] = image.planes;
  const out = new Float32Array(r.length);
  for (let i = 0; i < out.length; i++) out[i] = wr * r[i] + wg * g[i] + wb * b[i];
  return out;
}

/**
 * Luminance in cd/m² of each pixel: Y_linear × (peak − black) + black, with Y_linear from the
 * sRGB matrix (IEC 61966-2-1).
 */
export function luminancePlaneCdM2(image: LinearRgb, display: Pick<Display, 'peakLuminanceCdM2' | 'blackLuminanceCdM2'>): Plane {
  const [wr, wg, wb] = LUMINANCE_WEIGHTS;
  const [r, g, b] = image.planes;
  const range = display.peakLuminanceCdM2 - display.blackLuminanceCdM2;
  const data = new Float32Array(r.length);
  for (let i = 0; i < data.length; i++) data[i] = (wr * r[i] + wg * g[i] + wb * b[i]) * range + display.blackLuminanceCdM2;
  return { width: image.width, height: image.height, data };
}
