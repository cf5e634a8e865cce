import { describe, expect, test } from 'vitest';
import { ConfigError } from '../../src/errors.js';
import { validateSetup } from '../../src/config/validate.js';
import { computeEyeOptics, eyeTerms } from '../../src/optics/eye-optics.js';
import { zernikeFromPowerVector } from '../../src/optics/power-vector.js';
import { encircledEnergyDiameterArcmin, monochromaticPsf } from '../../src/optics/pupil-psf.js';

const base = { pupilDiameterMm: 3, defocusD: 0, cylinderD: 0, axisDeg: 0, pixelArcmin: 1, ageYears: 30 };

describe('measured Zernike coefficients (ANSI Z80.28)', () => {
  test('a measured aberration-free eye is nearly diffraction-limited (Strehl > 0.85) and sharper than the typical eye', () => {
    const measured = computeEyeOptics({ ...base, measured: { pupilDiameterMm: 6, coefficientsUm: new Array(15).fill(0) } });
    const typical = computeEyeOptics(base);
    expect(measured.figures.aberrations).toBe('measured');
    expect(measured.figures.strehlRatio).toBeGreaterThan(0.85);
    expect(measured.figures.strehlRatio).toBeGreaterThan(typical.figures.strehlRatio);
  });

  test('coefficients measured over 6 mm keep their dioptric defocus over a 3 mm pupil (power vectors, Thibos et al. 2004)', () => {
    // c₂⁰ = 1 µm over a 3 mm radius is −0.7698 D; over a 1.5 mm radius the same D needs c₂⁰ = 0.25 µm.
    const terms = eyeTerms({ ...base, measured: { pupilDiameterMm: 6, coefficientsUm: [0, 0, 0, 0, 1] } }, 555, 0);
    const grid = { size: 256, sampleRad: 555e-9 / (2 * 3e-3) / 2 };
    const fromMeasured = monochromaticPsf(3, 555, terms, grid);
    const fromPower = monochromaticPsf(3, 555, zernikeFromPowerVector({ mD: -0.7698, j0D: 0, j45D: 0 }, 1.5), grid);
    expect(encircledEnergyDiameterArcmin(fromMeasured, grid, 0.8)).toBeCloseTo(encircledEnergyDiameterArcmin(fromPower, grid, 0.8), 1);
  });

  test('a pupil larger than the measured one is limited to it', () => {
    const optics = computeEyeOptics({ ...base, pupilDiameterMm: 6, measured: { pupilDiameterMm: 4, coefficientsUm: [0, 0, 0, 0, 0.1] } });
    expect(optics.figures.opticalPupilDiameterMm).toBe(4);
  });

  test('setup validation names a missing pupil and too many coefficients', () => {
    try {
      validateSetup({ viewer: { wavefront: { coefficientsUm: new Array(30).fill(0) } } }, 'w.json');
      throw new Error('expected a ConfigError');
    } catch (err) {
      expect(err).toBeInstanceOf(ConfigError);
      const paths = (err as ConfigError).problems.map((p) => p.path);
      expect(paths).toContain('viewer.wavefront.coefficientsUm');
    }
    expect(() => validateSetup({ viewer: { wavefront: { coefficientsUm: [0, 0, 0, 0, 0.2] } } }, 'w.json')).toThrow(/both pupilDiameterMm and coefficientsUm/);
    const ok = validateSetup({ viewer: { wavefront: { pupilDiameterMm: 6, coefficientsUm: [0, 0, 0, 0.05, 0.1, -0.02] } } }, 'w.json');
    expect(ok.viewer.wavefront?.coefficientsUm.length).toBe(6);
  });
});
