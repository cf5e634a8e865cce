/**
 * Spatially invariant optical filtering of planes by a radially symmetric transfer function given
 * in cycles per degree, via FFT with mirrored borders (so frame edges do not darken or wrap).
 */
import type { Plane } from '../image/plane.js';
import { createFft2dPlan, filterComplex, nextPowerOfTwo } from './fft2d.js';

export interface OtfSampling {
  /** Frame pixels per degree horizontally and vertically where the transfer is evaluated. */
  pxPerDegX: number;
  pxPerDegY: number;
  /** Pixels of mirrored border to add on each side; at least the filter's reach. */
  marginPx: number;
}

/** Index of pixel `i` of a mirror-extended line of length n (half-sample symmetric, period 2n). */
function mirrorIndex(i: number, n: number): number {
  const period = 2 * n;
  let m = i % period;
  if (m < 0) m += period;
  return m < n ? m : period - 1 - m;
}

/** A transfer function sampled on the bins of one padded FFT grid, reusable for every plane of that size. */
export interface OtfGrid {
  width: number;
  height: number;
  fftWidth: number;
  fftHeight: number;
  transfer: Float32Array;
}

/**
 * Samples the radial transfer `transferOfCpd(f)` (f in cpd) on the FFT bins for planes of the given
 * size, with room for a mirrored border of `marginPx`.
 */
export function createOtfGrid(width: number, height: number, transferOfCpd: (fCpd: number) => number, sampling: OtfSampling): OtfGrid {
  const fftWidth = nextPowerOfTwo(width + 2 * sampling.marginPx);
  const fftHeight = nextPowerOfTwo(height + 2 * sampling.marginPx);
  // Tabulate against radial frequency once; bins are looked up with linear interpolation.
  const maxCpd = Math.sqrt(sampling.pxPerDegX ** 2 + sampling.pxPerDegY ** 2) / 2;
  const tableSize = 4096;
  const table = new Float64Array(tableSize + 2);
  for (let i = 0; i <= tableSize + 1; i++) table[i] = transferOfCpd((i / tableSize) * maxCpd);
  const transfer = new Float32Array(fftWidth * fftHeight);
  for (let ky = 0; ky < fftHeight; ky++) {
    const fy = ((ky <= fftHeight / 2 ? ky : ky - fftHeight) / fftHeight) * sampling.pxPerDegY;
    for (let kx = 0; kx < fftWidth; kx++) {
      const fx = ((kx <= fftWidth / 2 ? kx : kx - fftWidth) / fftWidth) * sampling.pxPerDegX;
      const t = (Math.sqrt(fx * fx + fy * fy) / maxCpd) * tableSize;
      const i = Math.floor(t);
      transfer[ky * fftWidth + kx] = table[i] + (table[i + 1] - table[i]) * (t - i);
    }
  }
  return { width, height, fftWidth, fftHeight, transfer };
}

/**
 * Filters one or two planes of the grid's size, writing into `outs` (may be the same arrays as the
 * inputs). Two planes share one complex transform as its real and imaginary parts.
 */
export function applyOtf(inputs: readonly Plane[], outs: readonly Float32Array[], grid: OtfGrid): void {
  if (inputs.length === 0 || inputs.length > 2 || outs.length !== inputs.length) throw new Error('applyOtf takes one or two planes');
  const { width, height, fftWidth: fw, fftHeight: fh } = grid;
  if (inputs.some((p) => p.width !== width || p.height !== height)) throw new Error('applyOtf: plane size differs from the grid');
  const offX = Math.floor((fw - width) / 2);
  const offY = Math.floor((fh - height) / 2);
  const data = new Float64Array(2 * fw * fh);
  const colIndex = new Int32Array(fw);
  for (let x = 0; x < fw; x++) colIndex[x] = mirrorIndex(x - offX, width);
  for (let y = 0; y < fh; y++) {
    const row = mirrorIndex(y - offY, height) * width;
    for (let x = 0; x < fw; x++) {
      const si = row + colIndex[x];
      const di = 2 * (y * fw + x);
      data[di] = inputs[0].data[si];
      if (inputs.length === 2) data[di + 1] = inputs[1].data[si];
    }
  }
  filterComplex(createFft2dPlan(fw, fh), data, grid.transfer);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const si = 2 * ((y + offY) * fw + x + offX);
      outs[0][y * width + x] = data[si];
      if (outs.length === 2) outs[1][y * width + x] = data[si + 1];
    }
  }
}
