/**
 * Spatially invariant optical filtering of planes by a radially symmetric transfer function given
 * in cycles per degree, via FFT with mirrored borders (so frame edges do not darken or wrap).
 */
import type { Plane } from '../image/plane.js';
import { createFft2dPlan, fft2dForward, filterComplex, nextPowerOfTwo } from './fft2d.js';

export interface OtfSampling {
  /** Frame pixels per degree horizontally and vertically where the transfer is evaluated. */
  pxPerDegX: number;
  pxPerDegY: number;
  /** Pixels of mirrored border to add on each side; at least the filter's reach. */
  marginPx: number;
  /** FFT tile size (a power of two); by default the smallest efficient one for the margin. */
  tilePx?: number;
}

/** Index of pixel `i` of a mirror-extended line of length n (half-sample symmetric, period 2n). */
function mirrorIndex(i: number, n: number): number {
  const period = 2 * n;
  let m = i % period;
  if (m < 0) m += period;
  return m < n ? m : period - 1 - m;
}

/** A transfer function sampled on the bins of one FFT tile, reused for every tile and plane. */
export interface OtfGrid {
  fftWidth: number;
  fftHeight: number;
  /** Border of each tile that only feeds its neighbours' pixels, px. */
  marginPx: number;
  /** Real part of the transfer per bin. */
  transfer: Float32Array;
  /** Imaginary part, for kernels that are not point-symmetric. */
  transferIm?: Float32Array;
}

/**
 * FFT tile size for a plane side: the smallest power of two of at least 256 whose interior
 * (size − 2·margin) keeps at least half of it, or the whole side with its margins when that is smaller.
 */
function tileSize(side: number, marginPx: number): number {
  let size = 256;
  while (size - 2 * marginPx < size / 2) size *= 2;
  return Math.min(size, nextPowerOfTwo(side + 2 * marginPx));
}

/**
 * Samples the radial transfer `transferOfCpd(f)` (f in cpd) on the bins of the FFT tile used for
 * planes of the given size.
 */
export function createOtfGrid(width: number, height: number, transferOfCpd: (fCpd: number) => number, sampling: OtfSampling): OtfGrid {
  const fftWidth = sampling.tilePx ?? tileSize(width, sampling.marginPx);
  const fftHeight = sampling.tilePx ?? tileSize(height, sampling.marginPx);
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
  return { fftWidth, fftHeight, marginPx: sampling.marginPx, transfer };
}

/**
 * The transfer of a pixel kernel (odd size, centred, e.g. a point-spread function binned to frame
 * pixels) on the bins of an FFT tile with room for its reach.
 */
export function otfGridFromKernel(width: number, height: number, kernel: Float32Array, kernelSize: number, tilePx?: number): OtfGrid {
  const half = (kernelSize - 1) / 2;
  const marginPx = half + 2;
  const fftWidth = tilePx ?? tileSize(width, marginPx);
  const fftHeight = tilePx ?? tileSize(height, marginPx);
  const plan = createFft2dPlan(fftWidth, fftHeight);
  const data = new Float64Array(2 * fftWidth * fftHeight);
  // The kernel's centre goes to bin (0, 0); negative offsets wrap around.
  for (let ky = 0; ky < kernelSize; ky++) {
    const y = (ky - half + fftHeight) % fftHeight;
    for (let kx = 0; kx < kernelSize; kx++) {
      const x = (kx - half + fftWidth) % fftWidth;
      data[2 * (y * fftWidth + x)] = kernel[ky * kernelSize + kx];
    }
  }
  fft2dForward(plan, data);
  const transfer = new Float32Array(fftWidth * fftHeight);
  const transferIm = new Float32Array(fftWidth * fftHeight);
  let maxIm = 0;
  for (let i = 0; i < transfer.length; i++) {
    transfer[i] = data[2 * i];
    transferIm[i] = data[2 * i + 1];
    maxIm = Math.max(maxIm, Math.abs(transferIm[i]));
  }
  return { fftWidth, fftHeight, marginPx, transfer, ...(maxIm > 1e-7 ? { transferIm } : {}) };
}

interface TileJob {
  src: Float32Array;
  grid: OtfGrid;
  out: Float32Array;
  /** Top-left of the tile's interior in the plane. */
  x0: number;
  y0: number;
}

/**
 * Filters planes by the grid's transfer with overlap-save tiles: each tile reads its interior plus a
 * mirrored-at-the-frame-edge margin, is filtered by FFT, and writes back its interior. Two tiles
 * share one complex transform as its real and imaginary parts (a real, even transfer keeps them apart).
 * `outs[i]` receives `inputs[i]` filtered and must not alias any input.
 */
export function applyOtf(inputs: readonly Plane[], outs: readonly Float32Array[], grids: OtfGrid | readonly OtfGrid[]): void {
  if (inputs.length === 0 || outs.length !== inputs.length) throw new Error('applyOtf takes one output per input plane');
  const gridOf = (c: number): OtfGrid => (Array.isArray(grids) ? grids[c] : (grids as OtfGrid));
  const sizes = new Set(inputs.map((_, c) => `${gridOf(c).fftWidth}×${gridOf(c).fftHeight}×${gridOf(c).marginPx}`));
  if (sizes.size !== 1) throw new Error('applyOtf: every plane must use tiles of one size');
  const { width, height } = inputs[0];
  const { fftWidth: fw, fftHeight: fh, marginPx: m } = gridOf(0);
  const innerW = Math.max(1, fw - 2 * m);
  const innerH = Math.max(1, fh - 2 * m);
  const jobs: TileJob[] = [];
  inputs.forEach((plane, c) => {
    for (let y0 = 0; y0 < height; y0 += innerH) for (let x0 = 0; x0 < width; x0 += innerW) jobs.push({ src: plane.data, grid: gridOf(c), out: outs[c], x0, y0 });
  });
  const plan = createFft2dPlan(fw, fh);
  const data = new Float64Array(2 * fw * fh);
  const colIndex = new Int32Array(fw);
  const load = (job: TileJob, part: 0 | 1): void => {
    for (let x = 0; x < fw; x++) colIndex[x] = mirrorIndex(job.x0 - m + x, width);
    for (let y = 0; y < fh; y++) {
      const row = mirrorIndex(job.y0 - m + y, height) * width;
      for (let x = 0; x < fw; x++) data[2 * (y * fw + x) + part] = job.src[row + colIndex[x]];
    }
  };
  const store = (job: TileJob, part: 0 | 1): void => {
    const yEnd = Math.min(height, job.y0 + innerH);
    const xEnd = Math.min(width, job.x0 + innerW);
    for (let y = job.y0; y < yEnd; y++) {
      const base = 2 * ((y - job.y0 + m) * fw + m - job.x0) + part;
      for (let x = job.x0; x < xEnd; x++) job.out[y * width + x] = data[base + 2 * x];
    }
  };
  // Two tiles share one transform when they are filtered by the same transfer.
  for (let j = 0; j < jobs.length;) {
    const pair = j + 1 < jobs.length && jobs[j + 1].grid === jobs[j].grid ? jobs.slice(j, j + 2) : jobs.slice(j, j + 1);
    j += pair.length;
    data.fill(0);
    pair.forEach((job, part) => load(job, part as 0 | 1));
    filterComplex(plan, data, pair[0].grid.transfer, pair[0].grid.transferIm);
    pair.forEach((job, part) => store(job, part as 0 | 1));
  }
}

/**
 * The transfer that turns what a reference eye does into what another eye does: sim / ref per bin,
 * the modulus never above 1 (a display cannot sharpen what the reference eye will blur). The
 * reference kernel is taken as point-symmetric (a real transfer); where it nearly vanishes the
 * quotient is bounded by the same rule.
 */
export function relativeOtfGrid(sim: OtfGrid, ref: OtfGrid): OtfGrid {
  if (sim.fftWidth !== ref.fftWidth || sim.fftHeight !== ref.fftHeight) throw new Error('relativeOtfGrid: grids of one size only');
  const n = sim.transfer.length;
  const transfer = new Float32Array(n);
  const transferIm = sim.transferIm ? new Float32Array(n) : undefined;
  for (let i = 0; i < n; i++) {
    const r = ref.transfer[i];
    const denominator = Math.sign(r || 1) * Math.max(Math.abs(r), 1e-3);
    let re = sim.transfer[i] / denominator;
    let im = sim.transferIm ? sim.transferIm[i] / denominator : 0;
    const modulus = Math.hypot(re, im);
    if (modulus > 1) {
      re /= modulus;
      im /= modulus;
    }
    transfer[i] = re;
    if (transferIm) transferIm[i] = im;
  }
  return { fftWidth: sim.fftWidth, fftHeight: sim.fftHeight, marginPx: Math.max(sim.marginPx, ref.marginPx), transfer, ...(transferIm ? { transferIm } : {}) };
}

/**
 * The grid multiplied by a radial transfer given per cycles per pixel (a new grid). The transfer's
 * own reach must fit in the grid's margin.
 */
export function scaleByRadialTransfer(grid: OtfGrid, transferOfCyclesPerPx: (f: number) => number): OtfGrid {
  const { fftWidth, fftHeight } = grid;
  const transfer = Float32Array.from(grid.transfer);
  const transferIm = grid.transferIm ? Float32Array.from(grid.transferIm) : undefined;
  for (let ky = 0; ky < fftHeight; ky++) {
    const fy = (ky <= fftHeight / 2 ? ky : ky - fftHeight) / fftHeight;
    for (let kx = 0; kx < fftWidth; kx++) {
      const fx = (kx <= fftWidth / 2 ? kx : kx - fftWidth) / fftWidth;
      const i = ky * fftWidth + kx;
      const t = transferOfCyclesPerPx(Math.sqrt(fx * fx + fy * fy));
      transfer[i] *= t;
      if (transferIm) transferIm[i] *= t;
    }
  }
  return { ...grid, transfer, ...(transferIm ? { transferIm } : {}) };
}
