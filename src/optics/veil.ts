/**
 * Applying stray light beyond 1° (VEIL_FROM_DEG): the glare PSF is smooth away from its centre, so it is convolved at reduced
 * resolution (the frame reduced until its long side is at most 200 px) and expanded back. The
 * scattered fraction comes out of the sharp core, so light is conserved. Beyond the frame's edges
 * the surround is taken to mirror the frame (as in every other convolution here).
 */
import type { LinearRgb, Plane } from '../image/plane.js';
import { expand, reduce } from '../retina/pyramid.js';
import { applyOtf, otfGridFromKernel } from './apply-otf.js';
import { GLARE_MAX_DEG, glareKernel, VEIL_FROM_DEG } from './stray-light.js';

const MAX_LOW_RES_SIDE = 200;

export interface StrayLightInput {
  arcminPerPx: number;
  ageYears: number;
  pigmentation: number;
}

/** Adds the veil to `image` in place (scaling its core by 1 − scattered fraction); returns the fraction. */
export function addStrayLight(image: LinearRgb, input: StrayLightInput): number {
  const { width, height } = image;
  let levels = 0;
  while (Math.max(width, height) / 2 ** levels > MAX_LOW_RES_SIDE) levels++;
  const pixelDeg = (input.arcminPerPx * 2 ** levels) / 60;
  const lowPlanes: Plane[] = image.planes.map((data) => {
    let p: Plane = { width, height, data };
    for (let k = 0; k < levels; k++) p = reduce(p);
    return p;
  });
  const { width: lw, height: lh } = lowPlanes[0];
  const radiusPx = Math.min(Math.max(lw, lh), Math.floor(GLARE_MAX_DEG / pixelDeg));
  const { kernel, size, scatteredFraction } = glareKernel(pixelDeg, radiusPx, input.ageYears, input.pigmentation, VEIL_FROM_DEG);
  const grid = otfGridFromKernel(lw, lh, kernel, size);
  const veils = lowPlanes.map(() => new Float32Array(lw * lh));
  applyOtf(lowPlanes, veils, grid);
  image.planes.forEach((data, c) => {
    // Back up through the pyramid sizes to full resolution.
    const sizes: [number, number][] = [[width, height]];
    for (let k = 0; k < levels; k++) sizes.push([Math.ceil(sizes[k][0] / 2), Math.ceil(sizes[k][1] / 2)]);
    let v: Plane = { width: lw, height: lh, data: veils[c] };
    for (let k = levels - 1; k >= 0; k--) v = expand(v, sizes[k][0], sizes[k][1]);
    for (let i = 0; i < data.length; i++) data[i] = (1 - scatteredFraction) * data[i] + v.data[i];
  });
  return scatteredFraction;
}
