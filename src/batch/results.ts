/**
 * The results index of a batch, built from the jobs' summaries on disk (job.json in each folder), so
 * it is the same however the plan ran: results.jsonl (one line per job), results.csv (one row per job
 * and label) and summary.html (the failing labels, worst first, and for whom, linking to each job's
 * outputs).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { OutputFile } from '../io/write-outputs.js';
import { CAUTIONS } from '../report/cautions.js';
import type { Job } from './plan.js';
import type { JobSummary } from './run-job.js';

const csvCell = (v: unknown): string => {
  const s = v === null || v === undefined ? '' : String(v);
  return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
};
const esc = (s: string): string => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** The summaries of the jobs that are done, in the plan's order. */
export function collectSummaries(jobs: readonly Job[], root: string): JobSummary[] {
  const out: JobSummary[] = [];
  for (const job of jobs) {
    const file = join(root, job.folder, 'job.json');
    if (!existsSync(file)) continue;
    const s = JSON.parse(readFileSync(file, 'utf8')) as JobSummary;
    if (s.id === job.id) out.push(s);
  }
  return out;
}

export function resultFiles(jobs: readonly Job[], summaries: readonly JobSummary[]): OutputFile[] {
  const jsonl = summaries.map((s) => JSON.stringify(s)).join('\n') + (summaries.length ? '\n' : '');
  const header = ['job', 'frame', 'setup', 'viewer', 'gaze', 'label', 'role', 'verdict', 'passes', 'limitedBy', 'margin', 'audienceUncorrected', 'audienceCorrected', 'folder'];
  const rows = summaries.flatMap((s) => (s.labels.length ? s.labels : [undefined]).map((l) => [
    s.id, s.frame, s.setup, s.viewer, s.gaze, l?.id, l?.role, l?.verdict, l?.passes, l?.limitedBy, l?.margin, l?.audienceUncorrected, l?.audienceCorrected, s.folder,
  ].map(csvCell).join(',')));
  const csv = [header.join(','), ...rows].join('\n') + '\n';
  // Failing labels, worst first: per frame and label, the runs (setup · viewer · gaze) where it fails.
  const failing = new Map<string, { frame: string; label: string; worst: number; where: { text: string; folder: string; margin: number }[] }>();
  for (const s of summaries) {
    for (const l of s.labels) {
      if (l.passes !== false) continue;
      const key = `${s.frame}\u0000${l.id}`;
      const entry = failing.get(key) ?? { frame: s.frame, label: l.id, worst: Infinity, where: [] };
      entry.worst = Math.min(entry.worst, l.margin);
      entry.where.push({ text: `${s.setup} · ${s.viewer} · ${s.gaze}: ${l.verdict}, ${l.limitedBy} (margin ${l.margin.toFixed(2)})`, folder: s.folder, margin: l.margin });
      failing.set(key, entry);
    }
  }
  const list = [...failing.values()].sort((a, b) => a.worst - b.worst || b.where.length - a.where.length);
  const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'"><title>eyeproof batch summary</title>
<style>body { max-width: 1100px; margin: 0 auto; padding: 20px; font: 15px/1.45 system-ui, sans-serif; color: #1d2126; background: #f7f6f2; } li { margin: 2px 0; } .caution { background: #fff4d6; border-left: 4px solid #e6a100; padding: 8px 12px; } h2 { font-size: 16px; margin-top: 22px; }</style></head><body>
<h1>eyeproof batch: ${summaries.length} of ${jobs.length} jobs done</h1>
<p class="caution">${CAUTIONS.map(esc).join(' ')}</p>
<p>${list.length} labels fail for someone; worst first (smallest margin). Each line: setup · viewer · gaze, with a link to that job's outputs.</p>
${list.map((f) => `<h2>${esc(f.label)} in ${esc(f.frame)} — fails in ${f.where.length} run${f.where.length > 1 ? 's' : ''}</h2><ul>${f.where.sort((a, b) => a.margin - b.margin).map((w) => `<li><a href="${esc(`../${w.folder}/`)}">${esc(w.text)}</a></li>`).join('')}</ul>`).join('\n')}
</body></html>
`;
  return [{ name: 'results.jsonl', bytes: jsonl }, { name: 'results.csv', bytes: csv }, { name: 'summary.html', bytes: html }];
}
