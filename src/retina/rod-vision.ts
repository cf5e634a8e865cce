/**
 * Rod vision — resolution and the rod-free centre. OUR PROPOSAL on published facts: rods are absent
 * from the central ~1.25° (the rod-free zone, Curcio et al. 1990), rod vision has no colour and low
 * acuity — best about 20/200, i.e. about 3 cpd (from memory). The rod cutoff is 3 cpd outside the
 * rod-free zone (never above the luminance cutoff there) and falls to 0.25 cpd inside it, so small
 * dim detail at the gaze point is lost while the near periphery still sees it.
 */

/** Diameter of the rod-free zone, deg (Curcio et al. 1990: 0.35 mm ≈ 1.25°). */
export const ROD_FREE_DIAMETER_DEG = 1.25;
/** Best rod-mediated resolution, cpd (about 20/200; from memory). */
export const ROD_PEAK_CUTOFF_CPD = 3;
/** Cutoff inside the rod-free zone, cpd: only what the surrounding rods pool (our proposal). */
export const ROD_FREE_CUTOFF_CPD = 0.25;

/**
 * Scotopic luminance of display white relative to its photopic luminance (Larson et al. 1997 for
 * D65: 2.5729). Rod signals are divided by it so that white looks as bright to rods as to cones
 * and colours shift by their rod/cone ratio (the Purkinje shift).
 */
export const SCOTOPIC_PER_PHOTOPIC_WHITE = 2.5729;

export function rodCutoffCpd(eccentricityDeg: number, luminanceCutoffCpd: number): number {
  const radius = ROD_FREE_DIAMETER_DEG / 2;
  const outside = Math.min(ROD_PEAK_CUTOFF_CPD, luminanceCutoffCpd);
  // Blend from the rod-free value at the zone's edge to the full rod cutoff one radius further out.
  const t = Math.min(1, Math.max(0, (eccentricityDeg - radius) / radius));
  return ROD_FREE_CUTOFF_CPD + t * (outside - ROD_FREE_CUTOFF_CPD);
}
