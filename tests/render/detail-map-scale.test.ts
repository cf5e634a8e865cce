import { describe, expect, test } from 'vitest';
import { DETAIL_SCALE_ARCMIN, renderDetailMap } from '../../src/render/detail-map.js';

describe('the detail map\'s colour scale', () => {
  test('is the same for two viewers: one angular size, one colour (fixed 4′–240′ scale, common practice for comparable maps)', () => {
    const width = 200;
    const height = 120;
    const frameRgba = new Uint8ClampedArray(width * height * 4).fill(0);
    const arcminPerPx = new Float32Array(width * height).fill(2);
    const map = (scale: number): Float32Array => Float32Array.from({ length: width * height }, (_, i) => (i % width < 100 ? 10 : 10 * scale));
    const base = { width, height, frameRgba, arcminPerPx, gazePx: [50, 60] as [number, number], arcminPerPxAtGaze: 2, frameMinLetterPx: 5, title: 't' };
    const young = renderDetailMap({ ...base, smallestLetterPx: map(2) });
    const old = renderDetailMap({ ...base, smallestLetterPx: map(6) });
    // The left half is 20′ in both runs and gets the same colour, though the two maps' ranges differ.
    const at = (img: { rgba: Uint8ClampedArray; width: number }, x: number, y: number): number[] => [...img.rgba.subarray((y * img.width + x) * 4, (y * img.width + x) * 4 + 3)];
    expect(at(old, 20, 100)).toEqual(at(young, 20, 100));
    expect(at(old, 180, 100)).not.toEqual(at(young, 180, 100));
    expect(DETAIL_SCALE_ARCMIN).toEqual([4, 240]);
  });
});
