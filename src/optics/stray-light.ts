/**
 * Stray light in the eye: the CIE general disability glare equation (CIE 146/147:2002, CIE 180:2010),
 * used as the wide-angle part of the eye's PSF. L_veil/E_glare (sr⁻¹) at θ (deg, 0.1° < θ < 100°):
 *   10/θ³ + [5/θ² + 0.1·p/θ]·[1 + (A/62.5)⁴] + 0.0025·p,
 * A the age in years, p the eye's pigmentation (0 very dark … 1.2 very light blue).
 */
import { DEG_PER_RAD } from '../units.js';

/** Validity range of the equation, deg (CIE 146/147:2002). */
export const GLARE_MIN_DEG = 0.1;
export const GLARE_MAX_DEG = 100;
/**
 * Inner angle from which the glare equation is applied as a veil, deg (our proposal): inside 1° the
 * wavefront PSF already models the spread of light; the Stiles–Holladay range starts at 1° too.
 */
export const VEIL_FROM_DEG = 1;

/**
 * Fraction of the light from a point scattered to angles between two limits:
 * ∫ PSF(θ)·2π·sin θ dθ, by Simpson's rule in log θ.
 */
export function scatteredFraction(fromDeg: number, toDeg: number, ageYears: number, pigmentation: number): number {
  const steps = 2000;
  const a = Math.log(fromDeg);
  const h = (Math.log(toDeg) - a) / steps;
  let sum = 0;
  for (let i = 0; i <= steps; i++) {
    const thetaDeg = Math.exp(a + i * h);
    // dθ = θ·d(ln θ); the solid angle element is 2π·sin θ·dθ with θ in radians.
    const f = cieGlarePsfPerSr(thetaDeg, ageYears, pigmentation) * 2 * Math.PI * Math.sin(thetaDeg / DEG_PER_RAD) * (thetaDeg / DEG_PER_RAD);
    sum += f * (i === 0 || i === steps ? 1 : i % 2 === 1 ? 4 : 2);
  }
  return (sum * h) / 3;
}

export function cieGlarePsfPerSr(thetaDeg: number, ageYears: number, pigmentation: number): number {
  if (thetaDeg < GLARE_MIN_DEG || thetaDeg > GLARE_MAX_DEG) return 0;
  return 10 / thetaDeg ** 3 + (5 / thetaDeg ** 2 + (0.1 * pigmentation) / thetaDeg) * (1 + (ageYears / 62.5) ** 4) + 0.0025 * pigmentation;
}

/**
 * The glare PSF sampled on a square grid of pixels of `pixelDeg`, each value the mean of the PSF
 * over the pixel (4×4 sub-samples) times the pixel's solid angle: the fraction of the light from the
 * centre scattered into that pixel. `radiusPx` pixels each side. The sum is the scattered fraction.
 */
export function glareKernel(pixelDeg: number, radiusPx: number, ageYears: number, pigmentation: number, fromDeg = GLARE_MIN_DEG): { kernel: Float32Array; size: number; scatteredFraction: number } {
  const size = 2 * radiusPx + 1;
  const kernel = new Float32Array(size * size);
  const sub = 4;
  const pixelSr = (pixelDeg / DEG_PER_RAD) ** 2;
  // The PSF is smooth beyond the cut-off circle: pixels clear of it (by a pixel) and of the centre take
  // their centre's value; the others are averaged over 4 × 4 sub-samples. The kernel has the square's
  // eight-fold symmetry, so one octant is computed.
  const valueAt = (x: number, y: number): number => {
    const r = Math.sqrt(x * x + y * y) * pixelDeg;
    if (r - 0.75 * pixelDeg >= fromDeg && r > 3 * pixelDeg) return cieGlarePsfPerSr(r, ageYears, pigmentation);
    let acc = 0;
    for (let sy = 0; sy < sub; sy++) for (let sx = 0; sx < sub; sx++) {
      const theta = Math.hypot((x + (sx + 0.5) / sub - 0.5) * pixelDeg, (y + (sy + 0.5) / sub - 0.5) * pixelDeg);
      if (theta >= fromDeg) acc += cieGlarePsfPerSr(theta, ageYears, pigmentation);
    }
    return acc / (sub * sub);
  };
  let total = 0;
  for (let y = 0; y <= radiusPx; y++) {
    for (let x = y; x <= radiusPx; x++) {
      const v = Math.fround(valueAt(x, y) * pixelSr);
      const points = new Set([[x, y], [y, x], [-x, y], [-y, x], [x, -y], [y, -x], [-x, -y], [-y, -x]].map(([a, b]) => (b + radiusPx) * size + a + radiusPx));
      for (const i of points) kernel[i] = v;
      total += v * points.size;
    }
  }
  return { kernel, size, scatteredFraction: total };
}
