/** The size specification printed by `eyeproof sizes`: a table, Markdown or JSON. */
import type { DesignLength } from '../src/analysis/labels.js';
import { AUDIENCE_SOURCES } from '../src/analysis/audience.js';
import { READING_RESERVE } from '../src/analysis/letter-size.js';
import type { Setup } from '../src/config/setup.js';
import type { SizeSpec } from '../src/pipeline.js';
import { roundNumbers } from '../src/report/build-report.js';
import { CAUTION_SHORT } from '../src/report/cautions.js';

export type SizesFormat = 'table' | 'markdown' | 'json';

const r1 = (v: number): string => (Math.round(v * 10) / 10).toFixed(1);

function cells(l: DesignLength, showDesign: boolean): string[] {
  return [`${Math.ceil(l.px)}`, ...(showDesign ? [r1(l.designPx)] : []), ...(l.pt !== undefined ? [r1(l.pt), r1(l.mm!)] : []), r1(l.arcmin)];
}

export function formatSizes(setup: Setup, spec: SizeSpec, format: SizesFormat): string {
  if (format === 'json') {
    return `${JSON.stringify(roundNumbers({ display: setup.presetNames.display ?? 'custom', viewer: setup.presetNames.viewer ?? 'custom', ...spec, readingReserve: READING_RESERVE, ...(spec.rows[0].audience ? { audienceAssumptions: AUDIENCE_SOURCES } : {}) }), null, 2)}\n`;
  }
  const showDesign = spec.units.pixelRatio !== 1;
  const screen = spec.units.mmPerFramePx !== undefined;
  const unitNames = ['px', ...(showDesign ? ['design px'] : []), ...(screen ? ['pt', 'mm'] : []), '′'];
  const headers = ['from gaze °', ...unitNames.map((u) => `cap height ${u}`), ...unitNames.map((u) => `letter advance ${u}`), 'limited by'];
  const audience = spec.rows[0].audience;
  if (audience) headers.push(`cap px for ${audience.share} % uncorrected`, `cap px for ${audience.share} % corrected`);
  const body = spec.rows.map((r) => [
    String(r.eccentricityDeg), ...cells(r.capHeight, showDesign), ...cells(r.letterAdvance, showDesign), r.limitedBy,
    ...(r.audience ? [String(Math.ceil(r.audience.uncorrected.px)), String(Math.ceil(r.audience.corrected.px))] : []),
  ]);
  const viewer = `${setup.presetNames.viewer ?? 'custom viewer'} (${setup.viewer.ageYears} y)`;
  const intro = `Smallest capital height for fluent reading (${READING_RESERVE}× the legibility threshold) and letter advance (centre to centre) that escapes crowding, by distance from the gaze, for ${viewer} on ${setup.presetNames.display ?? 'this display'}; ${r1(60 / spec.arcminPerPx)} px per degree at the gaze, light ${r1(spec.adaptingLuminanceCdM2)} cd/m² (${spec.adaptingLuminanceFrom}).`;
  const notes = [
    ...(audience ? [`Audience columns: the capital height ${audience.share} % of each audience reads at that place (${AUDIENCE_SOURCES}).`] : []),
    'Sources: letter rule of this tool (Elliott, Yang & Whitaker 1995; Blendowske 2015); reading reserve Whittaker & Lovie-Kitchin (1993); crowding Song, Levi & Pelli (2014) Eq. 14.',
    CAUTION_SHORT,
  ];
  if (format === 'markdown') {
    return [intro, '', `| ${headers.join(' | ')} |`, `|${headers.map((h) => (h === 'limited by' ? '---' : '---:')).join('|')}|`, ...body.map((row) => `| ${row.join(' | ')} |`), '', ...notes, ''].join('\n');
  }
  const widths = headers.map((h, i) => Math.max(h.length, ...body.map((row) => row[i].length)));
  const line = (row: string[]): string => row.map((c, i) => c.padStart(widths[i])).join('  ');
  return [intro, '', line(headers), ...body.map(line), '', ...notes, ''].join('\n');
}
