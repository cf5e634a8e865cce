/**
 * Running a plan on many machines through BullMQ on Redis (we never write our own queue). The plan's
 * jobs go into a queue of their own (`eyeproof-<plan key>`, keys under the `eyeproof` prefix), with the
 * job id as BullMQ's id, so enqueuing twice adds nothing. Workers on any machine take jobs from every
 * plan listed in the Redis set `eyeproof:plans`, run them in worker threads (runJob, the local pool's
 * function, so the process keeps renewing its locks while a proof computes) and write
 * into the shared output root; a failed job is retried with exponential backoff, then kept as failed
 * with its error; a worker killed mid-job loses nothing: its lock expires and the job is taken again.
 */
import { Queue, Worker, type Job as QueueJob } from 'bullmq';
import { Redis } from 'ioredis';
import type { Job, Plan } from './plan.js';
import { planKey } from './plan.js';
import { Piscina } from 'piscina';
import { workerFile } from './local.js';
import { isJobDone, type JobPlace, type JobSummary } from './run-job.js';

export const QUEUE_PREFIX = 'eyeproof';
export const PLANS_SET = 'eyeproof:plans';
export const ATTEMPTS = 3;

export interface QueueJobData {
  job: Job;
  place: JobPlace;
}

export function queueName(plan: Plan): string {
  return `eyeproof-${planKey(plan)}`;
}

function connect(url: string): Redis {
  // BullMQ needs blocking commands to wait forever (maxRetriesPerRequest null).
  return new Redis(url, { maxRetriesPerRequest: null, lazyConnect: false });
}

/** Runs `work` with the plan's queue open, and closes it and its connection after. */
async function withQueue<T>(plan: Plan, url: string, work: (queue: Queue<QueueJobData>, connection: Redis) => Promise<T>): Promise<T> {
  const connection = connect(url);
  const queue = new Queue<QueueJobData>(queueName(plan), { connection, prefix: QUEUE_PREFIX });
  try {
    return await work(queue, connection);
  } finally {
    await queue.close();
    await connection.quit();
  }
}

/** Adds the plan's jobs that are not done to its queue; returns how many were added and skipped. */
export async function enqueuePlan(plan: Plan, jobs: Job[], url: string): Promise<{ added: number; skipped: number }> {
  return withQueue(plan, url, async (queue, connection) => {
    const place: JobPlace = { base: plan.base, root: plan.root };
    const todo = jobs.filter((j) => !isJobDone(j, place));
    await connection.sadd(PLANS_SET, queueName(plan));
    // A job the queue finished earlier whose outputs are gone (deleted, or a changed root) runs again.
    for (const job of todo) {
      const old = await queue.getJob(job.id);
      if (old && ((await old.isCompleted()) || (await old.isFailed()))) await old.remove();
    }
    for (let i = 0; i < todo.length; i += 500) {
      await queue.addBulk(todo.slice(i, i + 500).map((job) => ({
        name: 'proof', data: { job, place },
        opts: { jobId: job.id, attempts: ATTEMPTS, backoff: { type: 'exponential', delay: 2000 }, removeOnComplete: false, removeOnFail: false },
      })));
    }
    return { added: todo.length, skipped: jobs.length - todo.length };
  });
}

export interface QueueStatus {
  queue: string;
  waiting: number;
  active: number;
  delayed: number;
  completed: number;
  failed: number;
  failures: { id: string; folder: string; error: string; attempts: number }[];
}

export async function planStatus(plan: Plan, url: string): Promise<QueueStatus> {
  return withQueue(plan, url, async (queue) => {
    const counts = await queue.getJobCounts('waiting', 'active', 'delayed', 'completed', 'failed', 'prioritized', 'waiting-children');
    const failedJobs = await queue.getFailed(0, 50);
    return {
      queue: queueName(plan), waiting: (counts.waiting ?? 0) + (counts.prioritized ?? 0), active: counts.active ?? 0, delayed: counts.delayed ?? 0,
      completed: counts.completed ?? 0, failed: counts.failed ?? 0,
      failures: failedJobs.map((j) => ({ id: String(j.id), folder: j.data.job.folder, error: j.failedReason ?? '', attempts: j.attemptsMade })),
    };
  });
}

export interface WorkerOptions {
  url: string;
  concurrency: number;
  /** How long a job's lock lasts without renewal, ms: a killed worker's job is taken again after it. */
  lockMs?: number;
  onEvent?: (text: string) => void;
}

/**
 * Takes jobs from every plan's queue until stopped: returns a stop function that finishes the jobs
 * in progress and closes the connections.
 */
export async function startQueueWorker(options: WorkerOptions): Promise<{ stop(): Promise<void> }> {
  const control = connect(options.url);
  // Proofs run in worker threads, so this process's event loop stays free to renew the job locks.
  const { filename, execArgv } = workerFile();
  const pool = new Piscina({ filename, minThreads: 1, maxThreads: options.concurrency, execArgv, idleTimeout: 30_000 });
  const workers = new Map<string, Worker<QueueJobData, JobSummary>>();
  const connections: Redis[] = [control];
  const lockDuration = options.lockMs ?? 60_000;
  const say = options.onEvent ?? (() => {});
  const watch = async (): Promise<void> => {
    for (const name of await control.smembers(PLANS_SET)) {
      if (workers.has(name)) continue;
      const worker = new Worker<QueueJobData, JobSummary>(name, async (job: QueueJob<QueueJobData, JobSummary>) => {
        say(`taking ${job.data.job.folder}`);
        return pool.run({ job: job.data.job, place: job.data.place }) as Promise<JobSummary>;
      }, { connection: (connections[connections.push(connect(options.url)) - 1]), prefix: QUEUE_PREFIX, concurrency: options.concurrency, lockDuration, stalledInterval: Math.max(1000, lockDuration / 2), maxStalledCount: 5 });
      worker.on('completed', (job) => say(`done ${job.data.job.folder}`));
      worker.on('failed', (job, err) => say(`failed ${job?.data.job.folder ?? '?'}: ${err.message}`));
      workers.set(name, worker);
    }
  };
  await watch();
  const timer = setInterval(() => { watch().catch(() => {}); }, 2000);
  return {
    async stop() {
      clearInterval(timer);
      await Promise.all([...workers.values()].map((w) => w.close()));
      await pool.destroy();
      // Connections given to BullMQ are ours to close.
      await Promise.all(connections.map((c) => c.quit().catch(() => c.disconnect())));
    },
  };
}

/** Waits until the plan's queue has nothing waiting, active or delayed (for tests and --wait). */
export async function waitForPlan(plan: Plan, url: string, timeoutMs: number): Promise<QueueStatus> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const s = await planStatus(plan, url);
    if (s.waiting + s.active + s.delayed === 0) return s;
    if (Date.now() > end) throw new Error(`the plan's queue is not done after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 500));
  }
}
