/**
 * What crosses Redis between the coordinator and the workers: an extraction request (file path + the request of
 * `extractRegionSeries`) and its result (region series and the problems met, as `Diagnostic` data), as JSON. Series
 * values travel as the bytes of their Float64Array (base64), so NaN and every bit of every value arrive unchanged: a
 * cluster run computes exactly what a single process computes.
 */
import { isDiagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import { jsonShape, type ShapeCheck } from '../core/json-shape.ts';
import type { ExtractRequest, ExtractResult } from '../read/extract.ts';
import { CANONICAL_UNITS, type RegionSeries } from '../types.ts';

export interface ExtractJob {
  readonly path: string;
  /** Includes `startIndex` for one start of a file holding several, so the worker reads that slice (and the job key differs per start). */
  readonly request: ExtractRequest;
}

export interface WireProblem {
  /** An `InputError` (names its file) or another Forelight error. */
  readonly input: boolean;
  readonly diagnostic: Diagnostic;
}

interface WireSeries extends Omit<RegionSeries, 'data' | 'perCell'> {
  readonly data: string;
  readonly perCell?: { readonly weights: string; readonly data: string };
}

export const toBase64 = (a: Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('base64');

export function fromBase64(text: string): Float64Array {
  const bytes = Buffer.from(text, 'base64');
  const data = new Float64Array(bytes.byteLength / 8);
  new Uint8Array(data.buffer).set(bytes);
  return data;
}

export interface WireResult {
  readonly series: readonly WireSeries[];
  readonly problems: readonly WireProblem[];
  readonly notes: readonly string[];
  /** The read itself failed with a Forelight error (the last problem): the coordinator throws it, as a local read would. */
  readonly thrown?: boolean;
}

const base64 = { type: 'string', pattern: '^[A-Za-z0-9+/]*={0,2}$' };
const count = { type: 'integer', minimum: 0 };
const problems = {
  type: 'array',
  items: { type: 'object', properties: { input: { type: 'boolean' }, diagnostic: { type: 'object' } }, required: ['input', 'diagnostic'] },
};
/** JSON Schema parts of every answer a worker sends (here and in start-jobs.ts). */
export const WIRE_SCHEMA = { base64, count, problems } as const;

const wireShape = jsonShape<WireResult>({
  type: 'object',
  properties: {
    thrown: { type: 'boolean' },
    series: {
      type: 'array',
      items: {
        type: 'object',
        properties: {
          region: { type: 'string' },
          quantity: { enum: Object.keys(CANONICAL_UNITS) },
          units: { type: 'string' },
          days: { type: 'array', items: { type: 'string', pattern: '^\\d{4}-\\d{2}-\\d{2}$' } },
          members: count,
          data: base64,
          cells: count,
          provenance: {
            type: 'object',
            properties: { file: { type: 'string' }, variable: { type: 'string' }, referenceTime: { type: 'string' } },
            required: ['file', 'variable', 'referenceTime'],
          },
          weighting: { const: 'population' },
          perCell: { type: 'object', properties: { weights: base64, data: base64 }, required: ['weights', 'data'] },
        },
        required: ['region', 'quantity', 'units', 'days', 'members', 'data', 'cells', 'provenance'],
      },
    },
    problems,
    notes: { type: 'array', items: { type: 'string' } },
  },
  required: ['series', 'problems', 'notes'],
});

/** How many Float64 values a base64 text holds, or -1 when its bytes are not whole values. */
export const float64Count = (text: string) => (Buffer.byteLength(text, 'base64') % 8 === 0 ? Buffer.byteLength(text, 'base64') / 8 : -1);

/** Why the problems of an answer cannot be used (one is not a `Diagnostic`), or null. */
export function undiagnosed(problems: readonly WireProblem[]): string | null {
  const bad = problems.findIndex((p) => !isDiagnostic(p.diagnostic));
  return bad < 0 ? null : `/problems/${bad}/diagnostic is not a diagnostic`;
}

/**
 * A worker's answer as it came back from Redis, checked before it is used: the shape of `WireResult`, every problem
 * a `Diagnostic`, and every series' bytes as many values as its members × days (× cells for `perCell`).
 */
export const checkWire: ShapeCheck<WireResult> = (value) => {
  const shaped = wireShape(value);
  if (!shaped.ok) return shaped;
  const wire = shaped.value;
  const why = undiagnosed(wire.problems);
  if (why) return { ok: false, why };
  for (const [i, s] of wire.series.entries()) {
    const values = s.members * s.days.length;
    if (float64Count(s.data) !== values) return { ok: false, why: `/series/${i}/data does not hold ${values} values` };
    const cells = s.perCell ? float64Count(s.perCell.weights) : 0;
    if (s.perCell && (cells < 0 || float64Count(s.perCell.data) !== cells * values)) {
      return { ok: false, why: `/series/${i}/perCell does not hold ${cells} cells of ${values} values` };
    }
  }
  return shaped;
};

export function toWire(result: ExtractResult, thrown = false): WireResult {
  return {
    ...(thrown ? { thrown } : {}),
    series: result.series.map(({ perCell, ...s }) => ({
      ...s,
      data: toBase64(s.data),
      ...(perCell ? { perCell: { weights: toBase64(perCell.weights), data: toBase64(perCell.data) } } : {}),
    })),
    problems: result.problems.map(toWireProblem),
    notes: result.notes,
  };
}

export const toWireProblem = (p: ForelightError): WireProblem => ({ input: p instanceof InputError, diagnostic: p.diagnostic });

export function fromDiagnostic({ input, diagnostic: d }: WireProblem): ForelightError {
  const { file, ...rest } = d.place;
  return input && file !== undefined
    ? new InputError(d.code, file, d.message, d.hint, { place: rest })
    : new ForelightError(d.stage, d.code, d.message, d.hint, { place: d.place });
}

export function fromWire(wire: WireResult): ExtractResult {
  return {
    series: wire.series.map(({ perCell, ...s }) => ({
      ...s,
      data: fromBase64(s.data),
      ...(perCell ? { perCell: { weights: fromBase64(perCell.weights), data: fromBase64(perCell.data) } } : {}),
    })),
    problems: wire.problems.map(fromDiagnostic),
    notes: [...wire.notes],
  };
}
