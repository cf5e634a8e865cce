import Color from 'colorjs.io';
import sharp from 'sharp';
import { PNG } from 'pngjs';
import { describe, expect, test } from 'vitest';
import { srgbToLinear } from '../../src/colour/srgb.js';
import { InputError } from '../../src/errors.js';
import { decodeFrame } from '../../src/io/decode-frame.js';
import { encodeRgba8Png, linearToRgba8 } from '../../src/io/encode-png.js';

const rgbPng = (pixels: number[][], width: number, height: number, bitDepth: 8 | 16 = 8, alpha = false): Buffer => {
  const png = new PNG({ width, height, bitDepth, colorType: alpha ? 6 : 2, inputColorType: alpha ? 6 : 2, inputHasAlpha: alpha });
  // pngjs takes 16-bit samples as a Uint16Array and 8-bit ones as bytes.
  png.data = (bitDepth === 16 ? new Uint16Array(pixels.flat()) : Buffer.from(pixels.flat())) as Buffer;
  return PNG.sync.write(png, { bitDepth, colorType: alpha ? 6 : 2, inputColorType: alpha ? 6 : 2, inputHasAlpha: alpha });
};

describe('decoding frames', () => {
  test('8-bit PNG (written by pngjs) decodes to linear light by the sRGB curve (IEC 61966-2-1)', async () => {
    const { image, info } = await decodeFrame(rgbPng([[10, 50, 128], [188, 255, 0]], 2, 1), 'a.png', [0, 0, 0]);
    expect(info).toMatchObject({ widthPx: 2, heightPx: 1, bitsPerChannel: 8, hadAlpha: false, format: 'png' });
    expect(image.planes[0][0]).toBeCloseTo(0.003035, 6);
    expect(image.planes[1][0]).toBeCloseTo(0.031896, 6);
    expect(image.planes[2][0]).toBeCloseTo(0.215861, 6);
    expect(image.planes[0][1]).toBeCloseTo(0.502886, 6);
  });

  test('16-bit PNG keeps its full precision (pngjs writer, IEC 61966-2-1 curve)', async () => {
    const { image, info } = await decodeFrame(rgbPng([[1000, 32768, 65535]], 1, 1, 16), 'b.png', [0, 0, 0]);
    expect(info.bitsPerChannel).toBe(16);
    expect(image.planes[0][0]).toBeCloseTo(srgbToLinear(1000 / 65535), 7);
    expect(image.planes[1][0]).toBeCloseTo(srgbToLinear(32768 / 65535), 7);
    expect(image.planes[2][0]).toBeCloseTo(1, 7);
  });

  test('alpha is composited over the stated background in encoded values (common practice of compositors)', async () => {
    const { image, info } = await decodeFrame(rgbPng([[255, 255, 255, 0], [255, 255, 255, 255], [200, 0, 0, 128]], 3, 1, 8, true), 'c.png', [0, 0, 255]);
    expect(info.hadAlpha).toBe(true);
    expect(image.planes[2][0]).toBeCloseTo(1, 6);
    expect(image.planes[0][0]).toBeCloseTo(0, 6);
    expect(image.planes[0][1]).toBeCloseTo(1, 6);
    expect(image.planes[0][2]).toBeCloseTo(srgbToLinear(Math.round(200 * (128 / 255)) / 255), 6);
  });

  test('a Display P3 frame decodes like its sRGB conversion by colorjs.io (general colour library)', async () => {
    // Encode in P3: sharp converts the sRGB-tagged raw pixels to the P3 profile it embeds.
    const srgb = [200, 100, 50];
    const p3Png = await sharp(Buffer.from(srgb), { raw: { width: 1, height: 1, channels: 3 } }).withIccProfile('p3').png().toBuffer();
    const { image, info } = await decodeFrame(p3Png, 'p3.png', [0, 0, 0]);
    expect(info.iccProfile).toMatch(/P3/i);
    // The stored code values are P3; the outside library converts them to sRGB for comparison.
    const stored = PNG.sync.read(p3Png).data;
    const ref = new Color('p3', [stored[0] / 255, stored[1] / 255, stored[2] / 255]).to('srgb-linear').coords as number[];
    for (let c = 0; c < 3; c++) expect(Math.abs(image.planes[c as 0 | 1 | 2][0] - ref[c])).toBeLessThan(0.01);
  });

  test('a 16-bit Display P3 frame decodes like its 8-bit twin, i.e. converted to sRGB (16-bit path of the ICC transform)', async () => {
    const p3Png = await sharp(Buffer.from([200, 100, 50]), { raw: { width: 1, height: 1, channels: 3 } }).withIccProfile('p3').png().toBuffer();
    const p3Png16 = await sharp(p3Png).keepIccProfile().toColourspace('rgb16').png().toBuffer();
    const eight = await decodeFrame(p3Png, 'p3-8.png', [0, 0, 0]);
    const sixteen = await decodeFrame(p3Png16, 'p3-16.png', [0, 0, 0]);
    expect(sixteen.info.bitsPerChannel).toBe(16);
    for (let c = 0; c < 3; c++) expect(Math.abs(sixteen.image.planes[c as 0 | 1 | 2][0] - eight.image.planes[c as 0 | 1 | 2][0])).toBeLessThan(0.005);
  });

  test('JPEG and WebP frames decode (sharp)', async () => {
    for (const format of ['jpeg', 'webp'] as const) {
      const bytes = await sharp({ create: { width: 8, height: 8, channels: 3, background: { r: 128, g: 128, b: 128 } } })[format]({ quality: 100 }).toBuffer();
      const { image, info } = await decodeFrame(bytes, `f.${format}`, [0, 0, 0]);
      expect(info.format).toBe(format);
      expect(image.planes[1][27]).toBeCloseTo(srgbToLinear(128 / 255), 2);
    }
  });

  test('a file that is not an image is an InputError naming the file', async () => {
    await expect(decodeFrame(new TextEncoder().encode('hello, not a picture'), 'notes.txt', [0, 0, 0])).rejects.toThrow(InputError);
    await expect(decodeFrame(new TextEncoder().encode('hello'), 'notes.txt', [0, 0, 0])).rejects.toThrow(/notes\.txt/);
  });
});

describe('encoding', () => {
  test('every 8-bit code survives linear → sRGB encoding unchanged (round trip through IEC 61966-2-1)', async () => {
    const width = 256;
    const planes = [0, 1, 2].map(() => Float32Array.from({ length: width }, (_, i) => srgbToLinear(i / 255))) as [Float32Array, Float32Array, Float32Array];
    const rgba = linearToRgba8({ width, height: 1, planes });
    for (let i = 0; i < width; i++) expect(rgba[i * 4]).toBe(i);
    const png = PNG.sync.read(await encodeRgba8Png(rgba, width, 1));
    for (let i = 0; i < width; i++) expect(png.data[i * 4 + 1]).toBe(i);
  });
});
