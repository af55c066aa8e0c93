/**
 * The region job of a first-time climate build (calibrate/region-calibration.ts): a worker stacks, verifies and
 * tunes one region of one source from the reduced hindcast starts the job carries (lead values, as the exact bytes
 * of their Float64Array) and answers the model climates as the skill cache stores them (JSON, non-finite numbers as
 * {"$num": …}), so the coordinator's cache entry is the one a single process writes. Everything the job needs is in
 * it, so its id is the SHA-256 of its content.
 */
import { createHash } from 'node:crypto';
import type { RegionJob } from '../calibrate/model-climate.ts';
import { calibrateRegion } from '../calibrate/region-calibration.ts';
import { decode, encode } from '../calibrate/skill-cache.ts';
import type { StartReduction } from '../calibrate/start-reduction.ts';
import { isStoredClimates, type StoredClimate } from '../calibrate/stored-climate.ts';
import { jsonShape, parseShaped, type ShapeCheck } from '../core/json-shape.ts';
import { fromWireStart, toWireStart, type WireStart } from './start-jobs.ts';

export const REGION_JOB = 'calibrate-region';

export interface WireRegionJob extends Omit<RegionJob, 'starts'> {
  readonly starts: readonly NonNullable<WireStart['reduction']>[];
}

/** The answer: the region's stored climates as JSON text. */
export interface WireRegionAnswer {
  readonly climates: string;
}

const wireReduction = (r: StartReduction) => toWireStart({ reduction: r, problems: [] }).reduction!;

export function toWireRegionJob(job: RegionJob): WireRegionJob {
  return { ...job, starts: job.starts.map(wireReduction) };
}

export function fromWireRegionJob(wire: WireRegionJob): RegionJob {
  return { ...wire, starts: wire.starts.map((r) => fromWireStart({ reduction: r, problems: [] }).reduction!) };
}

/** Job id: SHA-256 of the job (less the cache folder, which the calibration does not use). */
export function regionJobId(wire: WireRegionJob): string {
  const keyed = { ...wire, config: { ...wire.config, calibration: { ...wire.config.calibration, cacheDir: '' } } };
  return createHash('sha256').update(REGION_JOB).update('\0').update(JSON.stringify(keyed)).digest('hex');
}

/** A worker's answer to a region job. */
export function workRegionJob(wire: WireRegionJob): WireRegionAnswer {
  return { climates: JSON.stringify(calibrateRegion(fromWireRegionJob(wire)), encode) };
}

/** A region job's answer as it came from Redis: an object holding the climates' JSON text (checked further by `fromRegionAnswer`). */
export const checkRegionAnswer: ShapeCheck<WireRegionAnswer> = jsonShape<WireRegionAnswer>({
  type: 'object',
  properties: { climates: { type: 'string' } },
  required: ['climates'],
});

/** The stored climates of an answer, checked as the skill cache checks its entries (stored-climate.ts). */
export function fromRegionAnswer(answer: WireRegionAnswer): StoredClimate[] {
  const checked = parseShaped(answer.climates, (parsed) => isStoredClimates(decode(parsed)));
  if (!checked.ok) throw new Error(`a region job's answer is not a model climate (${checked.why})`);
  return checked.value;
}
