/**
 * One batch job: read its inputs, run the proof, write the kept outputs and the job's summary
 * (job.json) into its folder all at once. The same function runs in the local pool's worker threads
 * and in queue workers, so both give byte-identical outputs.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { countedJudgement, type LabelVerdict } from '../analysis/labels.js';
import { displayPresets, viewerPresets } from '../config/presets.js';
import { mergeSetupJson, validateSetup } from '../config/validate.js';
import { MAX_JSON_FILE_BYTES, readInputBytes, readSetupJson } from '../io/read-input.js';
import { writeOutputsAtomically } from '../io/write-outputs.js';
import { proofFrame } from '../proof.js';
import { EYEPROOF_VERSION } from '../version.js';
import type { Job } from './plan.js';

export interface JobLabelResult {
  id: string;
  role: string;
  verdict: string;
  passes: boolean | null;
  limitedBy: string;
  /** The tightest limit's margin (1 = just passes). */
  margin: number;
  audienceUncorrected: number | null;
  audienceCorrected: number | null;
}

export interface JobSummary {
  id: string;
  eyeproofVersion: string;
  folder: string;
  frame: string;
  setup: string;
  viewer: string;
  gaze: string;
  gazePx: [number, number];
  labels: JobLabelResult[];
}

/** Where a batch runs: the plan's folder (inputs are relative to it) and the output root. */
export interface JobPlace {
  base: string;
  root: string;
}

type Json = Record<string, unknown>;

async function setupJson(ref: string, base: string): Promise<Json> {
  if (displayPresets.some((p) => p.name === ref)) return { display: { preset: ref } };
  return (await readSetupJson(resolve(base, ref))) as Json;
}

async function viewerJson(ref: string, base: string): Promise<Json> {
  if (viewerPresets.some((p) => p.name === ref)) return { preset: ref };
  const v = (await readSetupJson(resolve(base, ref))) as Json;
  return v && typeof v === 'object' && Object.hasOwn(v, 'viewer') ? (v.viewer as Json) : v;
}

const round = (v: number, d = 4): number => Math.round(v * 10 ** d) / 10 ** d;

function labelResults(labels: readonly LabelVerdict[] | undefined): JobLabelResult[] {
  return (labels ?? []).map((v) => {
    const j = countedJudgement(v);
    return {
      id: v.id, role: v.role, verdict: v.verdict, passes: v.passes, limitedBy: v.role === 'decorative' ? '' : j.limitedBy,
      margin: v.role === 'decorative' ? 1 : round(Math.min(...j.limits.map((l) => l.margin))),
      audienceUncorrected: v.audience ? round(v.audience.uncorrected) : null, audienceCorrected: v.audience ? round(v.audience.corrected) : null,
    };
  });
}

/** True when the job's folder holds its summary with this id and every kept output. */
export function isJobDone(job: Job, place: JobPlace): boolean {
  const folder = join(place.root, job.folder);
  try {
    const summary = JSON.parse(readFileSync(join(folder, 'job.json'), 'utf8')) as JobSummary;
    return summary.id === job.id && job.outputs.every((o) => existsSync(join(folder, o)));
  } catch {
    return false;
  }
}

export async function runJob(job: Job, place: JobPlace): Promise<JobSummary> {
  const raw = await setupJson(job.setup.ref, place.base);
  const merged = mergeSetupJson(raw, {});
  merged.viewer = await viewerJson(job.viewer.ref, place.base);
  const source = `${job.setup.ref} + ${job.viewer.ref}`;
  const setup = validateSetup(merged, source);
  const framePath = resolve(place.base, job.frame.path);
  const bytes = await readInputBytes(framePath, 'the frame');
  const labels = job.frame.labels
    ? { file: job.frame.labels, text: new TextDecoder().decode(await readInputBytes(resolve(place.base, job.frame.labels), 'the labels file', MAX_JSON_FILE_BYTES)) }
    : undefined;
  // Paths in reports are the plan's own (relative), so every runner writes the same bytes.
  const out = await proofFrame(bytes, job.frame.path, setup, source, { ...(labels ? { labels } : {}), gaze: job.gaze, detectLabels: true });
  const summary: JobSummary = {
    id: job.id, eyeproofVersion: EYEPROOF_VERSION, folder: job.folder, frame: job.frame.path, setup: job.setup.name, viewer: job.viewer.name, gaze: job.gaze,
    gazePx: out.result.numbers.gazePx, labels: labelResults(out.result.labels),
  };
  const files = out.files.filter((f) => job.outputs.includes(f.name));
  files.push({ name: 'job.json', bytes: `${JSON.stringify(summary, null, 2)}\n` });
  await writeOutputsAtomically(join(place.root, job.folder), files);
  return summary;
}
