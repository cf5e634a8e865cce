/** sRGB transfer functions and the linear sRGB → CIE XYZ (D65) matrix. Source: IEC 61966-2-1:1999. */

/** Encoded sRGB value (0–1) to linear light (0–1). */
export function srgbToLinear(v: number): number {
  return v <= 0.04045 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4);
}

/** Linear light (0–1) to encoded sRGB value (0–1), not clamped. */
export function linearToSrgb(l: number): number {
  return l <= 0.0031308 ? 12.92 * l : 1.055 * Math.pow(l, 1 / 2.4) - 0.055;
}

/**
 * Linear sRGB → XYZ (D65, Y of white = 1), derived from the sRGB primaries and the D65 white point
 * (x, y) = (0.3127, 0.3290) at full precision, as general colour libraries do; the IEC standard prints
 * it rounded to 4 decimals ([[0.4124, 0.3576, 0.1805], [0.2126, 0.7152, 0.0722], [0.0193, 0.1192, 0.9505]]).
 */
export const LINEAR_SRGB_TO_XYZ: readonly (readonly [number, number, number])[] = deriveRgbToXyz(
  [0.64, 0.33], [0.3, 0.6], [0.15, 0.06], [0.3127, 0.329],
);

/** Row of LINEAR_SRGB_TO_XYZ that gives luminance Y. */
export const LUMINANCE_WEIGHTS = LINEAR_SRGB_TO_XYZ[1];

function deriveRgbToXyz(r: [number, number], g: [number, number], b: [number, number], white: [number, number]): [number, number, number][] {
  const col = ([x, y]: [number, number]): [number, number, number] => [x / y, 1, (1 - x - y) / y];
  const P = [col(r), col(g), col(b)];
  const W = col(white);
  // Solve [P_r P_g P_b] · S = W for the scale of each primary (Cramer's rule on a 3×3 system).
  const m = [0, 1, 2].map((i) => [P[0][i], P[1][i], P[2][i]]);
  const det = (a: number[][]): number =>
    a[0][0] * (a[1][1] * a[2][2] - a[1][2] * a[2][1]) - a[0][1] * (a[1][0] * a[2][2] - a[1][2] * a[2][0]) + a[0][2] * (a[1][0] * a[2][1] - a[1][1] * a[2][0]);
  const d = det(m);
  const S = [0, 1, 2].map((k) => det(m.map((row, i) => row.map((v, j) => (j === k ? W[i] : v)))) / d);
  return [0, 1, 2].map((i) => [m[i][0] * S[0], m[i][1] * S[1], m[i][2] * S[2]] as [number, number, number]);
}

/** Multiplies linear sRGB by LINEAR_SRGB_TO_XYZ, writing into `out` (may not alias `rgb`). */
export function linearSrgbToXyz(out: [number, number, number], rgb: readonly [number, number, number]): [number, number, number] {
  for (let i = 0; i < 3; i++) {
    const row = LINEAR_SRGB_TO_XYZ[i];
    out[i] = row[0] * rgb[0] + row[1] * rgb[1] + row[2] * rgb[2];
  }
  return out;
}
