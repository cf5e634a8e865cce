/** Photopic, mesopic and scotopic vision: the CIE 191:2010 recommended system for mesopic photometry. */

/** Above this luminance vision is photopic, cd/m² (CIE 191:2010). */
export const PHOTOPIC_ABOVE_CDM2 = 5;
/** Below this luminance vision is scotopic, cd/m² (CIE 191:2010). */
export const SCOTOPIC_BELOW_CDM2 = 0.005;
/** V′(555 nm), the scotopic efficiency at the photopic peak (CIE; ISO 23539). */
export const V_PRIME_555 = 0.402;
/** m = a + b·log10(L_mes): a = 1 − log10(5)/3 and b = 1/3 to four places (CIE 191; from memory). */
export const MESOPIC_A = 0.767;
export const MESOPIC_B = 0.3334;

export type LightRegime = 'photopic' | 'mesopic' | 'scotopic';

export function lightRegime(photopicCdM2: number): LightRegime {
  return photopicCdM2 > PHOTOPIC_ABOVE_CDM2 ? 'photopic' : photopicCdM2 < SCOTOPIC_BELOW_CDM2 ? 'scotopic' : 'mesopic';
}

/**
 * CIE 191 mesopic adaptation coefficient m and mesopic luminance, by iteration from m = 0.5:
 * L_mes = [m·L_p + (1−m)·L_s·V′(555)] / [m + (1−m)·V′(555)], m = a + b·log10(L_mes), m in [0, 1].
 */
export function cie191Mesopic(photopicCdM2: number, scotopicToPhotopic: number): { m: number; mesopicCdM2: number } {
  const lp = photopicCdM2;
  const ls = photopicCdM2 * scotopicToPhotopic;
  let m = 0.5;
  let lmes = lp;
  for (let i = 0; i < 100; i++) {
    lmes = (m * lp + (1 - m) * ls * V_PRIME_555) / (m + (1 - m) * V_PRIME_555);
    const next = lmes > 0 ? Math.min(1, Math.max(0, MESOPIC_A + MESOPIC_B * Math.log10(lmes))) : 0;
    if (Math.abs(next - m) < 1e-10) {
      m = next;
      break;
    }
    m = next;
  }
  return { m, mesopicCdM2: (m * lp + (1 - m) * ls * V_PRIME_555) / (m + (1 - m) * V_PRIME_555) };
}

export interface LightState {
  regime: LightRegime;
  /** Share of cone (photopic) vision in the percept: the CIE 191 coefficient m. */
  mesopicFactorM: number;
  mesopicLuminanceCdM2: number;
  /** Scotopic over photopic luminance of what the eye adapts to (S/P ratio). */
  scotopicToPhotopicRatio: number;
}

export function lightState(adaptingCdM2: number, scotopicToPhotopicRatio: number): LightState {
  const { m, mesopicCdM2 } = cie191Mesopic(adaptingCdM2, scotopicToPhotopicRatio);
  return { regime: lightRegime(adaptingCdM2), mesopicFactorM: m, mesopicLuminanceCdM2: mesopicCdM2, scotopicToPhotopicRatio };
}
