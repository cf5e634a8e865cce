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

/**
 * Largest frame proofed by default, in pixels: 3840 × 2160. A proof needs about 350 bytes of memory
 * per frame pixel at this size (README, performance), so about 3 GB; larger frames are refused before
 * decoding unless a larger limit is given (`--max-pixels`).
 */
export const DEFAULT_MAX_FRAME_PIXELS = 3840 * 2160;
/** Memory a proof needs per frame pixel, bytes (measured by the bench at 4K, rounded up). */
export const BYTES_PER_FRAME_PIXEL = 350;
/** Largest frame the decoder is ever asked to open, whatever the limit given (16k × 16k). */
export const MAX_FRAME_PIXELS = 16384 * 16384;

/** The decoder's complaint in plain words. */
export function decoderTrouble(err: unknown): string {
  const message = String((err as Error)?.message ?? err);
  if (/unsupported image format/i.test(message)) return 'is not a PNG, JPEG or WebP image (or its first bytes are damaged)';
  if (/corrupt header/i.test(message)) return 'has a damaged header';
  if (/exceeds pixel limit/i.test(message)) return 'is larger than the decoder may open';
  if (/premature end|truncated|unexpected end|read error|not enough data/i.test(message)) return 'ends early or has damaged image data';
  if (/crc|checksum|bad adler|invalid (?:block|distance|code)|IDAT/i.test(message)) return 'has damaged image data (a checksum does not match)';
  return `could not be decoded (the decoder said: ${message.split('\n')[0].slice(0, 120) || 'nothing more'})`;
}

/** The image's format and size from its header, without decoding the pixels. */
export async function probeImage(bytes: Uint8Array, file: string): Promise<{ width: number; height: number; format: string; depth?: string }> {
  let meta: Metadata;
  try {
    meta = await sharp(bytes, { limitInputPixels: false }).metadata();
  } catch (err) {
    throw new InputError(file, decoderTrouble(err), 'Give a PNG (8 or 16-bit), JPEG or WebP frame; re-export it if it was damaged.');
  }
  if (!meta.width || !meta.height || !['png', 'jpeg', 'webp'].includes(meta.format ?? '')) {
    throw new InputError(file, `is a ${meta.format ?? 'unknown'} file`, 'Give a PNG (8 or 16-bit), JPEG or WebP frame; convert other formats first.');
  }
  return { width: meta.width, height: meta.height, format: meta.format!, depth: meta.depth };
}

/** Refuses a frame above the pixel limit, before any decoding, saying how to proceed. */
export function checkFramePixels(width: number, height: number, file: string, maxPixels: number): void {
  if (width * height <= maxPixels) return;
  const gb = (pixels: number): string => ((pixels * BYTES_PER_FRAME_PIXEL) / 2 ** 30).toFixed(1);
  throw new InputError(file, `is ${width}×${height} px (${(width * height / 1e6).toFixed(1)} million pixels), above the limit of ${(maxPixels / 1e6).toFixed(1)} million (a proof needs about ${gb(width * height)} GB at this size)`,
    `Export the frame at the display's resolution, or allow it with --max-pixels ${width * height} if the machine has the memory.`);
}

let lut8: Float32Array | undefined;
let lut16: Float32Array | undefined;

function decodeLut(levels: number): Float32Array {
  const lut = new Float32Array(levels);
  for (let i = 0; i < levels; i++) lut[i] = srgbToLinear(i / (levels - 1));
  return lut;
}

export async function decodeFrame(bytes: Uint8Array, file: string, backgroundRgb: readonly [number, number, number], maxPixels = DEFAULT_MAX_FRAME_PIXELS): Promise<{ image: LinearRgb; info: FrameInfo }> {
  const probe = await probeImage(bytes, file);
  checkFramePixels(probe.width, probe.height, file, maxPixels);
  let meta: Metadata;
  try {
    meta = await sharp(bytes, { limitInputPixels: Math.min(MAX_FRAME_PIXELS, maxPixels) }).metadata();
  } catch (err) {
    throw new InputError(file, decoderTrouble(err), 'Give a PNG (8 or 16-bit), JPEG or WebP frame; re-export it if it was damaged.');
  }
  const sixteen = meta.depth === 'ushort';
  let raw: { data: Buffer; info: OutputInfo };
  try {
    let pipeline = sharp(bytes, { limitInputPixels: Math.min(MAX_FRAME_PIXELS, maxPixels), failOn: 'error' }).autoOrient();
    // 8-bit input with a profile is converted to sRGB by default; 16-bit needs the transform asked
    // for explicitly, or it would keep the profile's code values.
    if (sixteen && meta.icc) pipeline = pipeline.withIccProfile('srgb');
    raw = await pipeline
      .toColourspace(sixteen ? 'rgb16' : 'srgb')
      .ensureAlpha()
      .raw(sixteen ? { depth: 'ushort' } : {})
      .toBuffer({ resolveWithObject: true });
  } catch (err) {
    throw new InputError(file, decoderTrouble(err), 'Check that the file is complete and not damaged; re-export it from the design tool.');
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
