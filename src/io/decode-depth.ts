/**
 * Depth maps: a 16-bit greyscale PNG whose values are distances from the eye in a stated unit
 * (0 = no depth: the display's own distance is used there).
 */
import sharp, { type OutputInfo } from 'sharp';
import { InputError } from '../errors.js';
import { decoderTrouble, probeImage } from './decode-frame.js';

export const DEPTH_UNITS = { mm: 0.001, cm: 0.01, m: 1 } as const;
export type DepthUnit = keyof typeof DEPTH_UNITS;

/** Distances in metres per pixel; NaN where the map holds 0. */
export async function decodeDepthMap(bytes: Uint8Array, file: string, unit: DepthUnit, widthPx: number, heightPx: number): Promise<Float32Array> {
  let raw: { data: Buffer; info: OutputInfo };
  const meta = await probeImage(bytes, file);
  if (meta.format !== 'png' || meta.depth !== 'ushort') {
    throw new InputError(file, `is a ${meta.format} image with ${meta.depth} samples, not a 16-bit PNG`, 'Save the depth map as a 16-bit greyscale PNG with distances in the unit given by --depth-unit.');
  }
  // The size is checked from the header, before the pixels are decoded.
  if (meta.width !== widthPx || meta.height !== heightPx) {
    throw new InputError(file, `is ${meta.width}×${meta.height} px but the frame is ${widthPx}×${heightPx} px`, 'Give a depth map of the frame\'s size.');
  }
  try {
    // Kept in 16-bit grey: other pipelines would reduce the values to 8 bits.
    raw = await sharp(bytes, { failOn: 'error' }).toColourspace('grey16').raw({ depth: 'ushort' }).toBuffer({ resolveWithObject: true });
  } catch (err) {
    throw new InputError(file, `cannot be read as a depth map: it ${decoderTrouble(err)}`, 'Give a 16-bit greyscale PNG.');
  }
  if (raw.info.width !== widthPx || raw.info.height !== heightPx) {
    throw new InputError(file, `is ${raw.info.width}×${raw.info.height} px but the frame is ${widthPx}×${heightPx} px`, 'Give a depth map of the frame\'s size.');
  }
  const values = new Uint16Array(raw.data.buffer, raw.data.byteOffset, raw.data.length / 2);
  const scale = DEPTH_UNITS[unit];
  const out = new Float32Array(values.length);
  for (let i = 0; i < values.length; i++) out[i] = values[i] === 0 ? Number.NaN : values[i] * scale;
  return out;
}
