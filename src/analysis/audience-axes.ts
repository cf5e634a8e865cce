/** The axes of the audience's optical table (audience-optics-table.ts), shared with its generator. */
export const AUDIENCE_TABLE_AXES = {
  ageYears: [20, 30, 40, 50, 60, 70, 80],
  pupilMm: [2, 3, 4, 5, 6, 7],
  /** Spherical defocus magnitude, D (the table is computed for focus behind the retina). */
  defocusD: [0, 0.25, 0.5, 0.75, 1, 1.5, 2, 3, 4, 6],
  eccentricityDeg: [0, 2, 5, 10, 20, 30, 40],
  /** Eye pigmentation of the stray light's core share (CIE 180:2010's default). */
  pigmentation: 0.5,
} as const;
