/**
 * Diagnostics are data from where a problem arises to where a person reads it: the CLI, `run.json`, the
 * ledger, operator notices and bulletins each format or store the same `Diagnostic`. Codes and their meaning
 * are in `diagnostic-codes.ts`.
 */
import { DIAGNOSTIC_CODES, STAGES, isDiagnosticCode, type DiagnosticCode, type Severity, type Stage } from './diagnostic-codes.ts';
import { isRecord } from './json-shape.ts';

export type { DiagnosticCode, Severity, Stage } from './diagnostic-codes.ts';

/** Where a problem is; every field optional, the more the better. */
export interface Place {
  /** File as given to the reader or shown to the operator (config files relative to the working directory). */
  readonly file?: string;
  /** JSON pointer into the merged configuration tree, e.g. `/trigger-rules/3/probability`. */
  readonly pointer?: string;
  /** 1-based. */
  readonly line?: number;
  /** 1-based. */
  readonly column?: number;
  /** Source id (`sources[].id`). */
  readonly source?: string;
  readonly region?: string;
  /** Variable in the file. */
  readonly variable?: string;
  readonly indicator?: string;
}

export interface Diagnostic {
  readonly code: DiagnosticCode;
  readonly severity: Severity;
  readonly stage: Stage;
  readonly place: Place;
  /** What is wrong, one line, without the place's file (the formatter puts it in front). */
  readonly message: string;
  /** What to do; may be empty when the message says it. */
  readonly hint: string;
}

/** A diagnostic with the catalogue's stage and severity unless given. */
export function diagnostic(
  code: DiagnosticCode,
  message: string,
  hint: string,
  place: Place = {},
  over: { stage?: Stage; severity?: Severity } = {},
): Diagnostic {
  const entry = DIAGNOSTIC_CODES[code];
  return { code, severity: over.severity ?? entry.severity, stage: over.stage ?? entry.stage, place, message, hint };
}

/**
 * The same diagnostic seen from an outer context: `what` goes in front of the message and `place` fills the
 * fields the inner diagnostic did not know (the inner, more precise ones win). The code stays unless given.
 */
export function within(d: Diagnostic, what: string, place: Place, code: DiagnosticCode = d.code): Diagnostic {
  return { ...d, code, place: { ...place, ...d.place }, message: `${what}: ${d.message}` };
}

/** A finding of the bulletin consistency check (render/consistency.ts): a bug in Forelight, never an input problem. */
export function isBulletinContradiction(d: Diagnostic): boolean {
  return d.code === 'bulletin-contradiction';
}

/** `file:line:column: message — hint` (the parts that are known), the one text form of a diagnostic. */
export function formatDiagnostic(d: Diagnostic): string {
  const { file, line, column } = d.place;
  const where = file === undefined ? '' : `${file}${line === undefined ? '' : `:${line}${column === undefined ? '' : `:${column}`}`}: `;
  return `${where}${d.message}${d.hint ? ` — ${d.hint}` : ''}`;
}

/** Reading order: by file, line and column; diagnostics without a position keep their order at the end. */
export function byPlace(a: Diagnostic, b: Diagnostic): number {
  const pa = a.place;
  const pb = b.place;
  if (pa.line === undefined || pb.line === undefined) return (pa.line === undefined ? 1 : 0) - (pb.line === undefined ? 1 : 0);
  return (pa.file ?? '').localeCompare(pb.file ?? '') || pa.line - pb.line || (pa.column ?? 0) - (pb.column ?? 0);
}

/** Drops repeated diagnostics (same code, place and text), keeping the first. */
export function uniqueDiagnostics(list: readonly Diagnostic[]): Diagnostic[] {
  const seen = new Set<string>();
  return list.filter((d) => {
    const key = JSON.stringify([d.code, d.place, d.message, d.hint]);
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

const PLACE_TEXT = ['file', 'pointer', 'source', 'region', 'variable', 'indicator'] as const;
const PLACE_NUMBER = ['line', 'column'] as const;

function isPlace(v: unknown): v is Place {
  if (!isRecord(v)) return false;
  return Object.entries(v).every(
    ([k, x]) => (PLACE_TEXT.some((p) => p === k) && typeof x === 'string') || (PLACE_NUMBER.some((p) => p === k) && Number.isInteger(x)),
  );
}

/** Type guard for diagnostics read back from JSON (ledger, run.json). */
export function isDiagnostic(v: unknown): v is Diagnostic {
  return (
    isRecord(v) &&
    isDiagnosticCode(v.code) &&
    (v.severity === 'error' || v.severity === 'warning' || v.severity === 'note') &&
    STAGES.some((s) => s === v.stage) &&
    isPlace(v.place) &&
    typeof v.message === 'string' &&
    typeof v.hint === 'string'
  );
}
