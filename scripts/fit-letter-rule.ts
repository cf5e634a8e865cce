/**
 * Fits the letter rule's constants (src/analysis/letter-size.ts) and prints how the rule then meets
 * its sources. The rule: the smallest letter is sqrt(neural² + optical²), with
 *   neural  = 2.5 cycles per letter at `letterFactor` × the acuity model's retinal cutoff,
 *   optical = N cycles per letter at the frequency where the eye's white-light MTF falls to T.
 * Targets: a young eye's best-corrected foveal letter (logMAR −0.16, Elliott, Yang & Whitaker 1995,
 * 25–29 years) at a 3 mm pupil, and unaided acuity under defocus b, MAR ∝ 1 + b² (Blendowske 2015,
 * Optom Vis Sci, pooling Raasch 1995) for b = 0.5 … 2 D at that pupil. The periphery is not fitted: the
 * printout compares it with Song, Levi & Pelli (2014) Eq. 13. Run with `npx tsx scripts/fit-letter-rule.ts`.
 */
import { frequencyAtTransfer } from '../src/analysis/letter-size.js';
import { computeEyeOptics, luminanceMtfAt } from '../src/optics/eye-optics.js';
import { GLARE_MAX_DEG, scatteredFraction, VEIL_FROM_DEG } from '../src/optics/stray-light.js';
import { acuityModels } from '../src/retina/acuity-model.js';

const PUPIL_MM = 3;
const YOUNG_LOGMAR = -0.16;
const DEFOCUS_D = [0, 0.5, 1, 1.5, 2];
const THRESHOLDS = [0.05, 0.08, 0.1, 0.12, 0.15, 0.2, 0.25];
const core = 1 - scatteredFraction(VEIL_FROM_DEG, GLARE_MAX_DEG, 25, 0.5);

/** Frequencies where the MTF falls to each threshold, by defocus. */
const opticalCutoffs = DEFOCUS_D.map((b) => {
  const optics = computeEyeOptics({ pupilDiameterMm: PUPIL_MM, defocusD: b, cylinderD: 0, axisDeg: 0, pixelArcmin: 0.5, ageYears: 25 });
  return THRESHOLDS.map((t) => frequencyAtTransfer((f) => core * luminanceMtfAt(optics, f), t));
});

const rgcFoveaCpd = acuityModels['rgc-sampling'].cutoffCpd(0, 0, 'both');
const letterArcmin = (kappa: number, retinaCpd: number, n: number, opticalCpd: number): number => Math.hypot(150 / (kappa * retinaCpd), (60 * n) / opticalCpd);

let best = { err: Infinity, t: 0, n: 0, kappa: 0 };
THRESHOLDS.forEach((t, ti) => {
  for (let n = 0.5; n <= 2.5; n += 0.01) {
    for (let kappa = 0.4; kappa <= 1.5; kappa += 0.002) {
      const at = (bi: number): number => letterArcmin(kappa, rgcFoveaCpd, n, opticalCutoffs[bi][ti]);
      const l0 = at(0);
      let err = 4 * (Math.log10(l0 / 5) - YOUNG_LOGMAR) ** 2;
      for (let bi = 1; bi < DEFOCUS_D.length; bi++) err += (Math.log10(at(bi) / l0) - Math.log10(1 + DEFOCUS_D[bi] ** 2)) ** 2;
      if (err < best.err) best = { err, t, n, kappa };
    }
  }
});
const ti = THRESHOLDS.indexOf(best.t);
console.log(`threshold modulation T = ${best.t}, optical cycles per letter N = ${best.n.toFixed(2)}, rgc-sampling letter factor = ${best.kappa.toFixed(3)}`);
const l0 = letterArcmin(best.kappa, rgcFoveaCpd, best.n, opticalCutoffs[0][ti]);
DEFOCUS_D.forEach((b, bi) => {
  const l = letterArcmin(best.kappa, rgcFoveaCpd, best.n, opticalCutoffs[bi][ti]);
  console.log(`  ${b.toFixed(1)} D: logMAR ${Math.log10(l / 5).toFixed(3)}, MAR ratio ${(l / l0).toFixed(2)} (Blendowske ${(1 + b * b).toFixed(2)})`);
});

// The other acuity model gets the letter factor that gives the same young fovea.
const neuralNeeded = Math.sqrt((5 * 10 ** YOUNG_LOGMAR) ** 2 - ((60 * best.n) / opticalCutoffs[0][ti]) ** 2);
const ctFovea = acuityModels['contrast-threshold'].cutoffCpd(0, 0, 'both');
console.log(`contrast-threshold letter factor = ${(150 / (neuralNeeded * ctFovea)).toFixed(3)}`);

console.log('periphery (rgc-sampling, horizontal meridian, optics ignored) against Song, Levi & Pelli (2014) Eq. 13:');
for (const e of [2, 5, 10, 20, 30]) {
  const ours = 150 / (best.kappa * acuityModels['rgc-sampling'].cutoffCpd(e, 0, 'both'));
  const song = 0.029 * (e + 2.72) * 60;
  console.log(`  ${e}°: ${ours.toFixed(1)}′ vs ${song.toFixed(1)}′ (${Math.log10(ours / song).toFixed(3)} log)`);
}
