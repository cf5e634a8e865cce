/** The terminal's label summary: the same verdicts as the report and the maps, worst first, each with its fix. */
import { countedJudgement, type LabelVerdict } from '../src/analysis/labels.js';
import type { FixationResult } from '../src/proof.js';
import { describeVerdicts } from '../src/report/build-report.js';

const MAX_LISTED = 12;


/** How far a label is from passing: the smallest margin among the limits of the judgement that counts. */
function worstMargin(v: LabelVerdict): number {
  const j = countedJudgement(v);
  return Math.min(...j.limits.map((l) => l.margin));
}

export function formatLabelSummary(verdicts: readonly LabelVerdict[], file: string, fixations?: FixationResult[]): string {
  const lines = [`eyeproof: ${verdicts.length} labels from ${file}, each judged by its role (glance: from the gaze; look: when looked at): ${describeVerdicts(verdicts)}`];
  const failing = verdicts.filter((v) => v.passes === false).sort((a, b) => worstMargin(a) - worstMargin(b));
  for (const v of failing.slice(0, MAX_LISTED)) {
    const j = countedJudgement(v);
    lines.push(`  ✗ ${v.id} (${v.role}, "${v.text.length > 28 ? `${v.text.slice(0, 27)}…` : v.text}"): ${v.verdict}, limited by ${j.limitedBy}${j.limitedBy === 'size' ? ` (${j.sizeLimitedBy})` : ''} — fix: ${v.fix?.summary ?? ''}`);
  }
  if (failing.length > MAX_LISTED) lines.push(`  … and ${failing.length - MAX_LISTED} more failing labels in report.json`);
  if (fixations && fixations.length > 1) {
    lines.push(`  per fixation (${fixations.length}):`);
    for (const f of fixations) lines.push(`    ${f.given.padEnd(16)} ${f.labels ? describeVerdicts(f.labels) : ''}${f.outsideFrame ? ' (gaze outside the frame)' : ''}`);
  }
  return `${lines.join('\n')}\n`;
}
