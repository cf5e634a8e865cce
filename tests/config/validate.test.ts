import Ajv2020 from 'ajv/dist/2020.js';
import { describe, expect, test } from 'vitest';
import { ConfigError } from '../../src/errors.js';
import { displayPresets, viewerPresets } from '../../src/config/presets.js';
import { setupJsonSchema } from '../../src/config/schema.js';
import { validateSetup } from '../../src/config/validate.js';

function problemsOf(input: unknown): ConfigError['problems'] {
  try {
    validateSetup(input, 'test.json');
  } catch (err) {
    if (err instanceof ConfigError) return err.problems;
    throw err;
  }
  return [];
}

describe('setup validation', () => {
  test('built-in defaults: desktop-27in and age-25', () => {
    const s = validateSetup({}, 'defaults');
    expect(s.presetNames).toEqual({ display: 'desktop-27in', viewer: 'age-25' });
    expect(s.display.kind).toBe('screen');
  });

  test.each(displayPresets.map((p) => p.name))('display preset %s validates', (name) => {
    expect(() => validateSetup({ display: { preset: name } }, 'x')).not.toThrow();
  });

  test.each(viewerPresets.map((p) => p.name))('viewer preset %s validates', (name) => {
    expect(() => validateSetup({ viewer: { preset: name } }, 'x')).not.toThrow();
  });

  test('a 27-inch 16:9 diagonal gives 597.7 × 336.2 mm (square pixels, common practice)', () => {
    const s = validateSetup({ display: { preset: 'desktop-27in' } }, 'x');
    if (s.display.kind !== 'screen') throw new Error('expected a screen');
    expect(s.display.widthMm).toBeCloseTo(597.7, 1);
    expect(s.display.heightMm).toBeCloseTo(336.2, 1);
  });

  test('headset-narrow: 40 mm lens with the panel at 38 mm and 12 mm eye relief → 0.772 m (thin-lens law, derived)', () => {
    const s = validateSetup({ display: { preset: 'headset-narrow' } }, 'x');
    if (s.display.kind !== 'headset') throw new Error('expected a headset');
    expect(s.display.focalDistanceM).toBeCloseTo(0.772, 9);
  });

  test('presets can be overridden field by field', () => {
    const s = validateSetup({ display: { preset: 'desktop-27in', viewingDistanceMm: 500 }, viewer: { preset: 'age-55', eyes: 'right' } }, 'x');
    expect(s.display.kind === 'screen' && s.display.viewingDistanceMm).toBe(500);
    expect(s.viewer.ageYears).toBe(55);
    expect(s.viewer.eyes).toBe('right');
  });

  test('every problem is reported at once, with path, value and allowed range', () => {
    const problems = problemsOf({
      display: { preset: 'desktop-27in', viewingDistanceMm: 5, peakLuminanceCdM2: 'bright' },
      viewer: { ageYears: 300, eyes: 'third' },
      light: { adaptingLuminanceCdM2: -1 },
    });
    const paths = problems.map((p) => p.path).sort();
    expect(paths).toEqual(['display.peakLuminanceCdM2', 'display.viewingDistanceMm', 'light.adaptingLuminanceCdM2', 'viewer.ageYears', 'viewer.eyes']);
    const distance = problems.find((p) => p.path === 'display.viewingDistanceMm')!;
    expect(distance.received).toBe(5);
    expect(distance.expected).toContain('100 to 50000 mm');
  });

  test('unknown keys are rejected with the nearest valid key', () => {
    const problems = problemsOf({ display: { preset: 'desktop-27in', viewingDistanceMM: 600 }, viewr: {} });
    const key = problems.find((p) => p.path === 'display.viewingDistanceMM')!;
    expect(key.hint).toContain('did you mean "viewingDistanceMm"');
    expect(problems.find((p) => p.path === 'viewr')!.hint).toContain('did you mean "viewer"');
  });

  test('a headset key on a screen is named as such', () => {
    const problems = problemsOf({ display: { preset: 'desktop-27in', fieldOfViewDeg: [90, 90] } });
    expect(problems[0].hint).toContain('only for headset displays');
  });

  test('a lens with the panel outside its focal length is rejected', () => {
    const problems = problemsOf({ display: { kind: 'headset', resolutionPx: [100, 100], fieldOfViewDeg: [90, 90], peakLuminanceCdM2: 100, lens: { focalLengthMm: 40, screenDistanceMm: 45 } } });
    expect(problems.map((p) => p.path)).toEqual(['display.lens.screenDistanceMm']);
  });

  test('an unknown preset name suggests the nearest one', () => {
    const problems = problemsOf({ display: { preset: 'desktop-27' } });
    expect(problems[0].hint).toContain('"desktop-27in"');
  });
});

describe('published JSON Schema (checked with Ajv, a general-purpose JSON Schema validator)', () => {
  const ajv = new Ajv2020.default({ strict: false, allErrors: true });
  const validate = ajv.compile(setupJsonSchema());

  test('accepts the presets and a full custom headset setup', () => {
    expect(validate({ display: { preset: 'desktop-27in' }, viewer: { preset: 'age-55' } })).toBe(true);
    expect(validate({
      display: { kind: 'headset', resolutionPx: [1600, 1600], fieldOfViewDeg: [100, 100], focalDistanceM: 1.3, peakLuminanceCdM2: 100 },
      viewer: { ageYears: 40, refraction: { sphereD: -1, cylinderD: -0.5, axisDeg: 90 }, pupilDiameterMm: 'auto', eyes: 'left' },
      light: { adaptingLuminanceCdM2: 'auto', adaptingFieldDeg: 40 },
      gaze: { xPx: 10, yPx: 20 },
      models: { acuity: 'contrast-threshold' },
    })).toBe(true);
  });

  test('rejects unknown keys and out-of-range values, as validation does', () => {
    expect(validate({ viewer: { ageYears: 300 } })).toBe(false);
    expect(validate({ viewr: {} })).toBe(false);
    expect(validate({ display: { preset: 'desktop-27in', viewingDistanceMM: 600 } })).toBe(false);
  });
});
