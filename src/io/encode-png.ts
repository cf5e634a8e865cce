/** Encoding images to PNG bytes: linear light is encoded to sRGB once, here. */
import sharp from 'sharp';
import { linearToSrgb } from '../colour/srgb.js';
import type { LinearRgb } from '../image/plane.js';

/** 4096-entry table from linear light to 8-bit sRGB; finer steps near black where sRGB is steep. */
const ENCODE_STEPS = 4096;
let encodeLut: Uint8Array | undefined;

function lut(): Uint8Array {
  if (encodeLut) return encodeLut;
  encodeLut = new Uint8Array(ENCODE_STEPS + 1);
  for (let i = 0; i <= ENCODE_STEPS; i++) encodeLut[i] = Math.round(linearToSrgb(Math.pow(i / ENCODE_STEPS, 2)) * 255);
  return encodeLut;
}

/** Linear RGB to interleaved 8-bit sRGB RGBA (opaque), clamped to the display's range. */
export function linearToRgba8(image: LinearRgb): Uint8ClampedArray {
  const table = lut();
  const n = image.width * image.height;
  const out = new Uint8ClampedArray(n * 4);
  for (let c = 0; c < 3; c++) {
    const plane = image.planes[c];
    for (let i = 0; i < n; i++) {
      const v = plane[i];
      // The table is indexed by sqrt(linear) so dark values get as many steps as bright ones.
      const idx = v <= 0 ? 0 : v >= 1 ? ENCODE_STEPS : Math.round(Math.sqrt(v) * ENCODE_STEPS);
      out[i * 4 + c] = table[idx];
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
