/** Rod (scotopic) luminance of display colours. */
import { LINEAR_SRGB_TO_XYZ } from './srgb.js';

/**
 * Scotopic luminance from XYZ, Larson, Rushmeier & Piatko (1997), IEEE TVCG 3(4):
 * Y_s = Y·[1.33·(1 + (Y + Z)/X) − 1.68]. An approximation; 0 for black.
 */
export function scotopicLuminance(x: number, y: number, z: number): number {
  if (x <= 0) return 0;
  return Math.max(0, y * (1.33 * (1 + (y + z) / x) - 1.68));
}

/** Scotopic luminance of a linear sRGB colour, in the units of its Y. */
export function scotopicOfLinearSrgb(r: number, g: number, b: number): number {
  const [mx, my, mz] = LINEAR_SRGB_TO_XYZ;
  return scotopicLuminance(mx[0] * r + mx[1] * g + mx[2] * b, my[0] * r + my[1] * g + my[2] * b, mz[0] * r + mz[1] * g + mz[2] * b);
}
