/**
 * What crosses Redis between the coordinator and the workers: an extraction request (file path + the request of
 * `extractRegionSeries`) and its result (region series and the problems met), as JSON. Series values travel as the
 * bytes of their Float64Array (base64), so NaN and every bit of every value arrive unchanged: a cluster run computes
 * exactly what a single process computes.
 */
import { ForelightError, InputError, type Stage } from '../core/errors.ts';
import type { ExtractRequest, ExtractResult } from '../read/extract.ts';
import type { RegionSeries } from '../types.ts';

export interface ExtractJob {
  readonly path: string;
  readonly request: ExtractRequest;
}

interface WireProblem {
  readonly kind: 'input' | 'other';
  readonly stage: Stage;
  readonly code: string;
  /** The message without the file prefix (input) and without the hint. */
  readonly text: string;
  readonly hint: string;
  readonly file?: string;
}

interface WireSeries extends Omit<RegionSeries, 'data'> {
  readonly data: string;
}

export interface WireResult {
  readonly series: readonly WireSeries[];
  readonly problems: readonly WireProblem[];
  /** The read itself failed with a Forelight error (the last problem): the coordinator throws it, as a local read would. */
  readonly thrown?: boolean;
}

function bare(err: ForelightError): string {
  let text = err.hint && err.message.endsWith(` — ${err.hint}`) ? err.message.slice(0, -(err.hint.length + 3)) : err.message;
  if (err instanceof InputError && text.startsWith(`${err.file}: `)) text = text.slice(err.file.length + 2);
  return text;
}

export function toWire(result: ExtractResult, thrown = false): WireResult {
  return {
    ...(thrown ? { thrown } : {}),
    series: result.series.map((s) => ({ ...s, data: Buffer.from(s.data.buffer, s.data.byteOffset, s.data.byteLength).toString('base64') })),
    problems: result.problems.map((p) => ({
      kind: p instanceof InputError ? 'input' : 'other', stage: p.stage, code: p.code, text: bare(p), hint: p.hint,
      ...(p instanceof InputError ? { file: p.file } : {}),
    })),
  };
}

export function fromWire(wire: WireResult): ExtractResult {
  return {
    series: wire.series.map((s) => {
      const bytes = Buffer.from(s.data, 'base64');
      const data = new Float64Array(bytes.byteLength / 8);
      new Uint8Array(data.buffer).set(bytes);
      return { ...s, data };
    }),
    problems: wire.problems.map((p) => (p.kind === 'input' && p.file !== undefined
      ? new InputError(p.code, p.file, p.text, p.hint)
      : new ForelightError(p.stage, p.code, p.text, p.hint))),
  };
}
