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

/** Bins of the linear range [0, 1] for the code look-up; every code spans more than one bin. */
const BINS = 65536;
let binCodes: Uint8Array | undefined;

/** The code at the lower edge of each bin: a pixel's code is that or a step or two above. */
function codesByBin(t: Float32Array): Uint8Array {
  if (binCodes) return binCodes;
  binCodes = new Uint8Array(BINS + 1);
  let code = 0;
  for (let bin = 0; bin <= BINS; bin++) {
    const v = bin / BINS;
    while (code < 255 && t[code] <= v) code++;
    binCodes[bin] = code;
  }
  return binCodes;
}

/** Linear RGB to interleaved 8-bit sRGB RGBA (opaque), clamped to the display's range, rounded exactly. */
export function linearToRgba8(image: LinearRgb): Uint8ClampedArray {
  const t = codeThresholds();
  const codes = codesByBin(t);
  const n = image.width * image.height;
  const out = new Uint8ClampedArray(n * 4);
  for (let c = 0; c < 3; c++) {
    const plane = image.planes[c];
    for (let i = 0; i < n; i++) {
      const v = plane[i];
      let code: number;
      if (!(v > 0)) code = 0;
      else if (v >= 1) code = 255;
      else {
        // The number of thresholds at or below v: start from the bin's code and step up.
        code = codes[Math.floor(v * BINS)];
        while (code < 255 && t[code] <= v) code++;
      }
      out[i * 4 + c] = code;
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
