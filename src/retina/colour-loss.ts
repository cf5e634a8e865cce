/**
 * Loss of colour resolution away from the gaze — OUR PROPOSAL, built on published findings. Each
 * opponent channel has a contrast threshold that rises exponentially with spatial frequency, as in
 * Geisler & Perry (1998) for luminance:
 *   CT_c(f, e) = CT0 · exp(α_c·f) · exp(s_c · α·f·e/e2),
 * with α = 0.106 and e2 = 2.3° the luminance constants of Geisler & Perry, s_c how many times faster
 * than luminance the channel's sensitivity falls with eccentricity — about twice for red–green (Mullen
 * 1991), about the same for blue–yellow (Mullen & Kingdom 2002) — and α_c set by the channel's foveal
 * cutoff f0_c (≈ 11 cpd for isoluminant red–green, Mullen 1985, from memory): CT_c(f0_c, 0) = 1. The
 * channel's cutoff, where the threshold reaches full contrast, is then
 *   f_c(e) = f0_c / (1 + s_c·(α/α_c)·e/e2),   α_c = ln(1/CT0)/f0_c,
 * with CT0 = 1/64 as Geisler & Perry. For red–green at 5° this is 4.96 cpd: a 2.8 cpd colour pattern
 * there stays visibly coloured, as isoluminant sensitivity allows, while small coloured detail is
 * gone by 25–30° (Mullen, Sakurai & Chu 2005) and large fields keep their colour (Hansen, Pracejus &
 * Gegenfurtner 2009), which a low-pass gives by itself. Colour is lost gradually with frequency
 * (sensitivity, not sampling, limits it), so the percept uses a Gaussian-like low-pass at that cutoff.
 * The centre of the fovea has no S cones over about 25′ (Williams, MacLeod & Hayhoe 1981), so there
 * blue–yellow detail finer than that is removed.
 */
import { GP_ALPHA, GP_CT0, GP_E2_DEG } from './geisler-perry.js';

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

/**
 * A channel's cutoff (cpd) at an eccentricity, never above the luminance cutoff there. `sConeFreeCentre`
 * false leaves out the S-cone-free dip — for losses relative to a viewer whose own foveola has it too.
 */
export function chromaticCutoffCpd(channel: ChromaticChannel, eccentricityDeg: number, params: ColourLossParams, luminanceCutoffCpd: number, sConeFreeCentre = true): number {
  const [f0, scale] = channel === 'red-green'
    ? [params.redGreenFovealCutoffCpd, params.redGreenEccentricityScale]
    : [params.blueYellowFovealCutoffCpd, params.blueYellowEccentricityScale];
  const alphaChannel = Math.log(1 / GP_CT0) / f0;
  let f = Math.min(luminanceCutoffCpd, f0 / (1 + (scale * (GP_ALPHA / alphaChannel) * eccentricityDeg) / GP_E2_DEG));
  if (channel === 'blue-yellow' && sConeFreeCentre) {
    // Inside the S-cone-free disc the cutoff drops to 1.2 cpd, blending out over one more radius.
    const radiusDeg = S_CONE_FREE_DIAMETER_ARCMIN / 2 / 60;
    const t = Math.min(1, Math.max(0, (eccentricityDeg - radiusDeg) / radiusDeg));
    f = Math.min(f, S_CONE_FREE_CUTOFF_CPD + t * (f - S_CONE_FREE_CUTOFF_CPD));
  }
  return f;
}
