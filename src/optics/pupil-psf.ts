/**
 * Point-spread functions from the pupil function (Goodman, Introduction to Fourier Optics):
 * PSF = |FFT(P·exp(i·2π·W/λ))|², with angular sample spacing λ/(N·Δp) for an N-point transform of a
 * pupil sampled every Δp. The pupil spacing is chosen per wavelength so every wavelength lands on the
 * same angular grid.
 */
import { createFft2dPlan, fft2dForward } from './fft2d.js';
import { compileWavefront, type ZernikeTerm } from './zernike.js';

export interface PsfGrid {
  /** Samples per side (a power of two); the PSF's centre is sample (N/2, N/2). */
  size: number;
  /** Angular spacing of samples, radians. */
  sampleRad: number;
}

/**
 * Monochromatic PSF on the grid, normalised to sum 1; x to the right, y up (row N/2 + k is k samples
 * up). Needs sampleRad ≤ λ/(2D) so the pupil fits in half the transform (no aliasing).
 */
export function monochromaticPsf(pupilDiameterMm: number, wavelengthNm: number, terms: readonly ZernikeTerm[], grid: PsfGrid): Float64Array {
  const { size: n, sampleRad } = grid;
  const lambdaMm = wavelengthNm * 1e-6;
  const pupilStepMm = lambdaMm / (n * sampleRad);
  const radiusMm = pupilDiameterMm / 2;
  if (radiusMm / pupilStepMm > n / 2) throw new Error('PSF grid too coarse for this pupil: the pupil would alias');
  const data = new Float64Array(2 * n * n);
  const waveUm = wavelengthNm / 1000;
  const wavefront = compileWavefront(terms);
  // Only the pupil's bounding box holds light.
  const reach = Math.ceil(radiusMm / pupilStepMm) + 1;
  for (let y = Math.max(0, n / 2 - reach); y < Math.min(n, n / 2 + reach); y++) {
    const py = (y - n / 2) * pupilStepMm;
    for (let x = Math.max(0, n / 2 - reach); x < Math.min(n, n / 2 + reach); x++) {
      const px = (x - n / 2) * pupilStepMm;
      const rho = Math.sqrt(px * px + py * py) / radiusMm;
      if (rho > 1) continue;
      const phase = (2 * Math.PI * wavefront(rho, Math.atan2(py, px))) / waveUm;
      // Pupil centred on sample (n/2, n/2): shift it to the origin so the PSF comes out centred after the shift below.
      const i = 2 * (((y + n / 2) % n) * n + ((x + n / 2) % n));
      data[i] = Math.cos(phase);
      data[i + 1] = Math.sin(phase);
    }
  }
  fft2dForward(createFft2dPlan(n, n), data);
  const psf = new Float64Array(n * n);
  let sum = 0;
  for (let y = 0; y < n; y++) {
    for (let x = 0; x < n; x++) {
      const i = 2 * (y * n + x);
      const v = data[i] * data[i] + data[i + 1] * data[i + 1];
      // fftshift: frequency (0, 0) to the centre.
      psf[((y + n / 2) % n) * n + ((x + n / 2) % n)] = v;
      sum += v;
    }
  }
  for (let i = 0; i < psf.length; i++) psf[i] /= sum;
  return psf;
}

/**
 * Bins a PSF into frame pixels of `oversample` × `oversample` samples (odd), flipping y so rows go
 * down as in images. Returns an odd-sized kernel normalised to sum 1 (the energy outside the
 * window is redistributed, a loss reported by the caller as needed).
 */
export function binPsfToPixels(psf: Float64Array, grid: PsfGrid, oversample: number): { kernel: Float32Array; size: number } {
  if (oversample % 2 !== 1) throw new Error('oversample must be odd');
  const n = grid.size;
  const half = Math.floor((n / 2 - (oversample - 1) / 2 - 1) / oversample);
  const size = 2 * half + 1;
  const kernel = new Float32Array(size * size);
  const r = (oversample - 1) / 2;
  let sum = 0;
  for (let ky = 0; ky < size; ky++) {
    for (let kx = 0; kx < size; kx++) {
      const cx = n / 2 + (kx - half) * oversample;
      const cy = n / 2 - (ky - half) * oversample;
      let acc = 0;
      for (let dy = -r; dy <= r; dy++) for (let dx = -r; dx <= r; dx++) acc += psf[(cy + dy) * n + cx + dx];
      kernel[ky * size + kx] = acc;
      sum += acc;
    }
  }
  for (let i = 0; i < kernel.length; i++) kernel[i] /= sum;
  return { kernel, size };
}

/** Radially averaged MTF of a PSF at a frequency in cycles/deg (bilinear OTF sampling around a circle). */
export function radialMtf(psf: Float64Array, grid: PsfGrid, frequencyCpd: number): number {
  const otf = otfMagnitude(psf, grid.size);
  return radialAverage(otf, grid, frequencyCpd);
}

/** |OTF| of a PSF, normalised to 1 at zero frequency, zero frequency at the centre. */
export function otfMagnitude(psf: Float64Array, n: number): Float64Array {
  const data = new Float64Array(2 * n * n);
  for (let i = 0; i < n * n; i++) data[2 * i] = psf[i];
  fft2dForward(createFft2dPlan(n, n), data);
  const out = new Float64Array(n * n);
  const dc = Math.hypot(data[0], data[1]);
  for (let y = 0; y < n; y++) for (let x = 0; x < n; x++) {
    const i = 2 * (y * n + x);
    out[((y + n / 2) % n) * n + ((x + n / 2) % n)] = Math.hypot(data[i], data[i + 1]) / dc;
  }
  return out;
}

export function radialAverage(otf: Float64Array, grid: PsfGrid, frequencyCpd: number): number {
  const n = grid.size;
  // Bin spacing of the transform: 1/(N·sample) cycles per radian.
  const radiusBins = (frequencyCpd * (180 / Math.PI)) * n * grid.sampleRad;
  if (radiusBins >= n / 2 - 1) return 0;
  let sum = 0;
  const steps = 64;
  for (let k = 0; k < steps; k++) {
    const a = (2 * Math.PI * k) / steps;
    const x = n / 2 + radiusBins * Math.cos(a);
    const y = n / 2 + radiusBins * Math.sin(a);
    const x0 = Math.floor(x);
    const y0 = Math.floor(y);
    const fx = x - x0;
    const fy = y - y0;
    sum += (otf[y0 * n + x0] * (1 - fx) + otf[y0 * n + x0 + 1] * fx) * (1 - fy) + (otf[(y0 + 1) * n + x0] * (1 - fx) + otf[(y0 + 1) * n + x0 + 1] * fx) * fy;
  }
  return sum / steps;
}

/** Diameter (arcmin) of the circle around the PSF's centroid holding a fraction of its energy. */
export function encircledEnergyDiameterArcmin(psf: Float64Array, grid: PsfGrid, fraction: number): number {
  const n = grid.size;
  let cx = 0;
  let cy = 0;
  for (let y = 0; y < n; y++) for (let x = 0; x < n; x++) {
    cx += x * psf[y * n + x];
    cy += y * psf[y * n + x];
  }
  // Radial histogram in quarter-sample bins, then the cumulative sum.
  const binsPerSample = 4;
  const bins = new Float64Array(Math.ceil(n * Math.SQRT2 * binsPerSample) + 1);
  for (let y = 0; y < n; y++) for (let x = 0; x < n; x++) {
    bins[Math.floor(Math.sqrt((x - cx) ** 2 + (y - cy) ** 2) * binsPerSample)] += psf[y * n + x];
  }
  let acc = 0;
  for (let b = 0; b < bins.length; b++) {
    acc += bins[b];
    if (acc >= fraction) return (2 * (b + 1) * grid.sampleRad * ((180 / Math.PI) * 60)) / binsPerSample;
  }
  return n * grid.sampleRad * ((180 / Math.PI) * 60);
}
