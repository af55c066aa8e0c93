/**
 * The hindcast-start job of a first-time climate build (pipeline/hindcast-starts.ts): a worker reads one start,
 * reduces it to lead values and sends back only those (a few numbers per member, lead and region × indicator, not
 * the daily series). Lead values travel as the bytes of their Float64Array, so the coordinator stacks exactly what
 * a single process would have computed. The worker reads the observations itself (the same file through the same
 * shared filesystem, once per worker and observations file), as they are part of every start's reduction.
 */
import { createHash } from 'node:crypto';
import { isDiagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { openChecksumMemo } from '../core/file-checksums.ts';
import { jsonShape, type ShapeCheck } from '../core/json-shape.ts';
import type { PairKey } from '../core/keys.ts';
import { readRegions } from '../config/region-views.ts';
import { observedContext } from '../calibrate/model-climate.ts';
import type { ObservedContext, PairReduction } from '../calibrate/start-reduction.ts';
import type { LeadValues } from '../calibrate/lead-tiers.ts';
import { LEAD_WINDOW_SCHEMA } from '../calibrate/stored-climate.ts';
import { localStartReducer, regionClimatologies, type StartOutcome, type StartRequest } from '../pipeline/hindcast-starts.ts';
import { readFile } from '../pipeline/read-file.ts';
import { extractRegionSeries } from '../read/extract.ts';
import type { LeadWindow } from '../types.ts';
import { float64Count, fromBase64, fromDiagnostic, toBase64, toWireProblem, undiagnosed, WIRE_SCHEMA, type WireProblem } from './wire.ts';

export const START_JOB = 'reduce-start';

interface WireLeads {
  readonly leads: LeadWindow[];
  readonly members: number;
  readonly values: string;
  readonly beyondTable?: string;
}
type WirePair =
  { readonly units: string; readonly hindcast: WireLeads; readonly observed: WireLeads | null } | { readonly failure: Diagnostic };

export interface WireStart {
  readonly reduction: {
    readonly year: number;
    readonly start: string;
    readonly path: string;
    readonly pairs: [PairKey, WirePair][];
  } | null;
  readonly problems: readonly WireProblem[];
}

const { base64, count, problems } = WIRE_SCHEMA;
const wireLeads = {
  type: 'object',
  properties: { leads: { type: 'array', items: LEAD_WINDOW_SCHEMA }, members: count, values: base64, beyondTable: base64 },
  required: ['leads', 'members', 'values'],
};
/** A failure, or the lead values (the ajv message then names the first field that differs, not just "anyOf"). */
const wirePair = {
  type: 'object',
  if: { properties: { failure: {} }, required: ['failure'] },
  then: { properties: { failure: { type: 'object' } } },
  else: {
    properties: { units: { type: 'string' }, hindcast: wireLeads, observed: { ...wireLeads, type: ['object', 'null'] } },
    required: ['units', 'hindcast', 'observed'],
  },
};
const startShape = jsonShape<WireStart>({
  type: 'object',
  properties: {
    reduction: {
      type: ['object', 'null'],
      properties: {
        year: { type: 'integer' },
        start: { type: 'string' },
        path: { type: 'string' },
        pairs: {
          type: 'array',
          items: { type: 'array', prefixItems: [{ type: 'string', pattern: '\\|' }, wirePair], minItems: 2, items: false },
        },
      },
      required: ['year', 'start', 'path', 'pairs'],
    },
    problems,
  },
  required: ['reduction', 'problems'],
});

/** Why lead values cannot be used: their bytes are not one value (and one beyond-table flag) per member × lead. */
function leadsUnusable(l: WireLeads, at: string): string | null {
  const n = l.members * l.leads.length;
  if (float64Count(l.values) !== n) return `${at}/values does not hold ${n} values`;
  if (l.beyondTable !== undefined && Buffer.byteLength(l.beyondTable, 'base64') !== n) return `${at}/beyondTable does not hold ${n} flags`;
  return null;
}

/** A worker's answer to a start job, checked before use: its shape, every problem and failure a `Diagnostic`, the byte counts. */
export const checkWireStart: ShapeCheck<WireStart> = (value) => {
  const shaped = startShape(value);
  if (!shaped.ok) return shaped;
  const why =
    undiagnosed(shaped.value.problems) ??
    (shaped.value.reduction?.pairs ?? [])
      .map(([, p], i) => {
        const at = `/reduction/pairs/${i}/1`;
        if ('failure' in p) return isDiagnostic(p.failure) ? null : `${at}/failure is not a diagnostic`;
        return leadsUnusable(p.hindcast, `${at}/hindcast`) ?? (p.observed && leadsUnusable(p.observed, `${at}/observed`));
      })
      .find((w) => w !== null) ??
    null;
  return why ? { ok: false, why } : shaped;
};

const bytes = (b: Uint8Array): string => Buffer.from(b.buffer, b.byteOffset, b.byteLength).toString('base64');

const toWireLeads = (l: LeadValues): WireLeads => ({
  leads: l.leads,
  members: l.members,
  values: toBase64(l.values),
  ...(l.beyondTable ? { beyondTable: bytes(l.beyondTable) } : {}),
});
const fromWireLeads = (l: WireLeads): LeadValues => ({
  leads: l.leads,
  members: l.members,
  values: fromBase64(l.values),
  ...(l.beyondTable !== undefined ? { beyondTable: Uint8Array.from(Buffer.from(l.beyondTable, 'base64')) } : {}),
});

export function toWireStart(outcome: StartOutcome): WireStart {
  const r = outcome.reduction;
  const pair = (p: PairReduction): WirePair =>
    'failure' in p ? p : { units: p.units, hindcast: toWireLeads(p.hindcast), observed: p.observed && toWireLeads(p.observed) };
  return {
    reduction: r && { year: r.year, start: r.start, path: r.path, pairs: [...r.pairs].map(([k, p]) => [k, pair(p)]) },
    problems: outcome.problems.map(toWireProblem),
  };
}

export function fromWireStart(wire: WireStart): StartOutcome {
  const r = wire.reduction;
  const pair = (p: WirePair): PairReduction =>
    'failure' in p ? p : { units: p.units, hindcast: fromWireLeads(p.hindcast), observed: p.observed && fromWireLeads(p.observed) };
  return {
    reduction: r && { year: r.year, start: r.start, path: r.path, pairs: new Map(r.pairs.map(([k, p]) => [k, pair(p)])) },
    problems: wire.problems.map(fromDiagnostic),
  };
}

/** The files whose contents a start's reduction depends on: the start's own, the observations and the population raster. */
export function startInputs(request: StartRequest): string[] {
  const { config, start } = request;
  return [
    ...start.files,
    ...(config.observations ? [config.observations.path] : []),
    ...(config.population ? [config.population.file] : []),
  ];
}

/** Job id: SHA-256 of the job kind, the input files' checksums (in order) and the request (less the weights cache folder: it only saves work). */
export function startJobId(checksums: readonly string[], request: StartRequest): string {
  const { weightsCacheDir: _, ...config } = request.config;
  const keyed = JSON.stringify({ ...request, config });
  return createHash('sha256').update(START_JOB).update('\0').update(checksums.join(',')).update('\0').update(keyed).digest('hex');
}

/** Checksums of the observations files seen by this worker (by path, size and modification time). */
const checksums = openChecksumMemo(null);

/** The observations context of the latest observations read in this worker (most jobs of a build share it). */
let lastObserved: { key: string; context: Promise<ObservedContext> } | null = null;

async function observedFor(request: StartRequest): Promise<ObservedContext> {
  const { config } = request;
  const sum = config.observations ? await (await checksums).sha256(config.observations.path) : 'none';
  const { regions, indicators, observations, population, weightsCacheDir } = config;
  const key = JSON.stringify([sum, regions, indicators, observations, population, weightsCacheDir]);
  if (lastObserved?.key !== key) {
    const read = async (): Promise<ObservedContext> => {
      // Its problems are the coordinator's to report (it read the same file for the forecast's run).
      const observed = observations
        ? await readFile(
            extractRegionSeries,
            observations.path,
            observations.variables,
            readRegions(config),
            { weightsCacheDir, population },
            [],
          )
        : null;
      const climatology = regionClimatologies(config, observed, () => {});
      return observedContext({ observed, climatology, observedMemo: new Map() });
    };
    lastObserved = { key, context: read() };
  }
  return lastObserved.context;
}

/** A worker's answer to a start job: the start read here and reduced against the observations read here. */
export async function workStartJob(request: StartRequest): Promise<WireStart> {
  const reduce = localStartReducer(extractRegionSeries, await observedFor(request));
  return toWireStart(await reduce(request));
}
