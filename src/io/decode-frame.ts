/**
 * Decoding a frame file into linear light. The only place that sees encoded bytes of frames.
 * sharp converts an embedded ICC profile (e.g. Display P3) to sRGB while decoding; alpha is composited
 * over the stated background in encoded values, as a compositor does; then sRGB is decoded to linear once.
 */
import sharp, { type Metadata, type OutputInfo } from 'sharp';
import { srgbToLinear } from '../colour/srgb.js';
import { InputError } from '../errors.js';
import { createLinearRgb, type LinearRgb } from '../image/plane.js';

export interface FrameInfo {
  widthPx: number;
  heightPx: number;
  format: string;
  bitsPerChannel: 8 | 16;
  hadAlpha: boolean;
  /** Description of the embedded ICC profile, when there was one. */
  iccProfile?: string;
}

/** Largest frame accepted, in pixels (about 16k × 16k); beyond this memory, not the model, is the limit. */
export const MAX_FRAME_PIXELS = 16384 * 16384;

let lut8: Float32Array | undefined;
let lut16: Float32Array | undefined;

function decodeLut(levels: number): Float32Array {
  const lut = new Float32Array(levels);
  for (let i = 0; i < levels; i++) lut[i] = srgbToLinear(i / (levels - 1));
  return lut;
}

export async function decodeFrame(bytes: Uint8Array, file: string, backgroundRgb: readonly [number, number, number]): Promise<{ image: LinearRgb; info: FrameInfo }> {
  let meta: Metadata;
  try {
    meta = await sharp(bytes, { limitInputPixels: MAX_FRAME_PIXELS }).metadata();
  } catch (err) {
    throw new InputError(file, `is not an image eyeproof can read (${(err as Error).message})`, 'Give a PNG (8 or 16-bit), JPEG or WebP frame.');
  }
  if (!meta.width || !meta.height || !['png', 'jpeg', 'webp'].includes(meta.format ?? '')) {
    throw new InputError(file, `is a ${meta.format ?? 'unknown'} file`, 'Give a PNG (8 or 16-bit), JPEG or WebP frame; convert other formats first.');
  }
  const sixteen = meta.depth === 'ushort';
  let raw: { data: Buffer; info: OutputInfo };
  try {
    let pipeline = sharp(bytes, { limitInputPixels: MAX_FRAME_PIXELS }).autoOrient();
    // 8-bit input with a profile is converted to sRGB by default; 16-bit needs the transform asked
    // for explicitly, or it would keep the profile's code values.
    if (sixteen && meta.icc) pipeline = pipeline.withIccProfile('srgb');
    raw = await pipeline
      .toColourspace(sixteen ? 'rgb16' : 'srgb')
      .ensureAlpha()
      .raw(sixteen ? { depth: 'ushort' } : {})
      .toBuffer({ resolveWithObject: true });
  } catch (err) {
    throw new InputError(file, `could not be decoded (${(err as Error).message})`, 'Check that the file is complete and not damaged; re-export it from the design tool.');
  }
  const { width, height } = raw.info;
  const max = sixteen ? 65535 : 255;
  const values = sixteen ? new Uint16Array(raw.data.buffer, raw.data.byteOffset, raw.data.length / 2) : raw.data;
  const lut = sixteen ? (lut16 ??= decodeLut(65536)) : (lut8 ??= decodeLut(256));
  const image = createLinearRgb(width, height);
  const bg = backgroundRgb.map((v) => (v / 255) * max);
  let hadAlpha = false;
  for (let i = 0, p = 0; i < width * height; i++, p += 4) {
    const alpha = values[p + 3];
    if (alpha === max) {
      image.planes[0][i] = lut[values[p]];
      image.planes[1][i] = lut[values[p + 1]];
      image.planes[2][i] = lut[values[p + 2]];
      continue;
    }
    hadAlpha = true;
    const a = alpha / max;
    for (let c = 0; c < 3; c++) image.planes[c as 0 | 1 | 2][i] = lut[Math.round(values[p + c] * a + bg[c] * (1 - a))];
  }
  return {
    image,
    info: {
      widthPx: width, heightPx: height, format: meta.format!, bitsPerChannel: sixteen ? 16 : 8, hadAlpha,
      ...(meta.icc ? { iccProfile: iccDescription(meta.icc) } : {}),
    },
  };
}

/** The profile's description tag ('desc'), read from the ICC header's tag table. */
function iccDescription(icc: Buffer): string {
  try {
    const count = icc.readUInt32BE(128);
    for (let t = 0; t < count; t++) {
      const base = 132 + t * 12;
      if (icc.toString('ascii', base, base + 4) !== 'desc') continue;
      const offset = icc.readUInt32BE(base + 4);
      const type = icc.toString('ascii', offset, offset + 4);
      if (type === 'desc') return icc.toString('ascii', offset + 12, offset + 12 + icc.readUInt32BE(offset + 8) - 1);
      if (type === 'mluc') {
        const len = icc.readUInt32BE(offset + 20);
        const start = offset + icc.readUInt32BE(offset + 24);
        return Buffer.from(icc.subarray(start, start + len)).swap16().toString('utf16le');
      }
    }
  } catch {
    // A malformed tag table only costs us the profile's name.
  }
  return 'embedded ICC profile';
}
