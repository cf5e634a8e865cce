/**
 * Defocus that varies with depth (our proposal on standard optics): the eye focuses for the distance
 * at the gaze; a pixel at distance d is defocused by the difference in vergence, 1/d − 1/d_gaze, on
 * top of the viewer's residual defocus at the gaze, which the PSF already holds. The extra blur is a
 * Gaussian of the geometric blur disk's spread (σ = b/4 per axis for a disk of diameter b), added in
 * quadrature: σ_extra = pupil·sqrt(D_total² − D_gaze²)/4 where the total defocus is larger, none where
 * it is smaller (the PSF cannot be sharpened).
 */

export interface DepthBlurInput {
  depthM: Float32Array;
  /** Distance the eye focuses at (the gaze point's), m. */
  focusDistanceM: number;
  /** The viewer's residual defocus at the gaze, D. */
  gazeDefocusD: number;
  pupilDiameterMm: number;
  arcminPerPx: Float32Array;
}

export function depthBlurSigmaPx(input: DepthBlurInput): { sigmaPx: Float32Array; defocusRangeD: [number, number] } {
  const { depthM, focusDistanceM, gazeDefocusD, pupilDiameterMm, arcminPerPx } = input;
  const sigmaPx = new Float32Array(depthM.length);
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < depthM.length; i++) {
    const d = depthM[i];
    if (!(d > 0)) continue;
    const total = gazeDefocusD + 1 / d - 1 / focusDistanceM;
    lo = Math.min(lo, total);
    hi = Math.max(hi, total);
    const extra2 = total * total - gazeDefocusD * gazeDefocusD;
    if (extra2 <= 0) continue;
    // Blur disk diameter (rad) = pupil (m) × defocus (D); σ of a uniform disk is a quarter of it.
    const sigmaArcmin = ((pupilDiameterMm / 1000) * Math.sqrt(extra2) / 4) * ((180 / Math.PI) * 60);
    sigmaPx[i] = sigmaArcmin / arcminPerPx[i];
  }
  return { sigmaPx, defocusRangeD: Number.isFinite(lo) ? [lo, hi] : [gazeDefocusD, gazeDefocusD] };
}
