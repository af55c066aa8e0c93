/**
 * A cluster worker (`forelight worker --cluster URL`): takes extraction jobs, hindcast-start jobs (start-jobs.ts) and
 * region-calibration jobs (region-jobs.ts) from Redis, and reads the files itself.
 * Workers must see the same input paths as the coordinator (a shared filesystem: NFS, a cluster filesystem, the same
 * mounted bucket). SIGTERM lets the jobs in hand finish, then the worker leaves; a worker that is killed outright
 * loses its job lock, and the job goes to another worker after `lockSeconds`.
 */
import { existsSync } from 'node:fs';
import { hostname } from 'node:os';
import { UnrecoverableError, Worker, type Job } from 'bullmq';
import { ForelightError } from '../core/errors.ts';
import type { Logger } from '../core/log.ts';
import { extractRegionSeries } from '../read/extract.ts';
import { EXTRACT_QUEUE, redisClient } from './connection.ts';
import type { ClusterAnswer, ClusterJob } from './coordinator.ts';
import { checkJob, type CheckedJob } from './job-checks.ts';
import { REGION_JOB, workRegionJob } from './region-jobs.ts';
import { START_JOB, workStartJob } from './start-jobs.ts';
import { toWire, type ExtractJob, type WireResult } from './wire.ts';

export interface WorkerOptions {
  readonly log: Logger;
  /** Jobs at once (default 1: a read already uses the read threads of FORELIGHT_READ_THREADS). */
  readonly concurrency?: number;
  /** Job lock time; a worker silent this long counts as gone and its job is handed on (default 30 s). */
  readonly lockSeconds?: number;
  readonly signal?: AbortSignal;
}

async function extractJob({ path, request }: ExtractJob): Promise<WireResult> {
  try {
    return toWire(await extractRegionSeries(path, request));
  } catch (err) {
    if (!(err instanceof ForelightError)) throw err;
    return toWire({ series: [], problems: [err], notes: [] }, true); // a bad file is an answer, not a reason to retry
  }
}

async function work(job: Job<ClusterJob, ClusterAnswer>, log: Logger): Promise<ClusterAnswer> {
  let checked: CheckedJob;
  try {
    checked = checkJob(job);
  } catch (err) {
    // The same job fails the same way on every worker: failed at once, not tried again.
    throw err instanceof ForelightError ? new UnrecoverableError(err.message) : err;
  }
  if (checked.kind === REGION_JOB) {
    const region = checked.data;
    const what = `source ${region.source.id}, region ${region.config.regions[0]?.id}`;
    log.info('job started', { stage: 'calibrate', job: job.id, kind: job.name, region: what, attempt: job.attemptsMade + 1 });
    const t0 = Date.now();
    const answer = workRegionJob(region);
    log.info('job done', { stage: 'calibrate', job: job.id, kind: job.name, region: what, ms: Date.now() - t0 });
    return answer;
  }
  const path = checked.kind === START_JOB ? checked.data.start.path : checked.data.path;
  log.info('job started', { stage: 'read', job: job.id, kind: job.name, path, attempt: job.attemptsMade + 1 });
  const t0 = Date.now();
  if (!existsSync(path)) {
    // Another worker may see it (a mount missing here): a plain error, so BullMQ tries again elsewhere.
    throw new Error(`${path} is not visible on worker ${hostname()}: workers need the coordinator's input paths (shared filesystem)`);
  }
  const answer = checked.kind === START_JOB ? await workStartJob(checked.data) : await extractJob(checked.data);
  log.info('job done', { stage: 'read', job: job.id, kind: job.name, path, ms: Date.now() - t0 });
  return answer;
}

/** Runs until `signal` aborts; resolves once the jobs in hand are finished and the worker has left the queue. */
export async function runClusterWorker(url: string, options: WorkerOptions): Promise<void> {
  const lockMs = (options.lockSeconds ?? 30) * 1000;
  const client = redisClient(url);
  const worker = new Worker<ClusterJob, ClusterAnswer>(EXTRACT_QUEUE, (job) => work(job, options.log), {
    connection: client,
    concurrency: options.concurrency ?? 1,
    lockDuration: lockMs,
    stalledInterval: Math.max(1000, Math.floor(lockMs / 2)),
    maxStalledCount: 3,
    name: `${hostname()}:${process.pid}`,
  });
  worker.on('failed', (job, err) => options.log.warn('job failed', { stage: 'read', job: job?.id, error: err.message }));
  worker.on('error', (err) => options.log.error('worker error', { stage: 'read', error: err.message }));
  await worker.waitUntilReady();
  options.log.info('worker ready', { stage: 'read', queue: EXTRACT_QUEUE, concurrency: options.concurrency ?? 1 });
  await new Promise<void>((resolve) => {
    if (options.signal?.aborted) resolve();
    options.signal?.addEventListener('abort', () => resolve(), { once: true });
  });
  options.log.info('worker stopping: finishing the jobs in hand', { stage: 'read' });
  await worker.close();
  client.disconnect();
}
