/**
 * Synthetic test displays, frames and measurements for end-to-end tests: frames are proofed through
 * the whole pipeline and measured in the written percept.png (decoded and linearised).
 */
import { PNG } from 'pngjs';
import { srgbToLinear } from '../../src/colour/srgb.js';
import { validateSetup } from '../../src/config/validate.js';
import { encodeRgba8Png, linearToRgba8 } from '../../src/io/encode-png.js';
import { createLinearRgb, type LinearRgb } from '../../src/image/plane.js';
import { proofFrame } from '../../src/proof.js';

const PITCH_MM = 0.5;

/** A screen of 0.5 mm pixels at the distance where the centre pixel subtends 1/pxPerDeg degree. */
export function screenSetup(width: number, height: number, pxPerDeg: number, over: Record<string, unknown> = {}): Record<string, unknown> {
  const distanceMm = PITCH_MM / Math.tan(((1 / pxPerDeg) * Math.PI) / 180);
  const { display, ...rest } = over as { display?: Record<string, unknown> };
  return {
    display: {
      kind: 'screen', widthMm: width * PITCH_MM, heightMm: height * PITCH_MM, resolutionPx: [width, height], viewingDistanceMm: distanceMm,
      peakLuminanceCdM2: 200, blackLuminanceCdM2: 0, ...display,
    },
    gaze: { xPx: width / 2, yPx: height / 2 },
    ...rest,
  };
}

/** Column whose centre lies at `eccDeg` right of the centre on such a screen, and the px/° there along the row. */
export function columnAtDeg(width: number, pxPerDeg: number, eccDeg: number): { x: number; pxPerDeg: number } {
  const distanceMm = PITCH_MM / Math.tan(((1 / pxPerDeg) * Math.PI) / 180);
  const theta = (eccDeg * Math.PI) / 180;
  return { x: Math.round(width / 2 + (distanceMm * Math.tan(theta)) / PITCH_MM), pxPerDeg: (pxPerDeg * 1) / Math.cos(theta) ** 2 };
}

export function uniformFrame(width: number, height: number, rgb: readonly [number, number, number]): LinearRgb {
  const f = createLinearRgb(width, height);
  f.planes.forEach((p, c) => p.fill(rgb[c]));
  return f;
}

/** Paints a sinusoidal grating (linear light) over a box: mean ± amplitude, stripes vertical or horizontal. */
export function paintGrating(frame: LinearRgb, box: [number, number, number, number], cyclesPerPx: number, orientation: 'vertical' | 'horizontal', mean: number, amplitude: number, colour: readonly [number, number, number] = [1, 1, 1]): void {
  const [x0, y0, w, h] = box;
  for (let y = y0; y < y0 + h; y++) {
    for (let x = x0; x < x0 + w; x++) {
      const t = orientation === 'vertical' ? x : y;
      const v = mean + amplitude * Math.sin(2 * Math.PI * cyclesPerPx * t);
      for (let c = 0; c < 3; c++) frame.planes[c][y * frame.width + x] = v * colour[c];
    }
  }
}

/** Linear planes of an 8-bit sRGB PNG. */
export function decodePngLinear(bytes: Uint8Array | Buffer): LinearRgb {
  const png = PNG.sync.read(Buffer.from(bytes));
  const out = createLinearRgb(png.width, png.height);
  for (let i = 0; i < png.width * png.height; i++) {
    for (let c = 0; c < 3; c++) out.planes[c][i] = srgbToLinear(png.data[4 * i + c] / 255);
  }
  return out;
}

/** Proofs a linear frame (written as an 8-bit PNG first, as a user's would be) and returns the frame and percept as written. */
export async function proofThroughFiles(frame: LinearRgb, setupJson: Record<string, unknown>): Promise<{ frame: LinearRgb; percept: LinearRgb; report: Record<string, unknown> }> {
  const png = await encodeRgba8Png(linearToRgba8(frame), frame.width, frame.height);
  const setup = validateSetup(setupJson, 'test setup');
  const out = await proofFrame(png, 'synthetic.png', setup, 'test setup');
  const percept = decodePngLinear(out.files.find((f) => f.name === 'percept.png')!.bytes as Uint8Array);
  return { frame: decodePngLinear(png), percept, report: out.report };
}

/**
 * Amplitude of the component at `cyclesPerPx` (along x or y) of a plane over a box, by projection on
 * sine and cosine, over the box's mean: the modulation of that grating.
 */
export function modulationAt(image: LinearRgb, box: [number, number, number, number], cyclesPerPx: number, orientation: 'vertical' | 'horizontal', channel = 1): number {
  const [x0, y0, w, h] = box;
  const plane = image.planes[channel];
  let s = 0;
  let c = 0;
  let m = 0;
  let n = 0;
  for (let y = y0; y < y0 + h; y++) {
    for (let x = x0; x < x0 + w; x++) {
      const t = orientation === 'vertical' ? x : y;
      const v = plane[y * image.width + x];
      s += v * Math.sin(2 * Math.PI * cyclesPerPx * t);
      c += v * Math.cos(2 * Math.PI * cyclesPerPx * t);
      m += v;
      n++;
    }
  }
  return (2 * Math.hypot(s, c)) / n / (m / n);
}

/** A box of whole periods centred on a point. */
export function boxAround(cx: number, cy: number, cyclesPerPx: number, halfSidePx: number, orientation: 'vertical' | 'horizontal'): [number, number, number, number] {
  const period = 1 / cyclesPerPx;
  const along = Math.max(1, Math.floor((2 * halfSidePx) / period)) * period;
  const alongPx = Math.round(along);
  const acrossPx = 2 * halfSidePx;
  return orientation === 'vertical'
    ? [Math.round(cx - alongPx / 2), Math.round(cy - acrossPx / 2), alongPx, acrossPx]
    : [Math.round(cx - acrossPx / 2), Math.round(cy - alongPx / 2), acrossPx, alongPx];
}
