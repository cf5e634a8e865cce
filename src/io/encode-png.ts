/** Encoding images to PNG bytes: linear light is encoded to sRGB once, here. */
import sharp from 'sharp';
import { srgbToLinear } from '../colour/srgb.js';
import type { LinearRgb } from '../image/plane.js';

/**
 * Linear values at which the 8-bit sRGB code steps up: code k + 1 begins where the encoded value
 * reaches (k + 0.5)/255. Encoding searches these, so every code decodes and re-encodes to itself.
 */
let thresholds: Float32Array | undefined;

function codeThresholds(): Float32Array {
  if (thresholds) return thresholds;
  thresholds = new Float32Array(255);
  for (let k = 0; k < 255; k++) thresholds[k] = srgbToLinear((k + 0.5) / 255);
  return thresholds;
}

/** Linear RGB to interleaved 8-bit sRGB RGBA (opaque), clamped to the display's range, rounded exactly. */
export function linearToRgba8(image: LinearRgb): Uint8ClampedArray {
  const t = codeThresholds();
  const n = image.width * image.height;
  const out = new Uint8ClampedArray(n * 4);
  for (let c = 0; c < 3; c++) {
    const plane = image.planes[c];
    for (let i = 0; i < n; i++) {
      const v = plane[i];
      // Binary search for the number of thresholds at or below v: the code.
      let lo = 0;
      let hi = 255;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (t[mid] <= v) lo = mid + 1;
        else hi = mid;
      }
      out[i * 4 + c] = lo;
    }
  }
  for (let i = 0; i < n; i++) out[i * 4 + 3] = 255;
  return out;
}

/** Interleaved RGBA bytes to a PNG, tagged as sRGB. */
export async function encodeRgba8Png(rgba: Uint8ClampedArray | Uint8Array, width: number, height: number): Promise<Buffer> {
  return sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width, height, channels: 4 } })
    .removeAlpha()
    .png({ compressionLevel: 6, adaptiveFiltering: false })
    .toBuffer();
}
