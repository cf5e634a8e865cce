/** Planar image types: one Float32Array per channel, row-major (`data[y * width + x]`). */

export interface Plane {
  width: number;
  height: number;
  data: Float32Array;
}

/** Three planes of linear-light RGB (sRGB primaries, D65), 0 = display black, 1 = display white. */
export interface LinearRgb {
  width: number;
  height: number;
  planes: [Float32Array, Float32Array, Float32Array];
}

export function createPlane(width: number, height: number, fill = 0): Plane {
  const data = new Float32Array(width * height);
  if (fill !== 0) data.fill(fill);
  return { width, height, data };
}

export function createLinearRgb(width: number, height: number): LinearRgb {
  const n = width * height;
  return { width, height, planes: [new Float32Array(n), new Float32Array(n), new Float32Array(n)] };
}

/** The plane of one channel of an RGB image, sharing its memory. */
export function channelPlane(image: LinearRgb, channel: 0 | 1 | 2): Plane {
  return { width: image.width, height: image.height, data: image.planes[channel] };
}

/** Applies a plane operation to each channel: a kernel is written once for a plane. */
export function mapChannels(image: LinearRgb, op: (plane: Plane) => Plane): LinearRgb {
  const out = ([0, 1, 2] as const).map((c) => op(channelPlane(image, c)).data) as LinearRgb['planes'];
  return { width: image.width, height: image.height, planes: out };
}

export function planeMean(plane: Plane): number {
  let sum = 0;
  for (let i = 0; i < plane.data.length; i++) sum += plane.data[i];
  return sum / plane.data.length;
}
