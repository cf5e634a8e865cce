import { describe, expect, test } from 'vitest';
import { fieldMeridians, hexNyquistCpd, midgetSpacingDeg, rgcNyquistCpd } from '../../src/retina/watson-rgc.js';

describe('midget RGC sampling, Watson (2014)', () => {
  test('r = 0: spacing 0.5299′, Nyquist 65.37 cpd (Watson 2014, Eq. 9)', () => {
    expect(midgetSpacingDeg(0, 'temporal') * 60).toBeCloseTo(0.5299, 4);
    expect(hexNyquistCpd(midgetSpacingDeg(0, 'temporal'))).toBeCloseTo(65.37, 2);
  });
  test('temporal 10°: spacing 4.344′, Nyquist 7.974 cpd (Watson 2014, derived)', () => {
    expect(midgetSpacingDeg(10, 'temporal') * 60).toBeCloseTo(4.344, 3);
    expect(hexNyquistCpd(midgetSpacingDeg(10, 'temporal'))).toBeCloseTo(7.974, 3);
  });
  test('superior 10°: Nyquist 6.492 cpd; temporal 2°: 23.15 cpd (Watson 2014, derived)', () => {
    expect(hexNyquistCpd(midgetSpacingDeg(10, 'superior'))).toBeCloseTo(6.492, 3);
    expect(hexNyquistCpd(midgetSpacingDeg(2, 'temporal'))).toBeCloseTo(23.15, 2);
  });
  test('the superior field is sampled more finely than the inferior beyond a few degrees — rows not swapped (Watson 2014, Table 1)', () => {
    // At 20°: re_superior 16.35 > re_inferior 12.13, so the superior field keeps more cells.
    expect(midgetSpacingDeg(20, 'superior')).toBeLessThan(midgetSpacingDeg(20, 'inferior'));
  });
  test('right of fixation is the temporal field of the right eye and the nasal field of the left (anatomy, common practice)', () => {
    expect(fieldMeridians(0, 'right').horizontal).toBe('temporal');
    expect(fieldMeridians(0, 'left').horizontal).toBe('nasal');
    expect(fieldMeridians(90, 'right').vertical).toBe('superior');
    expect(fieldMeridians(270, 'right').vertical).toBe('inferior');
  });
  test('off the meridians the spacing interpolates between the horizontal and vertical ones (Watson 2014, Eq. 10)', () => {
    const h = rgcNyquistCpd(10, 0, 'right');
    const v = rgcNyquistCpd(10, 90, 'right');
    const d = rgcNyquistCpd(10, 45, 'right');
    expect(d).toBeLessThan(Math.max(h, v));
    expect(d).toBeGreaterThan(Math.min(h, v));
    expect(h).toBeCloseTo(7.974, 3);
  });
  test('with both eyes the better-sampled eye sets the limit (common practice)', () => {
    expect(rgcNyquistCpd(20, 180, 'both')).toBeCloseTo(Math.max(rgcNyquistCpd(20, 180, 'right'), rgcNyquistCpd(20, 180, 'left')), 10);
  });
});
