import { describe, expect, test } from 'vitest';
import { watsonYellottPupilMm } from '../../src/optics/pupil.js';

describe('pupil diameter, Watson & Yellott (2012) unified formula', () => {
  test.each([
    [100, 30, 2, 2.8869],
    [1, 30, 2, 5.1195],
    [100, 70, 2, 2.6321],
    [100, 30, 1, 3.8282],
  ] as const)('L = %f cd/m², 60° field, age %i, %i eye(s) → %f mm (Watson & Yellott 2012, derived check)', (luminanceCdM2, ageYears, eyes, expected) => {
    const { pupilDiameterMm } = watsonYellottPupilMm({ luminanceCdM2, fieldDiameterDeg: 60, ageYears, eyes });
    expect(pupilDiameterMm).toBeCloseTo(expected, 4);
  });

  test('ages outside 20–83 are clamped and flagged (Watson & Yellott 2012 fitted range)', () => {
    const young = watsonYellottPupilMm({ luminanceCdM2: 100, fieldDiameterDeg: 60, ageYears: 10, eyes: 2 });
    const twenty = watsonYellottPupilMm({ luminanceCdM2: 100, fieldDiameterDeg: 60, ageYears: 20, eyes: 2 });
    expect(young.ageClamped).toBe(true);
    expect(young.pupilDiameterMm).toBe(twenty.pupilDiameterMm);
  });

  test('the pupil shrinks as light grows (Watson & Yellott 2012)', () => {
    const sizes = [0.01, 1, 100, 10000].map((l) => watsonYellottPupilMm({ luminanceCdM2: l, fieldDiameterDeg: 60, ageYears: 30, eyes: 2 }).pupilDiameterMm);
    for (let i = 1; i < sizes.length; i++) expect(sizes[i]).toBeLessThan(sizes[i - 1]);
  });
});
