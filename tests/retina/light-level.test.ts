import { describe, expect, test } from 'vitest';
import { cie191Mesopic, lightRegime } from '../../src/retina/light-level.js';

describe('mesopic photometry, CIE 191:2010', () => {
  test.each([
    [1, 1, 0.767, 1.0],
    [1, 1.5, 0.7744, 1.0524],
    [0.1, 1.5, 0.4554, 0.1162],
  ])('L_p = %f, S/P = %f → m = %f, L_mes = %f (CIE 191, derived checks)', (lp, sp, m, lmes) => {
    const r = cie191Mesopic(lp, sp);
    expect(r.m).toBeCloseTo(m, 3);
    expect(r.mesopicCdM2).toBeCloseTo(lmes, 3);
  });

  test('m reaches 1 at 5 cd/m² and 0 at 0.005 cd/m² for S/P = 1 (CIE 191 range of the mesopic region)', () => {
    expect(cie191Mesopic(5, 1).m).toBeCloseTo(1, 3);
    expect(cie191Mesopic(0.005, 1).m).toBeCloseTo(0, 2);
  });

  test('regimes: photopic above 5 cd/m², scotopic below 0.005 cd/m², mesopic between (CIE 191:2010)', () => {
    expect(lightRegime(10)).toBe('photopic');
    expect(lightRegime(1)).toBe('mesopic');
    expect(lightRegime(0.01)).toBe('mesopic');
    expect(lightRegime(0.001)).toBe('scotopic');
  });
});
