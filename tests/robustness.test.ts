/**
 * Robustness: inputs are never written (through symlinks and hard links too), the output set is
 * replaced all at once or not at all even when the run is killed, oversized frames are refused
 * before they are decoded, and hostile setups, labels and frames never crash or hang the command.
 * The property tests are seeded (fast-check) so a failure can be replayed.
 */
import { execFile, spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, linkSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import fc from 'fast-check';
import sharp from 'sharp';
import { beforeAll, describe, expect, test } from 'vitest';
import { runCli } from '../cli/program.js';
import { ConfigError, InputError } from '../src/errors.js';
import { validateSetup } from '../src/config/validate.js';
import { decodeFrame } from '../src/io/decode-frame.js';
import { parseJson } from '../src/io/parse-json.js';
import { holdsCompleteSet, recoverOutputFolder } from '../src/io/write-outputs.js';
import { computeNumbers, runProof } from '../src/pipeline.js';
import { PROOF_OUTPUT_NAMES } from '../src/proof.js';
import { numbersReport } from '../src/report/build-report.js';
import { acuityModels } from '../src/retina/acuity-model.js';
import { uniformFrame } from './helpers/synthetic.js';

const root = join(import.meta.dirname, '..');
const SEED = 20261202;
let dir: string;
let frame: string;

/** Runs the command in-process, collecting what it prints. */
async function cli(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await runCli(args, { out: (t) => { out += t; }, err: (t) => { err += t; } });
  return { code, out, err };
}

const hash = (file: string): string => createHash('sha256').update(readFileSync(file)).digest('hex');

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'eyeproof-robust-'));
  frame = join(dir, 'frame.png');
  await sharp({ create: { width: 160, height: 90, channels: 3, background: { r: 30, g: 40, b: 60 } } })
    .composite([{ input: Buffer.from('<svg width="60" height="20"><rect width="60" height="20" fill="#fff"/></svg>'), left: 50, top: 35 }])
    .png().toFile(frame);
});

describe('inputs are never written', () => {
  test.each(['frame', 'setup', 'viewer', 'labels', 'depth map'])('a %s given through a symlink to an output of an earlier set is refused (exit 5) and left as it was', async (what) => {
    const out = join(dir, `sym-${what.replace(' ', '-')}`);
    expect((await cli(['proof', frame, '-q', '--out', out])).code).toBe(0);
    const target = join(out, what === 'frame' ? 'percept.png' : 'report.json');
    const link = join(dir, `link-to-${what.replace(' ', '-')}${what === 'frame' || what === 'depth map' ? '.png' : '.json'}`);
    symlinkSync(target, link);
    const before = hash(target);
    const args = what === 'frame' ? ['proof', link] : ['proof', frame, { setup: '--setup', viewer: '--viewer', labels: '--labels', 'depth map': '--depth' }[what]!, link];
    const r = await cli([...args, '-q', '--out', out]);
    // Whatever else is wrong with the input (a report is not a setup), it is never overwritten.
    expect(r.code).not.toBe(0);
    expect(hash(target)).toBe(before);
  });

  test('an output folder that is a symlink to the frame’s folder, and a frame hard-linked into the output folder, are refused (exit 5)', async () => {
    const folder = join(dir, 'frames');
    mkdirSync(folder);
    copyFileSync(frame, join(folder, 'f.png'));
    symlinkSync(folder, join(dir, 'out-link'));
    const r = await cli(['proof', join(folder, 'f.png'), '-q', '--out', join(dir, 'out-link')]);
    expect(r.code).toBe(5);
    const out = join(dir, 'hard');
    expect((await cli(['proof', frame, '-q', '--out', out])).code).toBe(0);
    const hard = join(dir, 'hard-frame.png');
    linkSync(join(out, 'percept.png'), hard);
    const before = hash(hard);
    expect((await cli(['proof', hard, '-q', '--out', out])).code).toBe(5);
    expect(hash(hard)).toBe(before);
  });

  test('an output under /proc is refused at once (exit 5) instead of hanging; a pipe given as the frame is refused, not waited on (exit 4)', async () => {
    expect((await cli(['proof', frame, '-q', '--out', '/proc/eyeproof-out'])).code).toBe(5);
    const fifo = join(dir, 'pipe.png');
    await new Promise<void>((resolve, reject) => execFile('mkfifo', [fifo], (e) => (e ? reject(e) : resolve())));
    const r = await cli(['proof', fifo, '-q', '--out', join(dir, 'fifo-out')]);
    expect(r.code).toBe(4);
    expect(r.err).toMatch(/not a regular file/);
    expect(existsSync(join(dir, 'fifo-out'))).toBe(false);
  });
});

describe('the output set changes all at once', () => {
  test('a proof killed at random moments (SIGKILL and SIGTERM) leaves the complete old set or the complete new set, and no leftovers once the next run has tidied', async () => {
    const out = join(dir, 'killed');
    expect((await cli(['proof', frame, '-q', '--gaze', '20,20', '--out', out])).code).toBe(0);
    const rng = fc.sample(fc.tuple(fc.integer({ min: 0, max: 2500 }), fc.boolean()), { seed: SEED, numRuns: 8 });
    for (const [delayMs, hard] of rng) {
      const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'cli/eyeproof.ts'), 'proof', frame, '-q', '--gaze', `${40 + delayMs % 80},50`, '--out', out], { cwd: root, stdio: 'ignore' });
      await new Promise((r) => setTimeout(r, delayMs));
      child.kill(hard ? 'SIGKILL' : 'SIGTERM');
      await new Promise((r) => child.on('exit', r));
      if (hard) recoverOutputFolder(out);
      expect(holdsCompleteSet(out, PROOF_OUTPUT_NAMES), `after ${hard ? 'SIGKILL' : 'SIGTERM'} at ${delayMs} ms`).toBe(true);
      const leftovers = readdirSync(dirname(out)).filter((n) => n.startsWith('.killed.eyeproof-'));
      expect(leftovers, `after ${hard ? 'SIGKILL' : 'SIGTERM'} at ${delayMs} ms`).toEqual([]);
    }
  }, 120_000);

  test('when the swap cannot happen (a non-empty folder named report.json where the set must go), the earlier set stays and the message says so', async () => {
    const out = join(dir, 'blocked');
    expect((await cli(['proof', frame, '-q', '--out', out])).code).toBe(0);
    const before = hash(join(out, 'percept.png'));
    // The parent made read-only after the run: the staging folder cannot be created beside the set.
    const { chmodSync } = await import('node:fs');
    const parent = join(dir, 'ro-parent');
    mkdirSync(parent);
    const inner = join(parent, 'set');
    expect((await cli(['proof', frame, '-q', '--out', inner])).code).toBe(0);
    chmodSync(parent, 0o555);
    try {
      const r = await cli(['proof', frame, '-q', '--gaze', '10,10', '--out', inner]);
      if (process.getuid?.() !== 0) {
        expect(r.code).toBe(5);
        expect(holdsCompleteSet(inner, PROOF_OUTPUT_NAMES)).toBe(true);
      }
    } finally {
      chmodSync(parent, 0o755);
    }
    expect(hash(join(out, 'percept.png'))).toBe(before);
  });
});

describe('bounded memory', () => {
  test('a frame above the pixel limit is refused from its header, before decoding (exit 4), in little memory; --max-pixels lets a smaller limit refuse a normal frame', async () => {
    const big = join(dir, 'big.png');
    // 12800 × 7200 black: 92 million pixels, a small file.
    await sharp({ create: { width: 12800, height: 7200, channels: 3, background: { r: 0, g: 0, b: 0 } } }).png({ compressionLevel: 9 }).toFile(big);
    const measured = await new Promise<{ code: number; maxRssMb: number; err: string }>((resolve) => {
      const script = `import('${join(root, 'cli/program.ts')}').then(async (m) => { let err = ''; const code = await m.runCli(['proof', '${big}', '-q', '--out', '${join(dir, 'big-out')}'], { out: () => {}, err: (t) => { err += t; } }); process.stdout.write(JSON.stringify({ code, maxRssMb: process.resourceUsage().maxRSS / 1024, err })); })`;
      execFile(process.execPath, ['--import', 'tsx', '-e', script], { cwd: root }, (_e, stdout) => resolve(JSON.parse(stdout)));
    });
    expect(measured.code).toBe(4);
    expect(measured.err).toMatch(/above the limit/);
    expect(measured.err).toMatch(/--max-pixels/);
    expect(measured.maxRssMb).toBeLessThan(400);
    const r = await cli(['proof', frame, '-q', '--max-pixels', '1000', '--out', join(dir, 'limited')]);
    expect(r.code).toBe(4);
    expect(existsSync(join(dir, 'limited'))).toBe(false);
  }, 60_000);
});

describe('hostile setups and files never crash (property tests, seeded)', () => {
  const validSetup = fc.record({
    display: fc.oneof(
      fc.record({ preset: fc.constantFrom('desktop-27in', 'laptop-14in'), viewingDistanceMm: fc.integer({ min: 150, max: 5000 }) }),
      fc.record({ kind: fc.constant('screen'), widthMm: fc.integer({ min: 50, max: 3000 }), resolutionPx: fc.constant([160, 90]), heightMm: fc.constant(0), viewingDistanceMm: fc.integer({ min: 150, max: 10000 }), peakLuminanceCdM2: fc.integer({ min: 1, max: 2000 }), blackLuminanceCdM2: fc.constant(0.1) })
        .map((d) => ({ ...d, heightMm: (d.widthMm * 9) / 16 })),
      fc.record({ preset: fc.constantFrom('headset-wide', 'headset-narrow') }),
    ),
    viewer: fc.record({
      ageYears: fc.integer({ min: 5, max: 95 }),
      refraction: fc.record({ sphereD: fc.double({ min: -8, max: 8, noNaN: true }), cylinderD: fc.double({ min: -3, max: 3, noNaN: true }), axisDeg: fc.integer({ min: 0, max: 180 }) }),
      pupilDiameterMm: fc.oneof(fc.constant('auto'), fc.double({ min: 1.5, max: 8, noNaN: true })),
      eyes: fc.constantFrom('both', 'right', 'left'),
      glasses: fc.constantFrom('none', 'display'),
    }),
    light: fc.record({ adaptingLuminanceCdM2: fc.oneof(fc.constant('auto'), fc.double({ min: 0.001, max: 5000, noNaN: true })) }),
    percept: fc.record({ mode: fc.constantFrom('same-display', 'retinal-image') }),
    models: fc.record({ acuity: fc.constantFrom(...(Object.keys(acuityModels) as string[])), lensColour: fc.constantFrom('received', 'adapted') }),
  });

  const finiteEverywhere = (value: unknown, path = ''): string | undefined => {
    if (typeof value === 'number') return Number.isFinite(value) ? undefined : path;
    if (Array.isArray(value)) return value.map((v, i) => finiteEverywhere(v, `${path}[${i}]`)).find(Boolean);
    if (value && typeof value === 'object') return Object.entries(value).map(([k, v]) => finiteEverywhere(v, `${path}.${k}`)).find(Boolean);
    return undefined;
  };

  test('random valid setups give a report without NaN or infinity anywhere', () => {
    fc.assert(fc.property(validSetup, (json) => {
      const setup = validateSetup(json, 'property');
      const numbers = computeNumbers(setup);
      const bad = finiteEverywhere(numbersReport(setup, numbers, acuityModels[setup.models.acuity]));
      // A blind spot far outside a narrow field and a smallest letter in it may be infinite by design.
      expect(bad === undefined || /blindSpot/.test(bad), `non-finite at ${bad}`).toBe(true);
    }), { seed: SEED, numRuns: 20 });
  }, 120_000);

  test('random valid setups leave a uniform grey frame in daylight uniform (surround at the frame’s luminance) and keep its mean luminance within 3 % (energy conservation of every filter and of the veil)', () => {
    fc.assert(fc.property(validSetup, fc.double({ min: 0.05, max: 0.9, noNaN: true }), (json, grey) => {
      const setup = validateSetup({ ...json, display: { preset: 'desktop-27in' }, light: { adaptingLuminanceCdM2: 100 } }, 'property');
      const luminance = grey * (setup.display.peakLuminanceCdM2 - setup.display.blackLuminanceCdM2) + setup.display.blackLuminanceCdM2;
      setup.light.surroundLuminanceCdM2 = luminance;
      const { percept } = runProof(uniformFrame(64, 36, [grey, grey, grey]), setup, 'property');
      for (const plane of percept.planes) {
        let lo = Infinity;
        let hi = -Infinity;
        for (const v of plane) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
        // Uniform to 0.5 % of the level (the lens may tint it, evenly).
        expect(hi - lo).toBeLessThan(0.005 * Math.max(grey, 0.1));
      }
      const y = 0.2126 * percept.planes[0][100] + 0.7152 * percept.planes[1][100] + 0.0722 * percept.planes[2][100];
      expect(Math.abs(y - grey) / grey).toBeLessThan(0.03);
    }), { seed: SEED, numRuns: 12 });
  }, 180_000);

  test('in daylight the retina’s cutoff never rises with distance from the gaze along the frame’s middle row (Watson 2014; Geisler & Perry 1998; in dim light rods see better off the fovea, so that is left out)', () => {
    fc.assert(fc.property(validSetup, fc.integer({ min: 10, max: 150 }), (json, gazeX) => {
      const setup = validateSetup({ ...json, display: { preset: 'desktop-27in' }, light: { adaptingLuminanceCdM2: 100 }, gaze: { xPx: gazeX, yPx: 45 } }, 'property');
      const { cutoffCpd } = runProof(uniformFrame(160, 90, [0.3, 0.3, 0.3]), setup, 'property');
      const row = 45 * 160;
      for (let x = gazeX + 1; x < 159; x++) expect(cutoffCpd[row + x + 1]).toBeLessThanOrEqual(cutoffCpd[row + x] * 1.001);
      for (let x = gazeX - 1; x > 0; x--) expect(cutoffCpd[row + x - 1]).toBeLessThanOrEqual(cutoffCpd[row + x] * 1.001);
    }), { seed: SEED, numRuns: 10 });
  }, 120_000);

  test('mutated setup JSON (values, types, keys, depth, text) is either accepted or refused with a ConfigError naming fields, never anything else', () => {
    const value = fc.letrec((tie) => ({
      any: fc.oneof({ depthSize: 'small' }, fc.double(), fc.string({ maxLength: 30 }), fc.constant(null), fc.boolean(), fc.array(tie('any'), { maxLength: 4 }), fc.dictionary(fc.constantFrom('preset', 'kind', 'ageYears', '__proto__', 'constructor', 'hasOwnProperty', 'resolutionPx', 'x'), tie('any'), { maxKeys: 4 })),
    })).any;
    const mutated = fc.record({
      section: fc.constantFrom('display', 'viewer', 'light', 'gaze', 'frame', 'percept', 'models', '__proto__', 'constructor'),
      key: fc.constantFrom('preset', 'kind', 'ageYears', 'resolutionPx', 'viewingDistanceMm', 'mode', 'acuity', 'xPx', 'referenceViewer', '__proto__', 'constructor', 'hasOwnProperty', 'refraction'),
      value,
    });
    fc.assert(fc.property(mutated, ({ section, key, value: v }) => {
      const text = `{"${section}": {"${key}": ${JSON.stringify(v) ?? 'null'}}}`;
      const parsed = parseJson(text);
      if (parsed.problems.length) return;
      try {
        const setup = validateSetup(parsed.value, 'fuzz');
        computeNumbers(setup);
      } catch (err) {
        expect(err).toBeInstanceOf(ConfigError);
        expect((err as ConfigError).problems.length).toBeGreaterThan(0);
        expect((err as Error).message.length).toBeLessThan(20_000);
      }
    }), { seed: SEED, numRuns: 400 });
  });

  test('damaged frames (bytes flipped, cut short, header changed) decode or are refused with an InputError in plain words, never anything else', async () => {
    const original = readFileSync(frame);
    await fc.assert(fc.asyncProperty(fc.oneof(
      fc.record({ kind: fc.constant('flip'), at: fc.integer({ min: 0, max: original.length - 1 }), byte: fc.integer({ min: 0, max: 255 }) }),
      fc.record({ kind: fc.constant('cut'), at: fc.integer({ min: 0, max: original.length - 1 }), byte: fc.constant(0) }),
    ), async ({ kind, at, byte }) => {
      const bytes = Buffer.from(original);
      const damaged = kind === 'cut' ? bytes.subarray(0, at) : (bytes[at] = byte, bytes);
      try {
        await decodeFrame(damaged, 'damaged.png', [0, 0, 0]);
      } catch (err) {
        expect(err).toBeInstanceOf(InputError);
        expect((err as Error).message).not.toMatch(/:\s*$/);
      }
    }), { seed: SEED, numRuns: 150 });
  });

  test('labels files with hostile structure are refused with the file and field named (exit 4), never a crash', async () => {
    const texts = [
      '{"labels": [{"__proto__": {"text": "x"}, "id": "a"}]}',
      `{"labels": ${'['.repeat(40)}${']'.repeat(40)}}`,
      '{"labels": [{"id": "a", "text": "x", "boxPx": [0, 0, 10, 10], "letterHeightPx": 1e999}]}',
      '{"labels": [{"id": "a", "id": "b"}]}',
      '\ufeff{"labels": []}',
    ];
    for (const [i, text] of texts.entries()) {
      const file = join(dir, `hostile-${i}.labels.json`);
      writeFileSync(file, text);
      const r = await cli(['proof', frame, '-q', '--labels', file, '--out', join(dir, `labels-out-${i}`)]);
      expect([0, 4]).toContain(r.code);
      if (r.code === 4) expect(r.err).toContain(file);
    }
  });
});
