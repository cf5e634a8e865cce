/**
 * Loss of colour resolution away from the gaze — OUR PROPOSAL, built on published findings:
 * red–green sensitivity falls with eccentricity about twice as steeply as luminance (Mullen 1991)
 * and is behaviourally absent for small stimuli by 25–30° (Mullen, Sakurai & Chu 2005); blue–yellow
 * falls about like luminance (Mullen & Kingdom 2002); large fields keep colour far out (Hansen,
 * Pracejus & Gegenfurtner 2009), which a low-pass gives by itself: a large field passes, fine
 * coloured detail does not. Each opponent channel gets a cutoff
 *   f(e) = f0 · e2 / (s·e + e2),  e2 = 2.3° (the half-resolution eccentricity of Geisler & Perry 1998),
 * with s = 2 for red–green and 1 for blue–yellow, never above the luminance cutoff. The centre of the
 * fovea has no S cones over about 25′ (Williams, MacLeod & Hayhoe 1981), so there blue–yellow detail
 * finer than that is removed.
 */
import { GP_E2_DEG } from './geisler-perry.js';

export interface ColourLossParams {
  redGreenFovealCutoffCpd: number;
  blueYellowFovealCutoffCpd: number;
  redGreenEccentricityScale: number;
  blueYellowEccentricityScale: number;
}

/** Diameter of the S-cone-free centre of the fovea, arcmin (Williams, MacLeod & Hayhoe 1981). */
export const S_CONE_FREE_DIAMETER_ARCMIN = 25;

export type ChromaticChannel = 'red-green' | 'blue-yellow';

/** Cutoff of the blue–yellow channel inside the S-cone-free zone: detail finer than 25′ (half a cycle) is gone. */
const S_CONE_FREE_CUTOFF_CPD = 60 / (2 * S_CONE_FREE_DIAMETER_ARCMIN);

export function chromaticCutoffCpd(channel: ChromaticChannel, eccentricityDeg: number, params: ColourLossParams, luminanceCutoffCpd: number): number {
  const [f0, scale] = channel === 'red-green'
    ? [params.redGreenFovealCutoffCpd, params.redGreenEccentricityScale]
    : [params.blueYellowFovealCutoffCpd, params.blueYellowEccentricityScale];
  let f = Math.min(luminanceCutoffCpd, (f0 * GP_E2_DEG) / (scale * eccentricityDeg + GP_E2_DEG));
  if (channel === 'blue-yellow') {
    // Inside the S-cone-free disc the cutoff drops to 1.2 cpd, blending out over one more radius.
    const radiusDeg = S_CONE_FREE_DIAMETER_ARCMIN / 2 / 60;
    const t = Math.min(1, Math.max(0, (eccentricityDeg - radiusDeg) / radiusDeg));
    f = Math.min(f, S_CONE_FREE_CUTOFF_CPD + t * (f - S_CONE_FREE_CUTOFF_CPD));
  }
  return f;
}
