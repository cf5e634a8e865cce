/**
 * Stray light over the real field of view: the CIE glare PSF beyond 1° (VEIL_FROM_DEG; inside it the
 * wavefront PSF holds the spread) integrated over the frame and the surround it sits in. The field is
 * the frame's luminance inside the frame and the surround's luminance outside, so
 *   veil = G ⊛ field = G ⊛₀ (frame − surround) + surround · s,
 * with ⊛₀ a convolution that sees nothing beyond the frame's edges and s the share of a point's light
 * the glare PSF scatters beyond 1° (to 100°, the equation's range); the core keeps 1 − s. The glare
 * PSF is smooth beyond 1°, so the convolution runs on the frame reduced until its long side is at
 * most 160 px, by one FFT, and the veil is expanded back. Pixels are taken to subtend their angle at
 * the gaze everywhere (a simplification for frames wider than about 60°).
 *
 * For the same-display percept only what the simulated eye scatters beyond the reference eye is
 * added, and its core is dimmed only as much more as it scatters (never brightened).
 */
import type { LinearRgb } from '../image/plane.js';
import { expand7, reduce7, reducedSize } from '../image/binomial.js';
import { LUMINANCE_WEIGHTS } from '../colour/srgb.js';
import { createFft2dPlan, fft2dForward, nextPowerOfTwo } from './fft2d.js';
import { GLARE_MAX_DEG, glareKernel, scatteredFraction, VEIL_FROM_DEG } from './stray-light.js';

const MAX_LOW_RES_SIDE = 160;

export interface GlareEye {
  ageYears: number;
  pigmentation: number;
}

export interface VeilInput {
  /** Angular size of a frame pixel at the gaze, arcmin. */
  arcminPerPx: number;
  /** The eye whose stray light is added. */
  eye: GlareEye;
  /** Same-display: the reference eye, whose own stray light the viewer of the picture adds. */
  reference?: GlareEye;
  /** Display luminances, cd/m²: frame value v is v·(peak − black) + black. */
  peakLuminanceCdM2: number;
  blackLuminanceCdM2: number;
  /** Luminance of what surrounds the frame in the field of view, cd/m². */
  surroundLuminanceCdM2: number;
}

export interface VeilResult {
  /** Share of a point's light the eye scatters beyond 1° (to 100°). */
  scatteredFraction: number;
  /** Factor applied to the image before the veil is added. */
  coreScale: number;
  /** Veil added at the frame's centre pixel, in frame units (1 = display white above black). */
  veilAtCentre: number;
  /**
   * The viewer's own stray light (all of it, also in the same-display mode), as luminance relative to
   * the display's white, on the reduced grid: `values[y·width + x]` covers frame pixels from
   * (x·scaleX, y·scaleY). Used for the contrast that reaches the retina at each label.
   */
  viewerVeil: { width: number; height: number; scaleX: number; scaleY: number; values: Float32Array };
}

/** The viewer's veil (relative to display white) at a frame pixel. */
export function viewerVeilAt(veil: VeilResult, xPx: number, yPx: number): number {
  const v = veil.viewerVeil;
  const x = Math.min(v.width - 1, Math.max(0, Math.floor(xPx / v.scaleX)));
  const y = Math.min(v.height - 1, Math.max(0, Math.floor(yPx / v.scaleY)));
  return v.values[y * v.width + x];
}

/** Adds the veil to `image` in place. */
export function addVeil(image: LinearRgb, input: VeilInput): VeilResult {
  const { width, height } = image;
  const range = input.peakLuminanceCdM2 - input.blackLuminanceCdM2;
  const black = input.blackLuminanceCdM2;
  const surround = input.surroundLuminanceCdM2;

  // Reduce to the low-resolution grid.
  const sizes: [number, number][] = [[width, height]];
  while (Math.max(...sizes[sizes.length - 1]) > MAX_LOW_RES_SIDE) sizes.push(reducedSize(...sizes[sizes.length - 1]));
  const levels = sizes.length - 1;
  const [lw, lh] = sizes[levels];
  const pixelDeg = (input.arcminPerPx * 2 ** levels) / 60;
  const rows = new Float32Array(width * height);
  const low = image.planes.map((plane) => {
    let cur = plane;
    for (let k = 0; k < levels; k++) {
      const next = new Float32Array(sizes[k + 1][0] * sizes[k + 1][1]);
      reduce7(cur, sizes[k][0], sizes[k][1], next, rows);
      cur = next;
    }
    return cur;
  });

  // The kernel reaches across the whole frame (its diagonal), but not beyond the equation's range.
  const radiusPx = Math.min(Math.ceil(Math.hypot(lw, lh)), Math.floor(GLARE_MAX_DEG / pixelDeg));
  const own = glareKernel(pixelDeg, radiusPx, input.eye.ageYears, input.eye.pigmentation, VEIL_FROM_DEG);
  const ownTotal = scatteredFraction(VEIL_FROM_DEG, GLARE_MAX_DEG, input.eye.ageYears, input.eye.pigmentation);
  let kernel = own.kernel;
  let surroundShare = ownTotal;
  let coreScale = 1 - ownTotal;
  if (input.reference) {
    const ref = glareKernel(pixelDeg, radiusPx, input.reference.ageYears, input.reference.pigmentation, VEIL_FROM_DEG);
    const refTotal = scatteredFraction(VEIL_FROM_DEG, GLARE_MAX_DEG, input.reference.ageYears, input.reference.pigmentation);
    kernel = own.kernel.map((v, i) => Math.max(0, v - ref.kernel[i]));
    surroundShare = Math.max(0, ownTotal - refTotal);
    coreScale = Math.min(1, (1 - ownTotal) / (1 - refTotal));
  }

  // Linear convolution of the frame (zero outside it) by one FFT of at least frame + radius.
  const fw = nextPowerOfTwo(lw + radiusPx + 1);
  const fh = nextPowerOfTwo(lh + radiusPx + 1);
  const plan = createFft2dPlan(fw, fh);
  const size = 2 * radiusPx + 1;
  const k = new Float64Array(2 * fw * fh);
  for (let y = 0; y < size; y++) {
    const yy = (y - radiusPx + fh) % fh;
    for (let x = 0; x < size; x++) k[2 * (yy * fw + ((x - radiusPx + fw) % fw))] = kernel[y * size + x];
  }
  fft2dForward(plan, k);
  const veils = low.map(() => new Float32Array(lw * lh));
  // Two channels share one complex transform (real and imaginary parts); the kernel is real.
  for (let c = 0; c < 3; c += 2) {
    const data = new Float64Array(2 * fw * fh);
    for (let part = 0; part < 2 && c + part < 3; part++) {
      const src = low[c + part];
      for (let y = 0; y < lh; y++) for (let x = 0; x < lw; x++) data[2 * (y * fw + x) + part] = src[y * lw + x] * range + black - surround;
    }
    fft2dForward(plan, data);
    for (let i = 0; i < fw * fh; i++) {
      const [a, b, kr, ki] = [data[2 * i], data[2 * i + 1], k[2 * i], k[2 * i + 1]];
      data[2 * i] = a * kr - b * ki;
      data[2 * i + 1] = a * ki + b * kr;
    }
    // Inverse by conjugation: conj(FFT(conj(X))) / N.
    for (let i = 1; i < data.length; i += 2) data[i] = -data[i];
    fft2dForward(plan, data);
    const n = fw * fh;
    for (let part = 0; part < 2 && c + part < 3; part++) {
      const sign = part === 0 ? 1 : -1;
      const out = veils[c + part];
      for (let y = 0; y < lh; y++) for (let x = 0; x < lw; x++) out[y * lw + x] = (sign * data[2 * (y * fw + x) + part]) / n;
    }
  }

  // The viewer's own veil of luminance, relative to white: the applied veil without a reference eye,
  // one more transform with the viewer's own kernel with one.
  const viewerValues = new Float32Array(lw * lh);
  const [wr, wg, wb] = LUMINANCE_WEIGHTS;
  const peak = input.peakLuminanceCdM2;
  if (!input.reference) {
    for (let i = 0; i < lw * lh; i++) viewerValues[i] = (wr * veils[0][i] + wg * veils[1][i] + wb * veils[2][i] + surround * ownTotal) / peak;
  } else {
    const ko = new Float64Array(2 * fw * fh);
    for (let y = 0; y < size; y++) {
      const yy = (y - radiusPx + fh) % fh;
      for (let x = 0; x < size; x++) ko[2 * (yy * fw + ((x - radiusPx + fw) % fw))] = own.kernel[y * size + x];
    }
    fft2dForward(plan, ko);
    const data = new Float64Array(2 * fw * fh);
    for (let y = 0; y < lh; y++) for (let x = 0; x < lw; x++) {
      const i = y * lw + x;
      data[2 * (y * fw + x)] = (wr * low[0][i] + wg * low[1][i] + wb * low[2][i]) * range + black - surround;
    }
    fft2dForward(plan, data);
    for (let i = 0; i < fw * fh; i++) {
      const [a, b, kr, ki] = [data[2 * i], data[2 * i + 1], ko[2 * i], ko[2 * i + 1]];
      data[2 * i] = a * kr - b * ki;
      data[2 * i + 1] = -(a * ki + b * kr);
    }
    fft2dForward(plan, data);
    const n = fw * fh;
    for (let y = 0; y < lh; y++) for (let x = 0; x < lw; x++) viewerValues[y * lw + x] = (data[2 * (y * fw + x)] / n + surround * ownTotal) / peak;
  }
  const viewerVeil = { width: lw, height: lh, scaleX: width / lw, scaleY: height / lh, values: viewerValues };

  // Back to full size, in frame units: v_out = core·v + (veil + surround·s − (1 − core)·black… ) / range.
  const offset = surround * surroundShare - (1 - coreScale) * black;
  let veilAtCentre = 0;
  image.planes.forEach((plane, c) => {
    let cur = veils[c];
    for (let lvl = levels - 1; lvl >= 0; lvl--) {
      const next = new Float32Array(sizes[lvl][0] * sizes[lvl][1]);
      expand7(cur, sizes[lvl + 1][0], sizes[lvl + 1][1], next, sizes[lvl][0], sizes[lvl][1], rows);
      cur = next;
    }
    for (let i = 0; i < plane.length; i++) plane[i] = coreScale * plane[i] + (cur[i] + offset) / range;
    if (c === 1) veilAtCentre = (cur[Math.floor(height / 2) * width + Math.floor(width / 2)] + surround * surroundShare) / range;
  });
  return { scatteredFraction: ownTotal, coreScale, veilAtCentre, viewerVeil };
}
