import { describe, expect, test } from 'vitest';
import { accommodationFor, blurCircleRad, hofstetterAmplitudeD } from '../../src/optics/accommodation.js';
import { computeEyeState } from '../../src/optics/eye-state.js';
import { radToArcmin } from '../../src/units.js';

describe('amplitude of accommodation, Hofstetter (1950)', () => {
  test.each([
    [40, 5.0, 6.5, 9.0],
    [50, 2.5, 3.5, 5.0],
  ])('age %i → min %f, mean %f, max %f D (Hofstetter 1950)', (age, min, mean, max) => {
    expect(hofstetterAmplitudeD(age, 'min')).toBeCloseTo(min, 10);
    expect(hofstetterAmplitudeD(age, 'mean')).toBeCloseTo(mean, 10);
    expect(hofstetterAmplitudeD(age, 'max')).toBeCloseTo(max, 10);
  });

  test('floored at 0 D for old age (Hofstetter 1950)', () => {
    expect(hofstetterAmplitudeD(75)).toBe(0);
  });
});

describe('residual defocus and blur circle', () => {
  test('blur circle 3 mm & 1 D = 10.31′, 4 mm & 0.5 D = 6.875′ (geometric optics, derived)', () => {
    expect(radToArcmin(blurCircleRad(3, 1))).toBeCloseTo(10.31, 2);
    expect(radToArcmin(blurCircleRad(4, 0.5))).toBeCloseTo(6.875, 3);
  });

  test('a presbyope cannot reach a near target: residual = demand − amplitude (standard optics)', () => {
    const s = accommodationFor(0.5, 0, 1.5);
    expect(s.demandD).toBeCloseTo(2, 12);
    expect(s.accommodationD).toBe(1.5);
    expect(s.defocusD).toBeCloseTo(0.5, 12);
  });

  test('an uncorrected −2 D myope sees 0.5 m sharply and 2 m blurred by −1.5 D (far point 1/2 m, standard optics)', () => {
    expect(accommodationFor(0.5, -2, 9).defocusD).toBeCloseTo(0, 12);
    expect(accommodationFor(2, -2, 9).defocusD).toBeCloseTo(-1.5, 12);
  });

  test('in sustained viewing a third of the amplitude stays in reserve: a 50-year-old +1.5 D hyperope at 70 cm is left 0.60 D out of focus (Hofstetter 1950 mean 3.5 D; reserve: common practice)', () => {
    const eye = computeEyeState({
      viewer: { ageYears: 50, refraction: { sphereD: 1.5, cylinderD: 0, axisDeg: 0 }, pupilDiameterMm: 3, eyes: 'both', glasses: 'none', eyePigmentation: 0.5 },
      adaptingLuminanceCdM2: 100, adaptingFieldDeg: 60, focalDistanceM: 0.7, accommodationReserve: 1 / 3,
    });
    // Demand 1/0.7 + 1.5 = 2.929 D; usable 2/3 × 3.5 = 2.333 D; residual 0.595 D.
    expect(eye.accommodationDemandD).toBeCloseTo(2.929, 3);
    expect(eye.sustainedAccommodationD).toBeCloseTo(2.333, 3);
    expect(eye.defocusD).toBeCloseTo(0.595, 3);
    // The full amplitude would just cover it (the case that hid the problem).
    expect(accommodationFor(0.7, 1.5, 3.5).defocusD).toBe(0);
  });

  test('cylinder adds as half its power to the blur strength (power vectors, Thibos et al. 2004, from memory)', () => {
    const eye = computeEyeState({
      viewer: { ageYears: 30, refraction: { sphereD: 0, cylinderD: -1, axisDeg: 90 }, pupilDiameterMm: 4, eyes: 'both', glasses: 'none', eyePigmentation: 0.5 },
      adaptingLuminanceCdM2: 100, adaptingFieldDeg: 60, focalDistanceM: 1, accommodationReserve: 1 / 3,
    });
    // Spherical equivalent −0.5 D at 1 m: the eye relaxes to 0.5 D demand, no spherical residual; J = 0.5 D.
    expect(eye.defocusD).toBeCloseTo(0, 12);
    expect(eye.blurStrengthD).toBeCloseTo(0.5, 12);
    expect(eye.blurCircleArcmin).toBeCloseTo(6.875, 3);
  });
});
