/**
 * The long robustness campaign (at least 10,000 hostile and broken cases), seeded so it can be
 * repeated: setups mutated field by field, setup files of odd structure and text, hostile keys,
 * damaged and oversized frames, labels and depth maps, output faults, concurrent runs and random
 * kills. Most cases run the command in-process (runCli); kills, concurrency and memory run it as a
 * child process. For each class it counts cases, accepted runs, clean refusals (exit 2–5 with a
 * message), crashes (exit 1 or an exception), hangs (over the time limit), inputs changed, output
 * sets left mixed or partial, and the largest memory seen. Writes docs/robustness-campaign.md.
 * Run with `npx tsx scripts/robustness-campaign.ts` (about a quarter of an hour); CAMPAIGN_SCALE=0.1
 * runs a tenth.
 */
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { chmodSync, copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import fc from 'fast-check';
import sharp from 'sharp';
import { runCli } from '../cli/program.js';
import { sectionDecls, screenDecl, headsetDecl } from '../src/config/params.js';
import { holdsCompleteSet, recoverOutputFolder } from '../src/io/write-outputs.js';
import { PROOF_OUTPUT_NAMES } from '../src/proof.js';

const SEED = 20261202;
const SCALE = Number(process.env.CAMPAIGN_SCALE ?? 1);
const HANG_MS = 60_000;
const root = join(import.meta.dirname, '..');
const work = mkdtempSync(join(tmpdir(), 'eyeproof-campaign-'));
const rng = fc.sample(fc.integer({ min: 0, max: 2 ** 31 - 1 }), { seed: SEED, numRuns: 200_000 });
let draw = 0;
const random = (): number => rng[draw++ % rng.length] / 2 ** 31;
const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)];
const count = (n: number): number => Math.max(1, Math.round(n * SCALE));

interface Tally { cases: number; accepted: number; refused: number; crashed: number; hung: number; inputsChanged: number; mixedSets: number; peakMb: number; notes: Set<string> }
const tallies = new Map<string, Tally>();
const tally = (cls: string): Tally => {
  let t = tallies.get(cls);
  if (!t) tallies.set(cls, (t = { cases: 0, accepted: 0, refused: 0, crashed: 0, hung: 0, inputsChanged: 0, mixedSets: 0, peakMb: 0, notes: new Set() }));
  return t;
};
const hash = (file: string): string => (existsSync(file) ? createHash('sha256').update(readFileSync(file)).digest('hex') : 'missing');

/** Runs the command in-process with a time limit and records the outcome under a class. */
async function run(cls: string, args: string[], inputs: string[] = [], outDir?: string): Promise<number> {
  const t = tally(cls);
  t.cases++;
  const before = inputs.map(hash);
  let err = '';
  const timer = new Promise<'hang'>((resolve) => setTimeout(() => resolve('hang'), HANG_MS).unref());
  let code: number | 'hang';
  try {
    code = await Promise.race([runCli(args, { out: () => {}, err: (s) => { err += s; } }), timer]);
  } catch (e) {
    code = 1;
    err = String(e);
  }
  if (code === 'hang') t.hung++;
  else if (code === 0) t.accepted++;
  else if (code >= 2 && code <= 5 && err.trim().length > 0 && err.length < 100_000) t.refused++;
  else {
    t.crashed++;
    t.notes.add(err.split('\n').slice(0, 2).join(' ').slice(0, 160));
  }
  if (inputs.some((f, i) => hash(f) !== before[i])) t.inputsChanged++;
  if (outDir && existsSync(outDir) && !holdsCompleteSet(outDir, PROOF_OUTPUT_NAMES)) t.mixedSets++;
  t.peakMb = Math.max(t.peakMb, process.resourceUsage().maxRSS / 1024);
  return code === 'hang' ? -1 : code;
}

const frame = join(work, 'frame.png');
await sharp({ create: { width: 64, height: 36, channels: 3, background: { r: 30, g: 40, b: 60 } } })
  .composite([{ input: Buffer.from('<svg width="30" height="10"><rect width="30" height="10" fill="#fff"/></svg>'), left: 17, top: 13 }])
  .png().toFile(frame);
const frameBytes = readFileSync(frame);

// --- 1. Setups mutated field by field ---------------------------------------------------------
const hostileValues: unknown[] = [null, true, 'x', '', [], {}, [1, 2], -1e308, -1, -0, 0, 1e-300, 0.5, 1, 7, 100, 1e5, 1e308, 'auto', '1e999', { preset: null }, [[1]], 'a'.repeat(10_000)];
const fields: [string, string][] = [];
for (const [section, decl] of Object.entries(sectionDecls)) for (const key of Object.keys(decl.fields)) fields.push([section, key]);
for (const key of new Set([...Object.keys(screenDecl.fields), ...Object.keys(headsetDecl.fields), 'kind', 'preset'])) fields.push(['display', key]);
const setupFile = join(work, 'setup.json');
for (let i = 0; i < count(6000); i++) {
  const [section, key] = pick(fields);
  const value = pick(hostileValues);
  const display = random() < 0.3 ? { kind: 'headset', resolutionPx: [64, 36], fieldOfViewDeg: [90, 50], focalDistanceM: 1.5, peakLuminanceCdM2: 100 } : { preset: 'desktop-27in' };
  const json: Record<string, Record<string, unknown>> = { display: { ...display } };
  json[section] = { ...(json[section] ?? {}), [key]: value };
  writeFileSync(setupFile, JSON.stringify(json));
  await run('setup fields mutated', ['numbers', '--setup', setupFile, '--json'], [setupFile]);
}

// --- 2. Setup files of odd structure and text ---------------------------------------------------
const base = JSON.stringify({ display: { preset: 'desktop-27in', viewingDistanceMm: 800 }, viewer: { ageYears: 50, refraction: { sphereD: -1 } }, gaze: { xPx: 10, yPx: 10 } }, null, 2);
const textMutations: ((s: string) => string)[] = [
  (s) => s.slice(0, Math.floor(random() * s.length)),
  (s) => { const i = Math.floor(random() * s.length); return s.slice(0, i) + pick(['{', '}', '[', ']', ',', ':', '"', '\\', '\u0000', '/*', '//', '1e999', 'NaN', '\ufeff']) + s.slice(i); },
  (s) => { const i = Math.floor(random() * s.length); return s.slice(0, i) + s.slice(i + 1 + Math.floor(random() * 5)); },
  (s) => `\ufeff${s}`,
  (s) => s.replace('"viewer"', '"viewer": {}, "viewer"'),
  (s) => `${'['.repeat(1 + Math.floor(random() * 6000))}${s}`,
  (s) => s.replace('800', '1e999'),
  (s) => s.replace('"display"', '"__proto__": {"polluted": true}, "display"'),
  (s) => s.replace('"viewer"', '"constructor": {"prototype": {}}, "viewer"'),
  () => `"${'x'.repeat(1 + Math.floor(random() * 2_000_000))}"`,
  () => '',
  () => 'null',
  () => '[]',
];
for (let i = 0; i < count(2000); i++) {
  writeFileSync(setupFile, pick(textMutations)(base));
  await run('setup files of odd structure', ['numbers', '--setup', setupFile], [setupFile]);
}

// --- 3. Damaged, odd and oversized frames ---------------------------------------------------------
const others = await Promise.all(['gif', 'tiff', 'avif'].map(async (format) => {
  try {
    return await sharp(frameBytes).toFormat(format as 'gif').toBuffer();
  } catch {
    return Buffer.from(format);
  }
}));
const frameMutations: (() => Buffer)[] = [
  () => { const b = Buffer.from(frameBytes); b[Math.floor(random() * b.length)] = Math.floor(random() * 256); return b; },
  () => frameBytes.subarray(0, Math.floor(random() * frameBytes.length)),
  () => Buffer.from(Array.from({ length: Math.floor(random() * 4096) }, () => Math.floor(random() * 256))),
  () => { const b = Buffer.from(frameBytes); b.writeUInt32BE(1 + Math.floor(random() * 2 ** 31), 16); return b; },
  () => { const b = Buffer.from(frameBytes); b.writeUInt32BE(0, 20); return b; },
  () => Buffer.alloc(0),
  () => pick(others),
];
const damaged = join(work, 'damaged.png');
for (let i = 0; i < count(1500); i++) {
  writeFileSync(damaged, pick(frameMutations)());
  const out = join(work, 'out-frames');
  await run('frames damaged, odd or oversized', ['proof', damaged, '-q', '--out', out], [damaged], out);
}
for (const [w, h] of [[12800, 7200], [16384, 9216], [8000, 4500], [16384, 16384]]) {
  const big = join(work, `big-${w}.png`);
  await sharp({ create: { width: w, height: h, channels: 3, background: { r: 0, g: 0, b: 0 } }, limitInputPixels: false }).png({ compressionLevel: 9 }).toFile(big);
  const out = join(work, 'out-big');
  await run('frames above the pixel limit', ['proof', big, '-q', '--out', out], [big], out);
  rmSync(big);
}

// --- 4. Labels and depth maps -------------------------------------------------------------------
const labelsFile = join(work, 'frame.labels.json');
const goodLabels = JSON.stringify({ labels: [{ id: 'a', text: 'HELLO', boxPx: [10, 10, 30, 8], letterHeightPx: 6 }] });
for (let i = 0; i < count(500); i++) {
  writeFileSync(labelsFile, random() < 0.5 ? pick(textMutations)(goodLabels) : JSON.stringify({ labels: [{ id: pick(['a', '__proto__', '']), text: pick(hostileValues), boxPx: pick([[0, 0, 1, 1], [-5, 0, 10, 10], [0, 0, 1e308, 1], 'x', null]), letterHeightPx: pick(hostileValues), letterSpacingPx: pick(hostileValues) }] }));
  const out = join(work, 'out-labels');
  await run('labels files mutated', ['proof', frame, '-q', '--labels', labelsFile, '--out', out], [frame, labelsFile], out);
}
rmSync(labelsFile, { force: true });
const depth = join(work, 'depth.png');
const goodDepth = await sharp({ create: { width: 64, height: 36, channels: 3, background: { r: 10, g: 10, b: 10 } } }).toColourspace('grey16').png().toBuffer();
for (let i = 0; i < count(200); i++) {
  const b = Buffer.from(random() < 0.3 ? frameBytes : goodDepth);
  if (random() < 0.7) b[Math.floor(random() * b.length)] = Math.floor(random() * 256);
  writeFileSync(depth, random() < 0.2 ? b.subarray(0, Math.floor(random() * b.length)) : b);
  const out = join(work, 'out-depth');
  await run('depth maps mutated', ['proof', frame, '-q', '--depth', depth, '--out', out], [frame, depth], out);
}

// --- 5. Output faults ---------------------------------------------------------------------------
for (let i = 0; i < count(200); i++) {
  const caseDir = join(work, `outfault-${i}`);
  mkdirSync(caseDir);
  const f = join(caseDir, 'f.png');
  copyFileSync(frame, f);
  const kind = pick(['file', 'proc', 'foreign', 'symlink-to-inputs', 'input-symlink-to-output', 'readonly-parent', 'existing-set', 'nested-new']);
  let out = join(caseDir, 'out');
  const inputs = [f];
  if (kind === 'file') writeFileSync(out, 'x');
  if (kind === 'proc') out = '/proc/self/eyeproof-out';
  if (kind === 'foreign') { mkdirSync(out); writeFileSync(join(out, 'notes.txt'), 'mine'); inputs.push(join(out, 'notes.txt')); }
  if (kind === 'symlink-to-inputs') symlinkSync(caseDir, out);
  if (kind === 'existing-set' || kind === 'input-symlink-to-output') await runCli(['proof', f, '-q', '--out', out], { out: () => {}, err: () => {} });
  if (kind === 'input-symlink-to-output') { const link = join(caseDir, 'link.png'); symlinkSync(join(out, 'percept.png'), link); inputs.push(link); }
  if (kind === 'readonly-parent') { mkdirSync(join(caseDir, 'ro')); chmodSync(join(caseDir, 'ro'), 0o555); out = join(caseDir, 'ro', 'out'); }
  if (kind === 'nested-new') out = join(caseDir, 'a', 'b', 'c');
  // Folders that were never eyeproof's (a file, /proc, a folder of the user's) are checked for being untouched instead.
  const ours = !['file', 'proc', 'symlink-to-inputs', 'foreign'].includes(kind);
  await run(`output faults (${kind})`, ['proof', inputs[inputs.length - 1].endsWith('.png') ? inputs[inputs.length - 1] : f, '-q', '--out', out], inputs, ours ? out : undefined);
  if (kind === 'readonly-parent') chmodSync(join(caseDir, 'ro'), 0o755);
}

// --- 6. Kills and concurrent runs (child processes) ----------------------------------------------
const cli = [process.execPath, ['--import', 'tsx', join(root, 'cli/eyeproof.ts')]] as const;
const killOut = join(work, 'killed');
await runCli(['proof', frame, '-q', '--out', killOut], { out: () => {}, err: () => {} });
for (let i = 0; i < count(100); i++) {
  const t = tally('runs killed at random moments (SIGKILL, SIGTERM)');
  t.cases++;
  const before = hash(frame);
  const child = spawn(cli[0], [...cli[1], 'proof', frame, '-q', '--gaze', `${i % 60},20`, '--out', killOut], { cwd: root, stdio: 'ignore' });
  await new Promise((r) => setTimeout(r, Math.floor(random() * 3000)));
  const signal = random() < 0.5 ? 'SIGKILL' : 'SIGTERM';
  child.kill(signal);
  const code = await new Promise<number | null>((r) => child.on('exit', (c) => r(c)));
  if (signal === 'SIGKILL') recoverOutputFolder(killOut);
  if (!holdsCompleteSet(killOut, PROOF_OUTPUT_NAMES) || readdirSync(dirname(killOut)).some((n) => n.startsWith('.killed.eyeproof-'))) t.mixedSets++;
  if (hash(frame) !== before) t.inputsChanged++;
  if (code === 0) t.accepted++;
  else t.refused++;
}
for (let i = 0; i < count(20); i++) {
  const t = tally('two runs writing one output folder at once');
  t.cases++;
  const out = join(work, `concurrent-${i}`);
  const children = [0, 1].map((k) => spawn(cli[0], [...cli[1], 'proof', frame, '-q', '--gaze', `${10 + 20 * k},20`, '--out', out], { cwd: root, stdio: 'ignore' }));
  const codes = await Promise.all(children.map((c) => new Promise<number | null>((r) => c.on('exit', (code) => r(code)))));
  if (!holdsCompleteSet(out, PROOF_OUTPUT_NAMES)) t.mixedSets++;
  if (codes.some((c) => c !== 0 && c !== 5)) t.crashed++;
  if (codes.every((c) => c === 0)) t.accepted++;
  else t.refused++;
}

// --- Report --------------------------------------------------------------------------------------
const rows = [...tallies].map(([cls, t]) => `| ${cls} | ${t.cases} | ${t.accepted} | ${t.refused} | ${t.crashed} | ${t.hung} | ${t.inputsChanged} | ${t.mixedSets} | ${t.peakMb.toFixed(0)} |`);
const total = [...tallies.values()].reduce((a, t) => a + t.cases, 0);
const notes = [...tallies].flatMap(([cls, t]) => [...t.notes].map((n) => `- ${cls}: ${n}`));
const text = [
  `Robustness campaign (scripts/robustness-campaign.ts, seed ${SEED}), ${new Date().toISOString().slice(0, 10)}: ${total} cases.`,
  '',
  '| class | cases | accepted | refused with a message | crashed | hung | inputs changed | output sets mixed or partial | peak memory of the campaign process, MB |',
  '|---|---:|---:|---:|---:|---:|---:|---:|---:|',
  ...rows,
  '',
  ...(notes.length ? ['Crashes seen:', ...notes] : []),
  [...tallies.values()].every((t) => t.crashed + t.hung + t.inputsChanged + t.mixedSets === 0) ? 'No crash, hang, changed input or mixed output set.' : 'Failures above.',
  '',
].join('\n');
writeFileSync(join(root, 'docs', 'robustness-campaign.md'), text);
process.stdout.write(text);
rmSync(work, { recursive: true, force: true });
