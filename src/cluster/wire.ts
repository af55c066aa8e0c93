/**
 * What crosses Redis between the coordinator and the workers: an extraction request (file path + the request of
 * `extractRegionSeries`) and its result (region series and the problems met, as `Diagnostic` data), as JSON. Series
 * values travel as the bytes of their Float64Array (base64), so NaN and every bit of every value arrive unchanged: a
 * cluster run computes exactly what a single process computes.
 */
import type { Diagnostic } from '../core/diagnostics.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import type { ExtractRequest, ExtractResult } from '../read/extract.ts';
import type { RegionSeries } from '../types.ts';

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
