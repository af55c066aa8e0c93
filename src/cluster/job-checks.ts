/**
 * A job as a worker takes it from Redis, checked before the worker reads a file for it: the shape each job kind
 * promises (an extraction, a hindcast start, a region calibration), and for a region job every start's lead-value
 * bytes as `checkWireStart` checks a start's answer. A job that fails its check is refused with one diagnostic
 * naming the job, as a coordinator of another Forelight release would send it.
 */
import { isDiagnostic } from '../core/diagnostics.ts';
import { ForelightError } from '../core/errors.ts';
import { jsonShape, type ShapeCheck } from '../core/json-shape.ts';
import type { StartRequest } from '../pipeline/hindcast-starts.ts';
import { REGION_JOB, type WireRegionJob } from './region-jobs.ts';
import { checkWireStart, START_JOB } from './start-jobs.ts';
import type { ExtractJob } from './wire.ts';

export type CheckedJob =
  | { readonly kind: 'extract'; readonly data: ExtractJob }
  | { readonly kind: typeof START_JOB; readonly data: StartRequest }
  | { readonly kind: typeof REGION_JOB; readonly data: WireRegionJob };

const text = { type: 'string' };
const texts = { type: 'array', items: text };
const count = { type: 'integer', minimum: 0 };
const pairOf = (second: Record<string, unknown>) => ({ type: 'array', prefixItems: [text, second], minItems: 2, items: false });
const regions = { type: 'array', minItems: 1, items: { type: 'object', properties: { id: text }, required: ['id'] } };
const indicators = { type: 'array', items: { type: 'object' } };

const extractShape = jsonShape<ExtractJob>({
  type: 'object',
  properties: {
    path: text,
    request: {
      type: 'object',
      properties: {
        quantities: { type: 'object', additionalProperties: text },
        regions,
        referenceTime: text,
        weightsCacheDir: text,
        tier: text,
        moreMembers: texts,
        population: { type: ['object', 'null'] },
        startIndex: count,
      },
      required: ['quantities', 'regions'],
    },
  },
  required: ['path', 'request'],
});

const startShape = jsonShape<StartRequest>({
  type: 'object',
  properties: {
    config: {
      type: 'object',
      properties: { regions, indicators, weightsCacheDir: text },
      required: ['regions', 'indicators', 'weightsCacheDir'],
    },
    source: { type: 'object', properties: { id: text, tier: text, variables: { type: 'object' } }, required: ['id', 'tier', 'variables'] },
    start: {
      type: 'object',
      properties: { year: { type: 'integer' }, start: text, path: text, files: texts, referenceTime: text, startIndex: count },
      required: ['year', 'start', 'path', 'files', 'referenceTime'],
    },
    byVariable: { type: 'array', items: pairOf({ type: 'array', items: texts }) },
    forecastCells: { type: 'array', items: pairOf(count) },
  },
  required: ['config', 'source', 'start', 'byVariable', 'forecastCells'],
});

const regionShape = jsonShape<WireRegionJob>({
  type: 'object',
  properties: {
    config: {
      type: 'object',
      properties: { regions: { ...regions, maxItems: 1 }, indicators, calibration: { type: 'object' } },
      required: ['regions', 'indicators', 'calibration'],
    },
    source: { type: 'object', properties: { id: text }, required: ['id'] },
    starts: { type: 'array', items: { type: 'object' } },
    observedProblems: { type: 'array', items: pairOf({ type: 'object' }) },
    forecastLeadOne: { type: 'array', items: pairOf({ type: ['string', 'null'], pattern: '^\\d{4}-\\d{2}-\\d{2}$' }) },
  },
  required: ['config', 'source', 'starts', 'observedProblems', 'forecastLeadOne'],
});

/** A region job's shape, each start's reduction as a start answer is checked, and each observation problem a `Diagnostic`. */
const checkRegionJob: ShapeCheck<WireRegionJob> = (value) => {
  const shaped = regionShape(value);
  if (!shaped.ok) return shaped;
  for (const [i, reduction] of shaped.value.starts.entries()) {
    const start = checkWireStart({ reduction, problems: [] });
    if (!start.ok) return { ok: false, why: `/starts/${i}${start.why.replace(/^\/reduction/, '')}` };
  }
  const bad = shaped.value.observedProblems.findIndex(([, d]) => !isDiagnostic(d));
  return bad < 0 ? shaped : { ok: false, why: `/observedProblems/${bad}/1 is not a diagnostic` };
};

/** The job's data, checked for its kind; a job of an unknown kind or a damaged one throws one `cluster-job-invalid`. */
export function checkJob(job: { readonly id?: string; readonly name: string; readonly data: unknown }): CheckedJob {
  const refuse = (why: string) =>
    new ForelightError(
      'read',
      'cluster-job-invalid',
      `cluster job ${job.id ?? '(no id)'} (${job.name}) cannot be worked: ${why}`,
      'run the same Forelight release on the coordinator and every worker; the coordinator then queues the job again',
    );
  const data = <T>(check: ShapeCheck<T>): T => {
    const checked = check(job.data);
    if (!checked.ok) throw refuse(checked.why);
    return checked.value;
  };
  if (job.name === 'extract') return { kind: 'extract', data: data(extractShape) };
  if (job.name === START_JOB) return { kind: START_JOB, data: data(startShape) };
  if (job.name === REGION_JOB) return { kind: REGION_JOB, data: data(checkRegionJob) };
  throw refuse(`its kind is not one of extract, ${START_JOB}, ${REGION_JOB}`);
}
