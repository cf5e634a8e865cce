/**
 * The headset lens's own blur: its MTF50 at a few field angles, interpolated, taken as a Gaussian
 * blur (MTF(f) = exp(−2π²σ²f²), so σ = sqrt(ln 2 / 2) / (π·MTF50)) and applied to the frame before
 * the eye's optics with the spatially varying pyramid blur (by the pipeline). A Gaussian is our simplification of a
 * lens MTF given by one number per field angle.
 */
import type { HeadsetDisplay } from '../config/setup.js';
import type { ViewMap } from '../geometry/view-map.js';
import { pixelToTan, type Projection } from '../geometry/projection.js';
import { radToDeg } from '../units.js';

/** Gaussian σ (deg) whose MTF is 0.5 at `mtf50Cpd`. */
export function gaussianSigmaDegForMtf50(mtf50Cpd: number): number {
  return Math.sqrt(Math.log(2) / 2) / (Math.PI * mtf50Cpd);
}

/** MTF50 at a field angle, linear between the given angles and constant beyond the ends. */
export function lensMtf50At(fieldDeg: number, sharpness: NonNullable<HeadsetDisplay['lensSharpness']>): number {
  const { fieldAnglesDeg: a, mtf50Cpd: m } = sharpness;
  if (fieldDeg <= a[0]) return m[0];
  for (let i = 1; i < a.length; i++) {
    if (fieldDeg <= a[i]) return m[i - 1] + ((m[i] - m[i - 1]) * (fieldDeg - a[i - 1])) / (a[i] - a[i - 1]);
  }
  return m[m.length - 1];
}

/** Gaussian σ (frame px) of the lens blur at every pixel, from its field angle off the lens axis. */
export function headsetLensSigmaPx(sharpness: NonNullable<HeadsetDisplay['lensSharpness']>, projection: Projection, viewMap: ViewMap): Float32Array {
  const { width, height } = viewMap;
  const sigmaPx = new Float32Array(width * height);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const [a, b] = pixelToTan(projection, x + 0.5, y + 0.5);
      const fieldDeg = radToDeg(Math.atan(Math.sqrt(a * a + b * b)));
      const i = y * width + x;
      sigmaPx[i] = (gaussianSigmaDegForMtf50(lensMtf50At(fieldDeg, sharpness)) * 60) / viewMap.arcminPerPx[i];
    }
  }
  return sigmaPx;
}
