/**
 * The default eye's optics in white light against published data: Rovamo, Kukkonen & Mustonen (1998)
 * for the white-light foveal MTF, Watson (2013) for the monochromatic part — as figures, and end to
 * end: gratings on a display proofed through the whole pipeline and measured in the written PNG.
 */
import { describe, expect, test } from 'vitest';
import { computeEyeOptics, luminanceMtfAt } from '../../src/optics/eye-optics.js';
import { watsonMeanMtf } from '../../src/optics/mean-mtf.js';
import { GLARE_MAX_DEG, scatteredFraction, VEIL_FROM_DEG } from '../../src/optics/stray-light.js';
import { boxAround, modulationAt, paintGrating, proofThroughFiles, screenSetup, uniformFrame } from '../helpers/synthetic.js';

/** Rovamo, Kukkonen & Mustonen (1998), JOSA A 15(9):2504: O(f) = exp(−(f/fc)^n), fc = 16.6 − 1.49p, n = exp(0.840/p − 0.318). */
const rovamo = (fCpd: number, pupilMm: number): number => Math.exp(-((fCpd / (16.6 - 1.49 * pupilMm)) ** Math.exp(0.84 / pupilMm - 0.318)));
/** Share of light left in the core by the CIE glare equation beyond 1° at 25 years, p = 0.5 (CIE 180:2010). */
const CORE = 1 - scatteredFraction(VEIL_FROM_DEG, GLARE_MAX_DEG, 25, 0.5);

describe('white-light optics of the default eye (25 years)', () => {
  test('Rovamo, Kukkonen & Mustonen (1998) check values: p = 3 mm → O(8) = 0.512, O(20) = 0.198; p = 6 mm → O(8) = 0.355, O(20) = 0.107 (derived)', () => {
    expect(rovamo(8, 3)).toBeCloseTo(0.512, 3);
    expect(rovamo(20, 3)).toBeCloseTo(0.198, 3);
    expect(rovamo(8, 6)).toBeCloseTo(0.355, 3);
    expect(rovamo(20, 6)).toBeCloseTo(0.107, 3);
  });

  test('white-light luminance MTF (with the veil) within 0.075 of Rovamo et al. (1998) from 2 to 30 cpd at 2, 3, 4 and 6 mm pupils', () => {
    const rows: string[] = [];
    let worst = 0;
    for (const p of [2, 3, 4, 6]) {
      const optics = computeEyeOptics({ pupilDiameterMm: p, defocusD: 0, cylinderD: 0, axisDeg: 0, pixelArcmin: 0.5, ageYears: 25 });
      for (const f of [2, 4, 6, 8, 10, 12, 15, 20, 25, 30]) {
        const ours = CORE * luminanceMtfAt(optics, f);
        worst = Math.max(worst, Math.abs(ours - rovamo(f, p)));
        rows.push(`${p} mm ${f} cpd: ${ours.toFixed(3)} vs ${rovamo(f, p).toFixed(3)}`);
      }
    }
    expect(worst, rows.join('\n')).toBeLessThan(0.075);
  });

  test('the monochromatic part (555 nm, at the eye’s focus) within 0.2 of the Watson (2013) mean MTF at 3, 4 and 6 mm; the white light is softer than it at 10 cpd (chromatic aberration)', () => {
    const rows: string[] = [];
    let worst = 0;
    for (const p of [3, 4, 6]) {
      const optics = computeEyeOptics({ pupilDiameterMm: p, defocusD: 0, cylinderD: 0, axisDeg: 0, pixelArcmin: 0.5, ageYears: 25 });
      const m = optics.figures.monochromatic555;
      for (const [f, v] of [[5, m.mtfAt5Cpd], [10, m.mtfAt10Cpd], [20, m.mtfAt20Cpd], [30, m.mtfAt30Cpd]] as const) {
        worst = Math.max(worst, Math.abs(CORE * v - watsonMeanMtf(f, p)));
        rows.push(`${p} mm ${f} cpd: ${(CORE * v).toFixed(3)} vs ${watsonMeanMtf(f, p).toFixed(3)}`);
      }
      expect(optics.figures.mtfAt10Cpd).toBeLessThan(m.mtfAt10Cpd);
    }
    expect(worst, rows.join('\n')).toBeLessThan(0.2);
  });

  test('the eye focuses where the white-light luminance image is best: between 540 and 580 nm, near the peak of V(λ) (CIE 1924)', () => {
    for (const p of [2, 3, 4, 6]) {
      const { figures } = computeEyeOptics({ pupilDiameterMm: p, defocusD: 0, cylinderD: 0, axisDeg: 0, pixelArcmin: 0.5, ageYears: 25 });
      expect(figures.focusWavelengthNm).toBeGreaterThan(540);
      expect(figures.focusWavelengthNm).toBeLessThan(580);
    }
  });
});

describe('end to end: white-light gratings at the gaze on the retina, measured in percept.png', () => {
  // 60 px/°: the frame's Nyquist limit (30 cpd) lies below the foveal sampling limit, so at the gaze
  // the retina passes everything and the optics alone shape the gratings.
  const W = 480;
  const H = 240;
  const PPD = 60;
  // A uniformly grey surround of the frame's mean: the veil is then the full share the CIE equation scatters.
  const setupFor = (pupilMm: number) => screenSetup(W, H, PPD, {
    viewer: { preset: 'age-25', pupilDiameterMm: pupilMm },
    percept: { mode: 'retinal-image' },
    light: { surroundLuminanceCdM2: 200 * 0.5 },
  });

  test.each([
    [3, 'vertical'], [3, 'horizontal'], [6, 'vertical'], [6, 'horizontal'],
  ] as const)('%i mm pupil, %s stripes: 8, 12 and 20 cpd keep Rovamo et al. (1998) × pixel aperture, within 0.08 (the veil is part of the psychophysical MTF)', async (pupilMm, orientation) => {
    const rows: string[] = [];
    for (const fCpd of [8, 12, 20]) {
      const cyclesPerPx = fCpd / PPD;
      const frame = uniformFrame(W, H, [0.5, 0.5, 0.5]);
      paintGrating(frame, [0, 0, W, H], cyclesPerPx, orientation, 0.5, 0.4);
      const { frame: written, percept } = await proofThroughFiles(frame, setupFor(pupilMm));
      const box = boxAround(W / 2, H / 2, cyclesPerPx, 30, orientation);
      const kept = modulationAt(percept, box, cyclesPerPx, orientation) / modulationAt(written, box, cyclesPerPx, orientation);
      // A display pixel is a box: its aperture passes sinc(π·f·Δ) along the grating (common practice).
      const aperture = Math.sin(Math.PI * cyclesPerPx) / (Math.PI * cyclesPerPx);
      const expected = rovamo(fCpd, pupilMm) * aperture;
      rows.push(`${fCpd} cpd: kept ${kept.toFixed(3)}, expected ${expected.toFixed(3)}`);
      expect(Math.abs(kept - expected), rows.join('\n')).toBeLessThan(0.08);
    }
  });
});
