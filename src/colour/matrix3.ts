/** Small 3×3 matrix helpers for colour conversions (row-major, rows of three). */
export type Matrix3 = readonly (readonly [number, number, number])[];

export function multiply3(a: Matrix3, b: Matrix3): [number, number, number][] {
  return [0, 1, 2].map((i) => [0, 1, 2].map((j) => a[i][0] * b[0][j] + a[i][1] * b[1][j] + a[i][2] * b[2][j]) as [number, number, number]);
}

export function apply3(m: Matrix3, v: readonly [number, number, number]): [number, number, number] {
  return [0, 1, 2].map((i) => m[i][0] * v[0] + m[i][1] * v[1] + m[i][2] * v[2]) as [number, number, number];
}

/** Inverse by cofactors; throws on a singular matrix. */
export function invert3(m: Matrix3): [number, number, number][] {
  const [[a, b, c], [d, e, f], [g, h, i]] = m;
  const A = e * i - f * h;
  const B = -(d * i - f * g);
  const C = d * h - e * g;
  const det = a * A + b * B + c * C;
  if (Math.abs(det) < 1e-15) throw new Error('singular colour matrix');
  return [
    [A / det, -(b * i - c * h) / det, (b * f - c * e) / det],
    [B / det, (a * i - c * g) / det, -(a * f - c * d) / det],
    [C / det, -(a * h - b * g) / det, (a * e - b * d) / det],
  ];
}

/** out[k] = Σ m[k][j]·in[j] for every pixel of three planes; `out` may not alias `planes`. */
export function transformPlanes(m: Matrix3, planes: readonly Float32Array[], out: readonly Float32Array[]): void {
  const [p0, p1, p2] = planes;
  const n = p0.length;
  for (let k = 0; k < 3; k++) {
    const [a, b, c] = m[k];
    const o = out[k];
    for (let i = 0; i < n; i++) o[i] = a * p0[i] + b * p1[i] + c * p2[i];
  }
}
