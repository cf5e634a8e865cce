/** The human-readable table printed by `eyeproof numbers`. */
import type { Setup } from '../src/config/setup.js';
import type { DerivedNumbers } from '../src/pipeline.js';
import { CAUTION_SHORT } from '../src/report/cautions.js';
import { FRAME_MIN_LETTER_PX } from '../src/analysis/letter-size.js';

const f = (v: number, digits = 2): string => v.toFixed(digits);

export function formatNumbersTable(setup: Setup, n: DerivedNumbers): string {
  const { display: d, eye: e } = n;
  const rows: [string, string][] = [
    ['display', `${setup.presetNames.display ?? 'custom'} (${d.kind}), ${d.resolutionPx.join('×')} px`],
    ['field of view', `${f(d.fieldOfViewDeg.horizontal, 1)}° × ${f(d.fieldOfViewDeg.vertical, 1)}°`],
    ['pixels per degree at gaze', `${f(d.pixelsPerDegreeAtGaze, 1)} px/° (${f(d.arcminPerFramePxAtGaze, 3)}′ per px)`],
    ['focal distance', `${f(d.focalDistanceM, 3)} m (${f(1 / d.focalDistanceM)} D)`],
    ['viewer', `${setup.presetNames.viewer ?? 'custom'}: ${setup.viewer.ageYears} y, sphere ${f(setup.viewer.refraction.sphereD)} D, cylinder ${f(setup.viewer.refraction.cylinderD)} D, ${setup.viewer.eyes} eye${setup.viewer.eyes === 'both' ? 's' : ''}${setup.viewer.glasses === 'display' ? ', glasses for the display' : ''}`],
    ['adapting luminance', `${f(n.light.adaptingLuminanceCdM2, n.light.adaptingLuminanceCdM2 < 1 ? 4 : 1)} cd/m² (${n.light.adaptingLuminanceFrom})`],
    ['light regime', `${n.light.regime}, cone share m = ${f(n.light.mesopicFactorM, 3)} (CIE 191), S/P ${f(n.light.scotopicToPhotopicRatio)}`],
    ...(n.blindSpot ? [['blind spot', `${n.blindSpot.eye} eye: ${n.blindSpot.centreFieldDeg[0]}°, ${n.blindSpot.centreFieldDeg[1]}° from the gaze${n.blindSpot.centrePx ? ` (frame px ${n.blindSpot.centrePx.join(', ')})` : ', outside the frame'}`] as [string, string]] : []),
    ['pupil', `${f(e.pupilDiameterMm)} mm (${e.pupilSource}${e.pupilAgeClamped ? ', age clamped to 20–83' : ''})`],
    ['accommodation amplitude', `${f(e.accommodationAmplitudeD)} D (Hofstetter mean), ${f(e.sustainedAccommodationD)} D usable in sustained viewing (${Math.round(100 * setup.models.accommodationReserve)} % in reserve)`],
    ['accommodation demand / supplied', `${f(e.accommodationDemandD)} D / ${f(e.accommodationD)} D`],
    ['residual defocus', `${f(e.defocusD)} D${e.astigmatismD ? `, cylinder ${f(e.astigmatismD)} D, blur strength ${f(e.blurStrengthD)} D` : ''}`],
    ['blur circle', `${f(e.blurCircleArcmin)}′`],
    ['optics, white light', `MTF ${f(n.optics.mtfAt5Cpd)} / ${f(n.optics.mtfAt10Cpd)} / ${f(n.optics.mtfAt20Cpd)} / ${f(n.optics.mtfAt30Cpd)} at 5/10/20/30 cpd; Strehl ${f(n.optics.strehlRatio, 3)} at 555 nm (${n.optics.aberrations})`],
    ['encircled energy 50 % / 80 %', `${f(n.optics.encircledEnergy50DiameterArcmin, 1)}′ / ${f(n.optics.encircledEnergy80DiameterArcmin, 1)}′ diameter`],
    ['defocus by channel (R / G / B)', `${f(n.optics.defocusByChannelD.red)} / ${f(n.optics.defocusByChannelD.green)} / ${f(n.optics.defocusByChannelD.blue)} D (in focus: ${n.optics.focusWavelengthNm.toFixed(0)} nm, the best white-light image)`],
    ['stray light beyond 1°', `${f(100 * n.optics.scatteredFraction1To100Deg, 1)} % of a point's light (CIE glare); surround ${f(n.light.surroundLuminanceCdM2, 2)} cd/m²`],
    ['optical limit at the gaze', `${f(e.opticalCutoffCpdAtGaze, 1)} cpd (white-light MTF at the letter threshold); smallest letter ${f(e.smallestLetterArcminAtGaze, 2)}′ (logMAR ${f(Math.log10(e.smallestLetterArcminAtGaze / 5))})`],
    ['percept.png shows', n.percept.mode === 'same-display' ? `what to show on this display for the ${n.percept.referenceViewer?.name ?? 'custom'} reference viewer (${n.percept.referenceViewer?.ageYears} y, pupil ${f(n.percept.referenceViewer?.pupilDiameterMm ?? 0)} mm)${n.percept.opticsCancel ? ' — same optics, none applied' : ''}` : 'the image on the simulated retina'],
  ];
  const width = Math.max(...rows.map(([k]) => k.length));
  const lines = rows.map(([k, v]) => `${k.padEnd(width)}  ${v}`);
  lines.push('', `with age (${setup.viewer.ageYears} y):`);
  for (const a of n.ageing) lines.push(`  ${a.quantity}: ${f(a.value, a.unit === 'logMAR' || a.unit === 'µm' ? 3 : 2)}${a.unit && a.unit !== 'logMAR' ? ` ${a.unit}` : a.unit === 'logMAR' ? ' logMAR' : ''} — ${a.source}`);
  lines.push('', `acuity (${setup.models.acuity}) on the horizontal meridian:`);
  lines.push('  ecc °  meridian     cutoff cpd  letter ′  letter px  reading px  limited by');
  for (const r of n.acuity) {
    lines.push(`  ${String(r.eccentricityDeg).padStart(5)}  ${r.meridian.padEnd(11)}  ${f(r.cutoffCpd, 1).padStart(10)}  ${f(r.smallestLetterArcmin, 1).padStart(8)}  ${f(r.smallestLetterPx, 1).padStart(9)}  ${f(r.readingLetterPx, 1).padStart(10)}  ${r.limitedBy}`);
  }
  lines.push('', `letter = smallest legible capital height; reading = 2× that for fluent reading.`);
  if (n.acuity.some((r) => r.limitedBy === 'display pixels')) {
    lines.push(`letter px is never below ${FRAME_MIN_LETTER_PX} px: where the limit is "display pixels" the eye could read the smaller letter in arcmin, but the frame cannot draw it.`);
  }
  if (n.light.adaptingLuminanceFrom === 'assumed 18 % grey frame') {
    lines.push('Without a frame the light is that of an 18 % grey frame; `eyeproof proof` measures the frame around the gaze, so its pupil, optics and letter sizes can differ from these.');
  }
  lines.push(CAUTION_SHORT, '');
  return lines.join('\n');
}
