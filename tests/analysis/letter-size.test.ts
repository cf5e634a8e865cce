/**
 * The smallest legible letter, through the setup path (validated setup → eye state → computed optics →
 * letter rule), against published acuity: young foveal acuity, acuity under defocus, and in the periphery.
 */
import { describe, expect, test } from 'vitest';
import { validateSetup } from '../../src/config/validate.js';
import { computeNumbers } from '../../src/pipeline.js';

/** A wall screen at 6 m, so that accommodation plays no part for an uncorrected myope. */
function farScreen(viewer: Record<string, unknown>, acuityModel = 'rgc-sampling'): Record<string, unknown> {
  return {
    display: { kind: 'screen', widthMm: 4000, heightMm: 2250, resolutionPx: [3840, 2160], viewingDistanceMm: 6000, peakLuminanceCdM2: 200, blackLuminanceCdM2: 0.2 },
    viewer: { ageYears: 25, pupilDiameterMm: 3, ...viewer },
    models: { acuity: acuityModel },
  };
}

const logMarAtGaze = (setupJson: Record<string, unknown>): number => Math.log10(computeNumbers(validateSetup(setupJson, 'test')).eye.smallestLetterArcminAtGaze / 5);

describe('the smallest letter at the gaze', () => {
  test.each(['rgc-sampling', 'contrast-threshold'])('a 25-year-old with a 3 mm pupil reads logMAR −0.13 to −0.17 at the fovea with the %s model (Elliott, Yang & Whitaker 1995: −0.13 at 18–24, −0.16 at 25–29)', (model) => {
    const logMar = logMarAtGaze(farScreen({}, model));
    expect(logMar).toBeGreaterThan(-0.17);
    expect(logMar).toBeLessThan(-0.13);
  });

  test('with a 2 to 5 mm pupil the young fovea stays within 0.1 logMAR of that (common practice: acuity is nearly constant over ordinary pupils)', () => {
    const at3 = logMarAtGaze(farScreen({}));
    for (const pupilDiameterMm of [2, 4, 5]) expect(Math.abs(logMarAtGaze(farScreen({ pupilDiameterMm })) - at3)).toBeLessThan(0.1);
  });

  test.each([0.5, 1, 1.5, 2])('an uncorrected myope with %f D of defocus loses acuity as MAR ∝ 1 + b², within 0.1 log units (Blendowske 2015, Optom Vis Sci, which pools Raasch 1995; the rule’s constants are fitted to it)', (b) => {
    // At 6 m the far point of a (b + 1/6) D myope leaves exactly b D of defocus.
    const sharp = logMarAtGaze(farScreen({ refraction: { sphereD: -1 / 6 } }));
    const blurred = logMarAtGaze(farScreen({ refraction: { sphereD: -b - 1 / 6 } }));
    expect(Math.abs(blurred - sharp - Math.log10(1 + b * b))).toBeLessThan(0.1);
  });

  test('defocus names the limit once it dominates (1 D)', () => {
    const numbers = computeNumbers(validateSetup(farScreen({ refraction: { sphereD: -1 - 1 / 6 } }), 'test'));
    expect(numbers.acuity[0].limitedBy).toBe('defocus');
  });
});

describe('the smallest letter off the gaze', () => {
  test.each([5, 10, 20])('at %i° on the horizontal meridian it is within 0.1 log units of Song, Levi & Pelli (2014) Eq. 13, A = 0.029·(φ + 2.72)° (not fitted)', (e) => {
    const setup = validateSetup({
      display: { kind: 'screen', widthMm: 596.7, heightMm: 335.6, resolutionPx: [2560, 1440], viewingDistanceMm: 700, peakLuminanceCdM2: 200, blackLuminanceCdM2: 0.2 },
      viewer: { ageYears: 25, pupilDiameterMm: 3 },
    }, 'test');
    const row = computeNumbers(setup).acuity.find((r) => r.eccentricityDeg === e)!;
    const song = 0.029 * (e + 2.72) * 60;
    expect(Math.abs(Math.log10(row.smallestLetterArcmin / song))).toBeLessThan(0.1);
  });
});
