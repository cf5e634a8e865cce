/**
 * Running a plan on this machine: a pool of worker threads (piscina) sized from the machine, jobs
 * already done skipped, each job's outputs swapped in whole (so a Ctrl-C or a crash loses at most the
 * jobs in progress), then the results index.
 */
import { availableParallelism, totalmem } from 'node:os';
import { Piscina } from 'piscina';
import { BYTES_PER_FRAME_PIXEL } from '../io/decode-frame.js';
import { writeOutputsAtomically } from '../io/write-outputs.js';
import type { Job, Plan } from './plan.js';
import { collectSummaries, resultFiles } from './results.js';
import { isJobDone, type JobPlace, type JobSummary } from './run-job.js';

export interface LocalRunEvents {
  onProgress(done: number, total: number, skipped: number, failed: number): void;
  onFailure(job: Job, message: string): void;
}

/** Worker threads for this machine: one per core, no more than memory allows for 4K proofs. */
export function poolSize(): number {
  const perProof = 3840 * 2160 * BYTES_PER_FRAME_PIXEL;
  return Math.max(1, Math.min(availableParallelism(), Math.floor((totalmem() * 0.6) / perProof)));
}

/** The worker module: the compiled one beside this file, or the TypeScript source run through tsx. */
export function workerFile(): { filename: string; execArgv: string[] } {
  const here = import.meta.url;
  return here.endsWith('.ts')
    ? { filename: new URL('./pool-worker.ts', here).href, execArgv: ['--import', 'tsx'] }
    : { filename: new URL('./pool-worker.js', here).href, execArgv: [] };
}

export async function runPlanLocally(plan: Plan, jobs: Job[], events: LocalRunEvents, threads = poolSize()): Promise<{ done: number; skipped: number; failed: number }> {
  const place: JobPlace = { base: plan.base, root: plan.root };
  const todo = jobs.filter((j) => !isJobDone(j, place));
  const skipped = jobs.length - todo.length;
  let done = 0;
  let failed = 0;
  events.onProgress(0, todo.length, skipped, 0);
  if (todo.length) {
    const { filename, execArgv } = workerFile();
    const pool = new Piscina({ filename, minThreads: 1, maxThreads: threads, execArgv, idleTimeout: 1000 });
    try {
      await Promise.all(todo.map(async (job) => {
        try {
          await pool.run({ job, place }) as JobSummary;
          done++;
        } catch (err) {
          failed++;
          events.onFailure(job, (err as Error).message);
        }
        events.onProgress(done + failed, todo.length, skipped, failed);
      }));
    } finally {
      await pool.destroy();
    }
  }
  await writeIndex(plan, jobs);
  return { done, skipped, failed };
}

/** Writes results/ (results.jsonl, results.csv, summary.html) at the root from what is on disk. */
export async function writeIndex(plan: Plan, jobs: Job[]): Promise<void> {
  const summaries = collectSummaries(jobs, plan.root);
  await writeOutputsAtomically(`${plan.root}/results`, resultFiles(jobs, summaries));
}
