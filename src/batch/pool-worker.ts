/** A worker thread of the local pool (piscina): runs one job at a time. */
import type { Job } from './plan.js';
import { runJob, type JobPlace, type JobSummary } from './run-job.js';

export default async function work({ job, place }: { job: Job; place: JobPlace }): Promise<JobSummary> {
  return runJob(job, place);
}
