/**
 * Prints the white-light luminance MTF of the default eye against Rovamo, Kukkonen & Mustonen (1998)
 * and its monochromatic part against Watson (2013), and fits the frequency scale of the ocular scatter
 * (SCATTER_SCALE_CPD_AT_25 in src/optics/ocular-scatter.ts): the scatter multiplies the transfer, so
 * the fit divides the current one out and tries others. Run with `npx tsx scripts/calibrate-eye.ts`.
 */
import { asymmetricAberrationFactor, computeEyeOptics, eyeTerms, finishPsf, LCA_REFERENCE_NM, luminanceMtfAt, psfGridFor } from '../src/optics/eye-optics.js';
import { monochromaticPsf, otfMagnitude, radialAverage } from '../src/optics/pupil-psf.js';
import { watsonMeanMtf } from '../src/optics/mean-mtf.js';
import { SCATTER_SCALE_CPD_AT_25, scatterTransfer } from '../src/optics/ocular-scatter.js';
import { GLARE_MAX_DEG, scatteredFraction, VEIL_FROM_DEG } from '../src/optics/stray-light.js';

const rovamo = (f: number, p: number): number => Math.exp(-((f / (16.6 - 1.49 * p)) ** Math.exp(0.84 / p - 0.318)));
const PUPILS = [2, 3, 4, 6];
const FREQS = [2, 4, 6, 8, 10, 12, 15, 20, 25, 30];
const WATSON_FREQS = [5, 10, 20, 30];
const core = 1 - scatteredFraction(VEIL_FROM_DEG, GLARE_MAX_DEG, 25, 0.5);

// Transfers without the scatter (divided out), per pupil.
const bare = PUPILS.map((p) => {
  const optics = computeEyeOptics({ pupilDiameterMm: p, defocusD: 0, cylinderD: 0, axisDeg: 0, pixelArcmin: 0.5, ageYears: 25 });
  const s = (f: number): number => scatterTransfer(f, SCATTER_SCALE_CPD_AT_25);
  // Watson (2013) computed his mean MTF from wavefronts with the second-order terms set to zero
  // (not refocused) and without scatter: compare like with like.
  const input = { pupilDiameterMm: p, defocusD: 0, cylinderD: 0, axisDeg: 0, pixelArcmin: 0.5, ageYears: 25 };
  const { grid } = psfGridFor(input);
  const mono = monochromaticPsf(p, LCA_REFERENCE_NM, eyeTerms(input, LCA_REFERENCE_NM, 0), grid);
  finishPsf(mono, grid, Infinity, asymmetricAberrationFactor(input, grid, 0));
  const monoOtf = otfMagnitude(mono, grid.size);
  const focused = optics.figures.monochromatic555;
  return {
    p, focusNm: optics.figures.focusWavelengthNm,
    white: FREQS.map((f) => luminanceMtfAt(optics, f) / s(f)),
    mono: WATSON_FREQS.map((f) => radialAverage(monoOtf, grid, f)),
    focusedMono: [focused.mtfAt5Cpd, focused.mtfAt10Cpd, focused.mtfAt20Cpd, focused.mtfAt30Cpd].map((v) => core * v),
  };
});

function evaluate(scaleCpd: number): { worstRovamo: number; worstWatson: number } {
  let worstRovamo = 0;
  let worstWatson = 0;
  for (const b of bare) {
    FREQS.forEach((f, i) => { worstRovamo = Math.max(worstRovamo, Math.abs(core * b.white[i] * scatterTransfer(f, scaleCpd) - rovamo(f, b.p))); });
    if (b.p >= 3) WATSON_FREQS.forEach((f, i) => { worstWatson = Math.max(worstWatson, Math.abs(b.mono[i] - watsonMeanMtf(f, b.p))); });
  }
  return { worstRovamo, worstWatson };
}

let best = { scale: SCATTER_SCALE_CPD_AT_25, ...evaluate(SCATTER_SCALE_CPD_AT_25) };
for (let scale = 10; scale <= 80; scale += 0.5) {
  const e = evaluate(scale);
  if (e.worstRovamo < best.worstRovamo) best = { scale, ...e };
}
const lines = [`white-light luminance MTF × (1 − veil beyond 1° ${(1 - core).toFixed(3)}) with the scatter at ${SCATTER_SCALE_CPD_AT_25} cpd; model / Rovamo 1998 (555 nm part / Watson 2013)`];
for (const b of bare) {
  lines.push(`${b.p} mm, focused at ${b.focusNm.toFixed(0)} nm: ${FREQS.map((f, i) => `${f}: ${(core * b.white[i] * scatterTransfer(f, SCATTER_SCALE_CPD_AT_25)).toFixed(3)}/${rovamo(f, b.p).toFixed(3)}`).join('  ')}`);
  if (b.p >= 3) lines.push(`   555 nm at the eye's focus with scatter and veil: ${WATSON_FREQS.map((f, i) => `${f}: ${b.focusedMono[i].toFixed(3)}/${watsonMeanMtf(f, b.p).toFixed(3)}`).join('  ')}`);
  if (b.p >= 3) lines.push(`   555 nm wavefront only, second order zero: ${WATSON_FREQS.map((f, i) => `${f}: ${b.mono[i].toFixed(3)}/${watsonMeanMtf(f, b.p).toFixed(3)}`).join('  ')}`);
}
const now = evaluate(SCATTER_SCALE_CPD_AT_25);
lines.push(`now: worst |white − Rovamo| ${now.worstRovamo.toFixed(3)}, worst |555 nm − Watson| ${now.worstWatson.toFixed(3)}`);
lines.push(`best scatter scale ${best.scale} cpd: worst |white − Rovamo| ${best.worstRovamo.toFixed(3)}, worst |555 nm − Watson| ${best.worstWatson.toFixed(3)}`);
process.stdout.write(`${lines.join('\n')}\n`);
