import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { AUDIENCE_TABLE_AXES } from '../../src/analysis/audience-axes.js';
import { audienceEyes, audienceShareFor, letterForShare, opticalCutoffFromTable, REFRACTION_SPREAD } from '../../src/analysis/audience.js';
import { frequencyAtTransfer, OPTICAL_THRESHOLD_MODULATION } from '../../src/analysis/letter-size.js';
import { computeEyeOptics, luminanceMtfAt } from '../../src/optics/eye-optics.js';
import { GLARE_MAX_DEG, scatteredFraction, VEIL_FROM_DEG } from '../../src/optics/stray-light.js';
import { acuityModels } from '../../src/retina/acuity-model.js';

const model = acuityModels['rgc-sampling'];
const fovea = model.cutoffCpd(0, 0, 'both');
const conditions = (focalDistanceM: number) => ({ focalDistanceM, adaptingLuminanceCdM2: 100, adaptingFieldDeg: 30, eyes: 'both' as const, accommodationReserve: 1 / 3 });

describe('the audience (ages 20–75; Hofstetter 1950; Watson & Yellott 2012)', () => {
  const eyes = audienceEyes(conditions(0.6));

  test('each audience\'s weights sum to 1, and the refraction spread is a distribution (from memory)', () => {
    for (const kind of ['uncorrected', 'corrected'] as const) {
      expect(eyes.filter((e) => e.kind === kind).reduce((a, e) => a + e.weight, 0)).toBeCloseTo(1, 10);
    }
    expect(REFRACTION_SPREAD.reduce((a, r) => a + r.share, 0)).toBeCloseTo(1, 10);
  });

  test('the share that reads never falls as letters grow (seeded property)', () => {
    fc.assert(fc.property(fc.double({ min: 2, max: 60, noNaN: true }), fc.double({ min: 0, max: 30, noNaN: true }), (px, extra) => {
      const a = audienceShareFor(eyes, model, fovea, 0, 1, px);
      const b = audienceShareFor(eyes, model, fovea, 0, 1, px + extra);
      return b.uncorrected >= a.uncorrected && b.corrected >= a.corrected;
    }), { seed: 4, numRuns: 100 });
  });

  test('the share falls with age at a near display: presbyopia (Hofstetter 1950) and neural ageing (Elliott et al. 1995)', () => {
    const band = (lo: number, hi: number) => eyes.filter((e) => e.ageYears >= lo && e.ageYears <= hi).map((e) => ({ ...e, weight: e.weight * 56 / (hi - lo + 1) }));
    for (const px of [8, 12, 16]) {
      const young = audienceShareFor(band(20, 35), model, fovea, 0, 1, px);
      const old = audienceShareFor(band(60, 75), model, fovea, 0, 1, px);
      expect(old.corrected).toBeLessThanOrEqual(young.corrected);
      expect(old.uncorrected).toBeLessThanOrEqual(young.uncorrected);
    }
  });

  test('the size for a share is the smallest that reaches it', () => {
    for (const share of [0.5, 0.9]) {
      const px = letterForShare(eyes, 'corrected', share, model, fovea, 0, 1);
      expect(audienceShareFor(eyes, model, fovea, 0, 1, px).corrected).toBeGreaterThanOrEqual(share - 1e-9);
      expect(audienceShareFor(eyes, model, fovea, 0, 1, px * 0.97).corrected).toBeLessThan(share);
    }
  });

  test('the table of optical limits matches the optics computed directly between its grid points (Watson 2013 mean MTF, this tool\'s eye)', () => {
    const age = 45;
    const pupil = 3.5;
    const blur = 0.6;
    const optics = computeEyeOptics({ pupilDiameterMm: pupil, defocusD: blur, cylinderD: 0, axisDeg: 0, pixelArcmin: 1, ageYears: age });
    const core = 1 - scatteredFraction(VEIL_FROM_DEG, GLARE_MAX_DEG, age, AUDIENCE_TABLE_AXES.pigmentation);
    const direct = frequencyAtTransfer((f) => core * luminanceMtfAt(optics, f), OPTICAL_THRESHOLD_MODULATION);
    expect(opticalCutoffFromTable(age, pupil, blur, 0) / direct).toBeGreaterThan(0.85);
    expect(opticalCutoffFromTable(age, pupil, blur, 0) / direct).toBeLessThan(1.15);
  });
});
