/**
 * Batches: the plan file's validation and expansion, the local pool, resuming after a kill, and the
 * same plan through a real Redis (Debian's redis-server, started on a free loopback port with no
 * persistence) with two worker processes, one killed mid-job.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { runEyeproof } from './helpers/run-cli.js';
import { ConfigError } from '../src/errors.js';
import { expandPlan, readPlan } from '../src/batch/plan.js';
import { enqueuePlan, waitForPlan } from '../src/batch/queue.js';

const root = join(import.meta.dirname, '..');
let dir: string;

const cli = runEyeproof;

function writePlan(name: string, rootFolder: string, extra: Record<string, unknown> = {}): string {
  const file = join(dir, name);
  writeFileSync(file, JSON.stringify({ root: rootFolder, frames: ['frames/*.png'], setups: { desk: 'desktop-27in' }, viewers: ['age-25', 'age-70'], gazes: ['50%,50%', '20%,80%'], outputs: ['report.json', 'percept.png'], ...extra }));
  return file;
}

/** Every file under a folder, relative, with its bytes. */
function tree(folder: string): Map<string, Buffer> {
  const out = new Map<string, Buffer>();
  const walk = (d: string): void => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      if (e.name.startsWith('.')) continue;
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else out.set(relative(folder, p), readFileSync(p));
    }
  };
  walk(folder);
  return out;
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'eyeproof-batch-'));
  mkdirSync(join(dir, 'frames'));
  for (const [name, src] of [['a', 'ferry-console'], ['b', 'ferry-console-night'], ['c', 'picker-headset']]) {
    await sharp(join(root, `sample-scenes/${src}.png`)).resize(192, 108, { fit: 'fill' }).png().toFile(join(dir, 'frames', `${name}.png`));
  }
});

describe('batch plan files', () => {
  test('every problem is named at once, with its path (like a setup file)', () => {
    const file = join(dir, 'bad.json');
    writeFileSync(file, JSON.stringify({ root: 'x', frames: ['nothing/*.png', 7], setups: ['desk-27'], viewers: [], gazes: [''], outputs: ['percept.gif'], colour: 1 }));
    try {
      readPlan(file);
      throw new Error('expected a ConfigError');
    } catch (err) {
      expect(err).toBeInstanceOf(ConfigError);
      const m = (err as Error).message;
      for (const path of ['frames[0]', 'frames[1]', 'setups[0]', 'viewers', 'gazes', 'outputs', 'colour']) expect(m).toContain(path);
    }
  });

  test('expansion is deterministic and ids follow the inputs\' content: a changed frame is redone, nothing else', async () => {
    const plan = readPlan(writePlan('ids.json', 'ids-out'));
    const a = expandPlan(plan);
    expect(a.length).toBe(3 * 1 * 2 * 2);
    expect(expandPlan(plan).map((j) => j.id)).toEqual(a.map((j) => j.id));
    expect(new Set(a.map((j) => j.id)).size).toBe(a.length);
    expect(a[0].folder).toBe(join('frames_a', 'desk', 'age-25', '50pct_50pct'));
    const before = readFileSync(join(dir, 'frames', 'c.png'));
    writeFileSync(join(dir, 'frames', 'c.png'), await sharp(before).modulate({ brightness: 0.9 }).png().toBuffer());
    let b: typeof a;
    try {
      b = expandPlan(readPlan(join(dir, 'ids.json')));
    } finally {
      writeFileSync(join(dir, 'frames', 'c.png'), before);
    }
    const changed = b.filter((j, i) => j.id !== a[i].id).map((j) => j.frame.path);
    expect(new Set(changed)).toEqual(new Set([join('frames', 'c.png')]));
  });
});

describe('batch on this machine (worker threads)', () => {
  test('a 3 frames × 2 viewers × 2 gazes plan runs in the pool, writes the index, and a rerun skips everything', async () => {
    const plan = writePlan('local.json', 'local-out');
    const r = await cli(['batch', plan, '-q']);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/12 jobs done .*jobs per minute.*0 already done, 0 failed/);
    const out = join(dir, 'local-out');
    const jsonl = readFileSync(join(out, 'results', 'results.jsonl'), 'utf8').trim().split('\n');
    expect(jsonl.length).toBe(12);
    const csv = readFileSync(join(out, 'results', 'results.csv'), 'utf8');
    expect(csv.split('\n')[0]).toBe('job,frame,setup,viewer,gaze,label,role,verdict,passes,limitedBy,margin,audienceUncorrected,audienceCorrected,folder');
    expect(readFileSync(join(out, 'results', 'summary.html'), 'utf8')).toMatch(/jobs done/);
    const again = await cli(['batch', plan, '-q']);
    expect(again.stderr).toMatch(/0 jobs done, 12 already done/);
  }, 300_000);

  test('killed mid-run (SIGKILL) and rerun: no job lost, none redone that was done', async () => {
    const plan = writePlan('kill.json', 'kill-out');
    const out = join(dir, 'kill-out');
    const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'cli/eyeproof.ts'), 'batch', plan, '-q', '--threads', '1'], { cwd: root, stdio: 'ignore' });
    const doneJobs = (): string[] => (existsSync(out) ? readdirSync(out, { recursive: true }) as string[] : []).filter((p) => p.endsWith('job.json'));
    const deadline = Date.now() + 120_000;
    while (doneJobs().length < 2 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 200));
    child.kill('SIGKILL');
    await new Promise((r) => child.on('exit', r));
    const before = doneJobs().length;
    expect(before).toBeGreaterThanOrEqual(2);
    expect(before).toBeLessThan(12);
    const rerun = await cli(['batch', plan, '-q']);
    expect(rerun.code).toBe(0);
    const m = /(\d+) jobs done.*?, (\d+) already done, 0 failed/.exec(rerun.stderr)!;
    expect(Number(m[2])).toBe(before);
    expect(Number(m[1]) + Number(m[2])).toBe(12);
    expect(doneJobs().length).toBe(12);
    // No half-written folders left behind.
    expect((readdirSync(out, { recursive: true }) as string[]).filter((p) => p.includes('.eyeproof-'))).toEqual([]);
  }, 300_000);
});

describe('batch through Redis (BullMQ on Debian redis-server)', () => {
  let redis: ChildProcess | undefined;
  let url = process.env.EYEPROOF_TEST_REDIS_URL ?? '';

  beforeAll(async () => {
    if (url) return;
    if (!existsSync('/usr/bin/redis-server')) throw new Error('no Redis: install Debian\'s redis-server (apt-get install redis-server), as .ci/run does, or set EYEPROOF_TEST_REDIS_URL');
    const port = await new Promise<number>((resolve) => {
      const s = createServer().listen(0, '127.0.0.1', () => {
        const p = (s.address() as { port: number }).port;
        s.close(() => resolve(p));
      });
    });
    redis = spawn('/usr/bin/redis-server', ['--port', String(port), '--bind', '127.0.0.1', '--save', '', '--appendonly', 'no'], { stdio: 'ignore' });
    url = `redis://127.0.0.1:${port}`;
    await new Promise((r) => setTimeout(r, 500));
  });

  afterAll(() => {
    redis?.kill('SIGTERM');
  });

  test('two workers, one killed mid-job: every job completes exactly once, with outputs and index identical to the local run', async () => {
    const planFile = writePlan('queue.json', 'queue-out');
    const plan = readPlan(planFile);
    const jobs = expandPlan(plan);
    const enq = await cli(['batch', planFile, '--queue', url]);
    expect(enq.code).toBe(0);
    expect(enq.stderr).toMatch(/12 jobs enqueued/);
    // Enqueuing again adds nothing (job ids are the jobs' own).
    expect((await enqueuePlan(plan, jobs, url)).added).toBe(12);
    const worker = (): ChildProcess => spawn(process.execPath, ['--import', 'tsx', join(root, 'cli/eyeproof.ts'), 'worker', '--queue', url, '--lock-seconds', '10'], { cwd: root, stdio: ['ignore', 'ignore', 'pipe'] });
    const a = worker();
    const b = worker();
    // Kill one worker as soon as it has taken a job.
    await new Promise<void>((resolve) => {
      a.stderr!.on('data', (d: Buffer) => {
        if (/taking (?!jobs)/.test(String(d))) resolve();
      });
    });
    a.kill('SIGKILL');
    try {
      const status = await waitForPlan(plan, url, 240_000);
      expect(status.completed).toBe(12);
      expect(status.failed).toBe(0);
    } finally {
      b.kill('SIGTERM');
      await new Promise((r) => b.on('exit', r));
    }
    const st = await cli(['batch', planFile, '--queue', url, '--status']);
    expect(st.stdout).toMatch(/12 completed, 0 running, 0 waiting, 0 waiting to retry, 0 failed/);
    expect(st.stdout).toMatch(/results index written/);
    // The same plan run locally into another root gives the same bytes.
    const localPlan = writePlan('queue-local.json', 'queue-local-out');
    expect((await cli(['batch', localPlan, '-q'])).code).toBe(0);
    const q = tree(join(dir, 'queue-out'));
    const l = tree(join(dir, 'queue-local-out'));
    expect([...q.keys()].sort()).toEqual([...l.keys()].sort());
    for (const [name, bytes] of q) expect(bytes.equals(l.get(name)!), name).toBe(true);
  }, 400_000);
});
