/**
 * A batch plan: frames (paths or globs, with their labels), setups, viewers, gaze lists, which
 * outputs to keep and an output root, in one JSON file. Validated like a setup (every problem at
 * once, with its path) and expanded into jobs deterministically: each job has an id from the
 * content of its inputs and eyeproof's version, so a rerun skips what is done and a changed frame
 * is redone.
 *
 * {
 *   "root": "batch-out",                               output root, relative to the plan file
 *   "frames": ["screens/*.png", {"path": "a.png", "labels": "a.labels.json"}],
 *   "setups": {"desk": "desktop-27in", "car": "setups/car.json"},   preset names or setup files
 *   "viewers": ["age-25", "age-70", "viewers/driver.json"],          preset names or viewer files
 *   "gazes": ["50%,50%", "label:alarm"],                             gaze specs (gaze-spec.ts)
 *   "outputs": ["report.json", "percept.png"]                        default: every proof output
 * }
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { basename, dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { globSync } from 'tinyglobby';
import { displayPresets, viewerPresets } from '../config/presets.js';
import { ConfigError, type ConfigProblem } from '../errors.js';
import { parseJson, describeJsonProblems } from '../io/parse-json.js';
import { PROOF_OUTPUT_NAMES } from '../proof.js';
import { EYEPROOF_VERSION } from '../version.js';

export const MAX_JOBS = 100_000;

export interface PlanFrame {
  /** Path relative to the plan's folder (as written in reports and indexes). */
  path: string;
  labels?: string;
}

export interface Plan {
  file: string;
  /** Folder of the plan file: every path in the plan is relative to it. */
  base: string;
  root: string;
  frames: PlanFrame[];
  setups: { name: string; ref: string }[];
  viewers: { name: string; ref: string }[];
  gazes: string[];
  outputs: string[];
}

export interface Job {
  id: string;
  frame: PlanFrame;
  setup: { name: string; ref: string };
  viewer: { name: string; ref: string };
  gaze: string;
  outputs: string[];
  /** Output folder relative to the root: <frame>/<setup>/<viewer>/<gaze>. */
  folder: string;
}

const slug = (s: string): string => s.replace(/[^A-Za-z0-9._-]+/g, '_').replace(/^_+|_+$/g, '').slice(0, 80) || '_';

/** A readable folder name for a gaze spec. */
export function gazeSlug(gaze: string): string {
  return slug(gaze.replace(/%/g, 'pct').replace(/°|deg/g, 'deg').replace(/:/g, '-'));
}

/** Reads and checks a plan file; every problem is reported at once with its path. */
export function readPlan(file: string): Plan {
  const text = readFileSync(file, 'utf8');
  const parsed = parseJson(text);
  if (parsed.problems.length) throw new ConfigError(file, describeJsonProblems(parsed.problems).map((m) => ({ path: '(file)', received: undefined, expected: m })));
  const raw = parsed.value as Record<string, unknown>;
  const problems: ConfigProblem[] = [];
  const base = dirname(resolve(file));
  if (!raw || typeof raw !== 'object' || Array.isArray(raw)) throw new ConfigError(file, [{ path: '(top level)', received: raw, expected: 'a JSON object with frames, setups, viewers, gazes, outputs and root' }]);
  const known = ['root', 'frames', 'setups', 'viewers', 'gazes', 'outputs', '$schema', 'description'];
  for (const key of Object.keys(raw)) if (!known.includes(key)) problems.push({ path: key, received: raw[key], expected: 'no such key', hint: `allowed keys: ${known.join(', ')}` });

  const root = typeof raw.root === 'string' && raw.root.length > 0 ? raw.root : (problems.push({ path: 'root', received: raw.root, expected: 'an output folder path' }), '');

  // Frames: paths or globs, or objects with a path and a labels file.
  const frames: PlanFrame[] = [];
  if (!Array.isArray(raw.frames) || raw.frames.length === 0) problems.push({ path: 'frames', received: raw.frames, expected: 'a list of frame paths or globs, or {"path", "labels"} objects' });
  else {
    raw.frames.forEach((f, i) => {
      const entry = typeof f === 'string' ? { path: f } : f && typeof f === 'object' && typeof (f as PlanFrame).path === 'string' ? (f as PlanFrame) : undefined;
      if (!entry) return problems.push({ path: `frames[${i}]`, received: f, expected: 'a path or glob, or {"path", "labels"}' });
      const matches = /[*?[{]/.test(entry.path) ? globSync(entry.path, { cwd: base, onlyFiles: true }).sort() : [entry.path];
      if (matches.length === 0) return problems.push({ path: `frames[${i}]`, received: entry.path, expected: 'a glob that matches at least one file' });
      for (const m of matches) {
        const abs = resolve(base, m);
        if (!existsSync(abs) || !statSync(abs).isFile()) {
          problems.push({ path: `frames[${i}]`, received: m, expected: 'an existing frame file' });
          continue;
        }
        const besideLabels = m.replace(/\.(png|jpe?g|webp)$/i, '') + '.labels.json';
        const labels = entry.labels ?? (existsSync(resolve(base, besideLabels)) ? besideLabels : undefined);
        if (entry.labels && !existsSync(resolve(base, entry.labels))) problems.push({ path: `frames[${i}].labels`, received: entry.labels, expected: 'an existing labels file' });
        frames.push({ path: relative(base, abs), ...(labels ? { labels: relative(base, resolve(base, labels)) } : {}) });
      }
    });
  }

  const refs = (key: 'setups' | 'viewers', presets: readonly { name: string }[]): { name: string; ref: string }[] => {
    const value = raw[key];
    const list: [string, unknown][] = Array.isArray(value) ? value.map((v) => [typeof v === 'string' ? slug(basename(v).replace(/\.json$/i, '')) : '', v]) : value && typeof value === 'object' ? Object.entries(value) : [];
    if (list.length === 0) {
      problems.push({ path: key, received: value, expected: `a list (or named object) of ${key === 'setups' ? 'display presets or setup files' : 'viewer presets or viewer files'}` });
      return [];
    }
    const out: { name: string; ref: string }[] = [];
    list.forEach(([name, ref], i) => {
      const at = Array.isArray(value) ? `${key}[${i}]` : `${key}.${name}`;
      if (typeof ref !== 'string') return problems.push({ path: at, received: ref, expected: 'a preset name or a JSON file path' });
      const isPreset = presets.some((p) => p.name === ref);
      if (!isPreset && !existsSync(resolve(base, ref))) {
        return problems.push({ path: at, received: ref, expected: `one of the presets ${presets.map((p) => p.name).join(', ')} or an existing JSON file` });
      }
      const n = slug(name || ref);
      if (out.some((o) => o.name === n)) return problems.push({ path: at, received: ref, expected: `a name not used twice (${n})` });
      out.push({ name: n, ref });
    });
    return out;
  };
  const setups = refs('setups', displayPresets);
  const viewers = refs('viewers', viewerPresets);

  const gazes = raw.gazes === undefined ? ['50%,50%'] : Array.isArray(raw.gazes) && raw.gazes.every((g) => typeof g === 'string' && g.trim().length > 0) && raw.gazes.length > 0 ? (raw.gazes as string[]) : (problems.push({ path: 'gazes', received: raw.gazes, expected: 'a list of gaze specs (e.g. "50%,50%", "label:alarm", "1280,720")' }), []);
  if (new Set(gazes.map(gazeSlug)).size !== gazes.length) problems.push({ path: 'gazes', received: gazes, expected: 'gazes that differ (each names a folder)' });
  const outputs = raw.outputs === undefined ? [...PROOF_OUTPUT_NAMES] : Array.isArray(raw.outputs) && raw.outputs.length > 0 && raw.outputs.every((o) => (PROOF_OUTPUT_NAMES as readonly unknown[]).includes(o)) ? (raw.outputs as string[]) : (problems.push({ path: 'outputs', received: raw.outputs, expected: `a list of ${PROOF_OUTPUT_NAMES.join(', ')}` }), []);
  const count = frames.length * setups.length * viewers.length * gazes.length;
  if (count > MAX_JOBS) problems.push({ path: '(plan)', received: count, expected: `at most ${MAX_JOBS} jobs` });
  if (problems.length) throw new ConfigError(file, problems);
  if (isAbsolute(root) ? false : resolve(base, root) === base) throw new ConfigError(file, [{ path: 'root', received: root, expected: 'a folder other than the plan\'s own' }]);
  return { file, base, root: resolve(base, root), frames, setups, viewers, gazes, outputs };
}

const digest = (data: string | Uint8Array): string => createHash('sha256').update(data).digest('hex');

/** Every job of a plan, in a fixed order (frames, setups, viewers, gazes), with content-derived ids. */
export function expandPlan(plan: Plan): Job[] {
  const fileHash = new Map<string, string>();
  const hashOf = (rel: string): string => {
    let h = fileHash.get(rel);
    if (!h) fileHash.set(rel, (h = digest(readFileSync(resolve(plan.base, rel)))));
    return h;
  };
  const refHash = (ref: string): string => (existsSync(resolve(plan.base, ref)) && statSync(resolve(plan.base, ref)).isFile() ? hashOf(ref) : `preset:${ref}`);
  const jobs: Job[] = [];
  const frameNames = new Map<string, string>();
  for (const frame of plan.frames) {
    let name = slug(frame.path.replace(/\.(png|jpe?g|webp)$/i, ''));
    // `results` is the index's folder at the root.
    while (name === 'results' || [...frameNames.values()].includes(name)) name = `${name}_`;
    frameNames.set(frame.path, name);
    for (const setup of plan.setups) {
      for (const viewer of plan.viewers) {
        for (const gaze of plan.gazes) {
          const id = digest(JSON.stringify({
            version: EYEPROOF_VERSION, frame: hashOf(frame.path), labels: frame.labels ? hashOf(frame.labels) : null,
            setup: refHash(setup.ref), viewer: refHash(viewer.ref), gaze, outputs: plan.outputs,
          })).slice(0, 20);
          jobs.push({ id, frame, setup, viewer, gaze, outputs: plan.outputs, folder: join(name, setup.name, viewer.name, gazeSlug(gaze)) });
        }
      }
    }
  }
  return jobs;
}

/** A short id of the plan (its path and jobs), for queue names and Redis keys. */
export function planKey(plan: Plan): string {
  return digest(resolve(plan.file)).slice(0, 12);
}
