/**
 * The coordinator's side of a cluster (`forelight run --cluster URL`, `forelight serve --cluster URL`): an `Extractor`
 * that hands each (file × region set) read to the workers as a BullMQ job on Redis and waits for its result, a
 * `StartReducer` that does the same for each hindcast start of a first-time climate build (start-jobs.ts) and a
 * `RegionCalibrator` for each region's calibration after it (region-jobs.ts).
 *
 * Jobs are idempotent and keyed by what they compute: the job id is the SHA-256 of the file's SHA-256 and the
 * request, so the same read asked twice (a resumed run, a second configuration on the same files) is one job, and a
 * finished one is answered from Redis without reading the file again. A worker killed mid-job loses its lock; BullMQ's
 * stalled-job check puts the job back in the queue and another worker does it.
 */
import { createHash } from 'node:crypto';
import { Queue, QueueEvents } from 'bullmq';
import { describeError, ForelightError, InputError, errorMessage } from '../core/errors.ts';
import { openChecksumMemo } from '../core/file-checksums.ts';
import type { ShapeCheck } from '../core/json-shape.ts';
import type { Logger } from '../core/log.ts';
import type { StartOutcome, StartReducer, StartRequest } from '../pipeline/hindcast-starts.ts';
import type { ExtractRequest, ExtractResult, Extractor } from '../read/extract.ts';
import { EXTRACT_QUEUE, redisClient, shownUrl } from './connection.ts';
import { checkWireStart, fromWireStart, START_JOB, startInputs, startJobId, type WireStart } from './start-jobs.ts';
import { checkWire, fromWire, type ExtractJob, type WireResult } from './wire.ts';
import {
  checkRegionAnswer,
  fromRegionAnswer,
  REGION_JOB,
  regionJobId,
  toWireRegionJob,
  type WireRegionAnswer,
  type WireRegionJob,
} from './region-jobs.ts';
import type { RegionCalibrator, RegionJob } from '../calibrate/model-climate.ts';
import { calibrateRegion as calibrateLocally } from '../calibrate/region-calibration.ts';
import type { StoredClimate } from '../calibrate/stored-climate.ts';

export interface ClusterClient {
  /** Reads, hindcast-start reductions and region calibrations, each by the workers (a run's `readers`). */
  readonly readers: { readonly extract: Extractor; readonly reduceStart: StartReducer; readonly calibrateRegion: RegionCalibrator };
  close(): Promise<void>;
}

export type ClusterJob = ExtractJob | StartRequest | WireRegionJob;
export type ClusterAnswer = WireResult | WireStart | WireRegionAnswer;

export interface ClusterOptions {
  readonly log: Logger;
  /** Folder of the checksum memo (config calibration.cache-dir), so files are hashed once across runs. */
  readonly cacheDir: string | null;
  /** Reads kept in flight at once (default 64: the workers' total concurrency is what limits the work). */
  readonly parallel?: number;
  /** Longest wait for one job, attempts and stalls included (default 30 min). */
  readonly jobTimeoutMs?: number;
}

/** A finished job stays in Redis this long, to answer the same read again (24 h). */
const KEEP_DONE_S = 24 * 3600;

export function jobId(sha256: string, request: ExtractRequest): string {
  return createHash('sha256').update(sha256).update('\0').update(JSON.stringify(request)).digest('hex');
}

export async function connectCluster(url: string, options: ClusterOptions): Promise<ClusterClient> {
  const clients = [redisClient(url), redisClient(url)];
  const queue = new Queue<ClusterJob, ClusterAnswer>(EXTRACT_QUEUE, { connection: clients[0] });
  const events = new QueueEvents(EXTRACT_QUEUE, { connection: clients[1] });
  const disconnect = (): void => {
    for (const c of clients) c.disconnect();
  };
  try {
    await Promise.all([queue.waitUntilReady(), events.waitUntilReady()]);
  } catch (err) {
    await Promise.allSettled([queue.close(), events.close()]);
    disconnect();
    throw new ForelightError(
      'cli',
      'cluster-unreachable',
      `cannot reach the cluster's Redis at ${shownUrl(url)}: ${errorMessage(err)}`,
      'start redis-server there, or check --cluster',
      { cause: err },
    );
  }
  const checksums = await openChecksumMemo(options.cacheDir);
  // Every job waited for listens on the queue's closing: as many listeners as reads in flight.
  queue.setMaxListeners((options.parallel ?? 64) * 2 + 10);
  const timeout = options.jobTimeoutMs ?? 30 * 60_000;

  /** The answer of job `id` (queued unless already there; a failed one is tried again, not remembered). */
  const answer = async <A extends ClusterAnswer>(
    name: string,
    id: string,
    data: ClusterJob,
    path: string,
    check: ShapeCheck<A>,
  ): Promise<A> => {
    const earlier = await queue.getJob(id);
    if (earlier && (await earlier.isFailed())) await earlier.remove();
    const job = await queue.add(name, data, {
      jobId: id,
      attempts: 3,
      backoff: { type: 'exponential', delay: 2000 },
      removeOnComplete: { age: KEEP_DONE_S },
      removeOnFail: { age: KEEP_DONE_S },
    });
    options.log.debug(`${name} queued`, { stage: 'read', job: id, path });
    let got: unknown;
    try {
      got = await job.waitUntilFinished(events, timeout);
    } catch (err) {
      throw new InputError(
        'read-failed',
        path,
        `the cluster's workers could not read it (${errorMessage(err)})`,
        `check the file and "forelight status --cluster ${shownUrl(url)}"; the other sources went on`,
      );
    }
    const checked = check(got);
    if (!checked.ok) {
      throw new InputError(
        'read-failed',
        path,
        `a cluster worker answered with a result Forelight cannot use (${checked.why})`,
        'run the same Forelight release on the coordinator and every worker, then run again',
      );
    }
    return checked.value;
  };

  const extract = (async (path: string, request: ExtractRequest): Promise<ExtractResult> => {
    // Every member file of a split forecast is part of what the job reads, so each one's checksum keys it.
    const sums = [];
    for (const p of [path, ...(request.moreMembers ?? [])]) sums.push(await checksums.sha256(p));
    const wire = await answer('extract', jobId(sums.join(','), request), { path, request }, path, checkWire);
    const result = fromWire(wire);
    if (wire.thrown) throw result.problems[result.problems.length - 1];
    return result;
  }) as Extractor;
  Object.defineProperty(extract, 'parallel', { value: options.parallel ?? 64 });

  const reduceStart = async (request: StartRequest): Promise<StartOutcome> => {
    const path = request.start.path;
    const sums = [];
    for (const p of startInputs(request)) sums.push(await checksums.sha256(p).catch(() => 'unreadable'));
    try {
      return fromWireStart(await answer(START_JOB, startJobId(sums, request), request, path, checkWireStart));
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      return { reduction: null, problems: [err] }; // as a start that cannot be read in this process
    }
  };

  // A region the workers cannot calibrate is calibrated here (the same pure computation): the run never lacks it.
  const calibrateRegion = async (job: RegionJob): Promise<StoredClimate[]> => {
    const wire = toWireRegionJob(job);
    const what = `source ${job.source.id}, region ${job.config.regions[0]?.id}`;
    try {
      return fromRegionAnswer(await answer(REGION_JOB, regionJobId(wire), wire, what, checkRegionAnswer));
    } catch (err) {
      options.log.warn('region calibrated by the coordinator: its cluster job failed', {
        stage: 'calibrate',
        region: what,
        error: describeError(err),
      });
      return calibrateLocally(job);
    }
  };

  const parallel = { parallel: options.parallel ?? 64 };
  return {
    readers: { extract, reduceStart: Object.assign(reduceStart, parallel), calibrateRegion: Object.assign(calibrateRegion, parallel) },
    close: async () => {
      await checksums.save();
      await Promise.allSettled([events.close(), queue.close()]);
      disconnect();
    },
  };
}
