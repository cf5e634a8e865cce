/**
 * Two-dimensional complex FFT built from fft.js row and column transforms. The plan (twiddle tables
 * and scratch rows) is made once per size and reused.
 */
import FFT from 'fft.js';

export interface Fft2dPlan {
  width: number;
  height: number;
  rows: FFT;
  cols: FFT;
  scratchIn: Float64Array;
  scratchOut: Float64Array;
}

export function nextPowerOfTwo(n: number): number {
  let p = 2;
  while (p < n) p *= 2;
  return p;
}

export function createFft2dPlan(width: number, height: number): Fft2dPlan {
  const longest = Math.max(width, height);
  return {
    width, height,
    rows: new FFT(width),
    cols: new FFT(height),
    scratchIn: new Float64Array(2 * longest),
    scratchOut: new Float64Array(2 * longest),
  };
}

/** In-place transform of the rows of an interleaved complex buffer (re, im per element). */
function transformRows(plan: Fft2dPlan, data: Float64Array, inverse: boolean): void {
  const { width, height, rows } = plan;
  const inRow = plan.scratchIn.subarray(0, 2 * width);
  const outRow = plan.scratchOut.subarray(0, 2 * width);
  for (let y = 0; y < height; y++) {
    const row = data.subarray(2 * width * y, 2 * width * (y + 1));
    inRow.set(row);
    if (inverse) rows.inverseTransform(outRow, inRow);
    else rows.transform(outRow, inRow);
    row.set(outRow);
  }
}

/**
 * In-place transform of the columns; `between` may scale each column's spectrum while it is in
 * the frequency domain (it receives the column index and the interleaved column).
 */
function transformColumns(plan: Fft2dPlan, data: Float64Array, inverse: boolean, between?: (x: number, column: Float64Array) => void): void {
  const { width, height, cols } = plan;
  const inCol = plan.scratchIn.subarray(0, 2 * height);
  const outCol = plan.scratchOut.subarray(0, 2 * height);
  for (let x = 0; x < width; x++) {
    for (let y = 0; y < height; y++) {
      inCol[2 * y] = data[2 * (y * width + x)];
      inCol[2 * y + 1] = data[2 * (y * width + x) + 1];
    }
    if (inverse) cols.inverseTransform(outCol, inCol);
    else cols.transform(outCol, inCol);
    if (between) {
      between(x, outCol);
      cols.inverseTransform(inCol, outCol);
      outCol.set(inCol);
    }
    for (let y = 0; y < height; y++) {
      data[2 * (y * width + x)] = outCol[2 * y];
      data[2 * (y * width + x) + 1] = outCol[2 * y + 1];
    }
  }
}

/** Forward 2D transform of an interleaved complex buffer, in place. */
export function fft2dForward(plan: Fft2dPlan, data: Float64Array): void {
  transformRows(plan, data, false);
  transformColumns(plan, data, false);
}

/**
 * Filters an interleaved complex image by a transfer function given per frequency bin
 * (`re[ky * width + kx]`, and `im` when the kernel is not point-symmetric), in place. Convolution
 * with a real kernel is linear over complex numbers, so the real and imaginary parts of the buffer
 * (two real planes) are filtered independently.
 */
export function filterComplex(plan: Fft2dPlan, data: Float64Array, re: Float32Array, im?: Float32Array): void {
  const { width, height } = plan;
  transformRows(plan, data, false);
  transformColumns(plan, data, false, (kx, column) => {
    for (let ky = 0; ky < height; ky++) {
      const hr = re[ky * width + kx];
      const a = column[2 * ky];
      const b = column[2 * ky + 1];
      if (im) {
        const hi = im[ky * width + kx];
        column[2 * ky] = a * hr - b * hi;
        column[2 * ky + 1] = a * hi + b * hr;
      } else {
        column[2 * ky] = a * hr;
        column[2 * ky + 1] = b * hr;
      }
    }
  });
  transformRows(plan, data, true);
}
