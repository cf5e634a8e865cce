/**
 * Per-pixel viewing geometry: eccentricity from the gaze, the meridian of the visual field the pixel
 * lies on, and the angular size of one pixel. Directions and rotations use gl-matrix.
 */
import { mat3, quat, vec3 } from 'gl-matrix';
import { ARCMIN_PER_RAD, degToRad, radToDeg } from '../units.js';
import { pixelToTan, tanToPixel, type Projection } from './projection.js';

export interface ViewMap {
  width: number;
  height: number;
  /** Angle between the pixel's direction and the gaze, degrees. */
  eccentricityDeg: Float32Array;
  /** Direction in the visual field around the gaze, degrees: 0 right, 90 up, 180 left, 270 down. */
  meridianDeg: Float32Array;
  /** Angular size of one pixel (square root of its solid angle), arcmin. */
  arcminPerPx: Float32Array;
  gazePx: [number, number];
}

/** Pixel-centre coordinates (edge coordinates + 0.5) of the gaze. */
export function gazeDirection(p: Projection, gazePx: [number, number]): vec3 {
  const [a, b] = pixelToTan(p, gazePx[0] + 0.5, gazePx[1] + 0.5);
  return vec3.normalize(vec3.create(), vec3.fromValues(a, b, 1));
}

/**
 * Rotation that takes the gaze direction to +z, so that the gaze becomes the centre of the field.
 * Built from axis and angle (atan2) rather than quat.rotationTo, which returns the identity for
 * directions within about 0.08° of each other.
 */
export function gazeRotation(gaze: vec3): quat {
  const forward = vec3.fromValues(0, 0, 1);
  const axis = vec3.cross(vec3.create(), gaze, forward);
  const sin = vec3.length(axis);
  if (sin < 1e-12) return quat.create();
  vec3.scale(axis, axis, 1 / sin);
  return quat.setAxisAngle(quat.create(), axis, Math.atan2(sin, vec3.dot(gaze, forward)));
}

/**
 * Angular size of one pixel at tan-space point (a, b): the solid angle of a plane element is
 * kx·ky·cos³α, with α the angle from the plane's normal (cos α = 1/|(a, b, 1)|).
 */
export function arcminPerPxAt(p: Projection, a: number, b: number): number {
  const cosAlpha = 1 / Math.sqrt(a * a + b * b + 1);
  return Math.sqrt(p.kxPerPx * p.kyPerPx * cosAlpha * cosAlpha * cosAlpha) * ARCMIN_PER_RAD;
}

/** Pixel sizes by projection: they do not depend on the gaze, so a gaze change reuses them. */
const pixelSizes = new WeakMap<Projection, Float32Array>();

/** Angular size of every pixel (arcmin), computed once per projection. */
function pixelSizesOf(p: Projection): Float32Array {
  let sizes = pixelSizes.get(p);
  if (!sizes) {
    const { widthPx: width, heightPx: height } = p;
    sizes = new Float32Array(width * height);
    const kArcmin = Math.sqrt(p.kxPerPx * p.kyPerPx) * ARCMIN_PER_RAD;
    for (let y = 0; y < height; y++) {
      const b = -(y + 0.5 - p.cyPx) * p.kyPerPx + p.tyTan;
      for (let x = 0; x < width; x++) {
        const a = (x + 0.5 - p.cxPx) * p.kxPerPx + p.txTan;
        const norm = 1 / Math.sqrt(a * a + b * b + 1);
        // Same as arcminPerPxAt: sqrt(kx·ky·cos³α) with cos α = norm.
        sizes[y * width + x] = kArcmin * Math.sqrt(norm * norm * norm);
      }
    }
    pixelSizes.set(p, sizes);
  }
  return sizes;
}

/**
 * The view map of a gaze; `arcminPerPx` is shared between the gazes of one projection (read it, do
 * not write it). `into`: a view map of the same projection whose arrays are reused.
 */
export function computeViewMap(p: Projection, gazePx: [number, number], into?: ViewMap): ViewMap {
  const { widthPx: width, heightPx: height } = p;
  const n = width * height;
  const reuse = into && into.eccentricityDeg.length === n;
  const eccentricityDeg = reuse ? into.eccentricityDeg : new Float32Array(n);
  const meridianDeg = reuse ? into.meridianDeg : new Float32Array(n);
  // The rotation as a matrix, applied inline: this loop runs once per pixel.
  const r = mat3.fromQuat(mat3.create(), gazeRotation(gazeDirection(p, gazePx)));
  const [r0, r1, r2, r3, r4, r5, r6, r7, r8] = r;
  const toDeg = 180 / Math.PI;
  for (let y = 0; y < height; y++) {
    const b = -(y + 0.5 - p.cyPx) * p.kyPerPx + p.tyTan;
    const o = y * width;
    for (let x = 0; x < width; x++) {
      const a = (x + 0.5 - p.cxPx) * p.kxPerPx + p.txTan;
      // gl-matrix mat3 is column-major: row i of the rotation is (r[i], r[i + 3], r[i + 6]). The
      // direction need not be normalised for the angles.
      const dx = r0 * a + r3 * b + r6;
      const dy = r1 * a + r4 * b + r7;
      const dz = r2 * a + r5 * b + r8;
      // atan2 keeps precision near the gaze, where acos of a value near 1 would not.
      eccentricityDeg[o + x] = Math.atan2(Math.sqrt(dx * dx + dy * dy), dz) * toDeg;
      const m = Math.atan2(dy, dx) * toDeg;
      meridianDeg[o + x] = m < 0 ? m + 360 : m;
    }
  }
  return { width, height, eccentricityDeg, meridianDeg, arcminPerPx: pixelSizesOf(p), gazePx: [gazePx[0], gazePx[1]] };
}

/**
 * Frame pixel (edge coordinates) seen at a given eccentricity and meridian from the gaze, or
 * undefined when that direction does not meet the display plane in front of the eye.
 */
export function pixelAtFieldPoint(p: Projection, gazePx: [number, number], eccentricityDeg: number, meridianDeg: number): [number, number] | undefined {
  const e = degToRad(eccentricityDeg);
  const m = degToRad(meridianDeg);
  const inField = vec3.fromValues(Math.sin(e) * Math.cos(m), Math.sin(e) * Math.sin(m), Math.cos(e));
  const back = quat.invert(quat.create(), gazeRotation(gazeDirection(p, gazePx)));
  const dir = vec3.transformQuat(vec3.create(), inField, back);
  if (dir[2] <= 1e-6) return undefined;
  return tanToPixel(p, dir[0] / dir[2], dir[1] / dir[2]);
}

export function isInsideFrame(p: Projection, pt: [number, number] | undefined): pt is [number, number] {
  return pt !== undefined && pt[0] >= 0 && pt[1] >= 0 && pt[0] <= p.widthPx && pt[1] <= p.heightPx;
}

/** Horizontal and vertical field of view of the frame through the eye's straight-ahead point, degrees. */
export function fieldOfViewDeg(p: Projection): { horizontal: number; vertical: number } {
  const [left] = pixelToTan(p, 0, p.cyPx);
  const [right] = pixelToTan(p, p.widthPx, p.cyPx);
  const [, top] = pixelToTan(p, p.cxPx, 0);
  const [, bottom] = pixelToTan(p, p.cxPx, p.heightPx);
  // Measured along the row and column through the eye's axis when it lies inside the frame.
  const a0 = Math.min(Math.max(0, left), right);
  const b0 = Math.min(Math.max(0, bottom), top);
  const h = Math.atan(right / Math.hypot(1, b0)) - Math.atan(left / Math.hypot(1, b0));
  const v = Math.atan(top / Math.hypot(1, a0)) - Math.atan(bottom / Math.hypot(1, a0));
  return { horizontal: radToDeg(h), vertical: radToDeg(v) };
}
