/** Unit conversions live here and nowhere else. */

export const DEG_PER_RAD = 180 / Math.PI;
export const ARCMIN_PER_DEG = 60;
export const ARCMIN_PER_RAD = DEG_PER_RAD * ARCMIN_PER_DEG;
export const MM_PER_INCH = 25.4;

export const degToRad = (deg: number): number => deg / DEG_PER_RAD;
export const radToDeg = (rad: number): number => rad * DEG_PER_RAD;
export const radToArcmin = (rad: number): number => rad * ARCMIN_PER_RAD;
export const arcminToDeg = (arcmin: number): number => arcmin / ARCMIN_PER_DEG;
export const degToArcmin = (deg: number): number => deg * ARCMIN_PER_DEG;
export const mmToM = (mm: number): number => mm / 1000;
export const inchToMm = (inch: number): number => inch * MM_PER_INCH;

/** Visual angle subtended by a size at a distance, same length unit: θ = 2·atan(h / 2d). */
export function visualAngleDeg(size: number, distance: number): number {
  return radToDeg(2 * Math.atan(size / (2 * distance)));
}
