/**
 * Where a frame's pixels subtend different angles (the edges of a flat screen, a wide rectilinear
 * eye buffer), one pixel kernel cannot hold the eye's PSF everywhere. The frame is filtered with
 * kernels made for a few pixel scales, geometrically spaced over the frame's range, and the results
 * are blended per pixel by linear interpolation in log(arcmin per pixel). By linearity this is
 * convolution with the per-pixel interpolated kernel.
 */

/** Largest ratio between neighbouring scales, and the most scales used. */
export const MAX_SCALE_STEP = 1.25;
export const MAX_SCALES = 4;

/** Pixel scales (arcmin per px) to make kernels for: one when the frame's range is small. */
export function kernelScales(arcminPerPx: Float32Array): number[] {
  let lo = Infinity;
  let hi = 0;
  for (const v of arcminPerPx) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  const ratio = hi / lo;
  if (ratio <= MAX_SCALE_STEP) return [Math.sqrt(lo * hi)];
  const count = Math.min(MAX_SCALES, Math.ceil(Math.log(ratio) / Math.log(MAX_SCALE_STEP)) + 1);
  return Array.from({ length: count }, (_, k) => lo * ratio ** (k / (count - 1)));
}

/** Per pixel: the lower scale index and the weight of the next one, by log-linear interpolation. */
export function scaleWeights(arcminPerPx: Float32Array, scales: readonly number[]): { lower: Uint8Array; upperWeight: Float32Array } {
  const lower = new Uint8Array(arcminPerPx.length);
  const upperWeight = new Float32Array(arcminPerPx.length);
  if (scales.length === 1) return { lower, upperWeight };
  const logs = scales.map(Math.log);
  for (let i = 0; i < arcminPerPx.length; i++) {
    const v = Math.log(arcminPerPx[i]);
    let k = 0;
    while (k < scales.length - 2 && v > logs[k + 1]) k++;
    lower[i] = k;
    upperWeight[i] = Math.min(1, Math.max(0, (v - logs[k]) / (logs[k + 1] - logs[k])));
  }
  return { lower, upperWeight };
}
