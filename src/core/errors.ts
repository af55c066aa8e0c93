/**
 * Typed, actionable errors. Every error carries one `Diagnostic` (code from the catalogue in
 * `diagnostic-codes.ts`, stage, place, message, hint); its `message` is that diagnostic formatted on one line.
 */
import type { DiagnosticCode, Stage } from './diagnostic-codes.ts';
import { diagnostic, formatDiagnostic, type Diagnostic, type Place } from './diagnostics.ts';

export type { Stage } from './diagnostic-codes.ts';

export class ForelightError extends Error {
  readonly diagnostic: Diagnostic;

  constructor(stage: Stage, code: DiagnosticCode, message: string, hint: string, options?: { cause?: unknown; place?: Place }) {
    const d = diagnostic(code, message, hint, options?.place, { stage });
    super(formatDiagnostic(d), options);
    this.name = new.target.name;
    this.diagnostic = d;
  }

  get code(): DiagnosticCode {
    return this.diagnostic.code;
  }

  get stage(): Stage {
    return this.diagnostic.stage;
  }

  get hint(): string {
    return this.diagnostic.hint;
  }
}

/** A configuration problem; `diagnostics` holds every problem found, each with file:line:column. */
export class ConfigError extends ForelightError {
  readonly diagnostics: readonly Diagnostic[];
  constructor(diagnostics: readonly Diagnostic[]) {
    super('config', 'config-invalid', diagnostics.map(formatDiagnostic).join('\n'), '');
    this.diagnostics = diagnostics;
  }
}

/** A problem with an input file (NetCDF, observations): names the file and the variable. */
export class InputError extends ForelightError {
  readonly file: string;
  constructor(
    code: DiagnosticCode,
    file: string,
    message: string,
    hint: string,
    options?: { cause?: unknown; place?: Omit<Place, 'file'> },
  ) {
    super('read', code, message, hint, { cause: options?.cause, place: { ...options?.place, file } });
    this.file = file;
  }
}

/** A unit that is missing, unknown or incompatible with what a formula needs. */
export class UnitError extends ForelightError {
  constructor(message: string, hint: string) {
    super('read', 'unit', message, hint);
  }
}

/** A delivery problem (SMTP, outbox). `temporary` failures are retried. */
export class DeliveryError extends ForelightError {
  readonly temporary: boolean;
  constructor(message: string, hint: string, temporary: boolean, options?: { cause?: unknown }) {
    super('deliver', temporary ? 'delivery-temporary' : 'delivery-permanent', message, hint, options);
    this.temporary = temporary;
  }
}

/** The diagnostic of a thrown value: its own for a ForelightError, else `code` with the error's text. */
export function diagnosticOf(err: unknown, code: DiagnosticCode, hint = ''): Diagnostic {
  if (err instanceof ForelightError) return err.diagnostic;
  return diagnostic(code, err instanceof Error ? err.message.split('\n').join(' | ') : String(err), hint);
}

/** One-line text for any thrown value, for stderr and logs. */
export function describeError(err: unknown): string {
  return errorMessage(err).split('\n').join(' | ');
}

/** The message of a thrown value (an `Error`'s own, else its text), lines kept. */
export function errorMessage(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}

/** The errno name (`ENOENT`, `EACCES`, …) or library code (`SQLITE_CANTOPEN`) of a thrown value, if it has one. */
export function errnoCode(err: unknown): string | undefined {
  const code = err !== null && typeof err === 'object' && 'code' in err ? err.code : undefined;
  return typeof code === 'string' ? code : undefined;
}

/** What a failed child process wrote to stderr (`execFile`'s error carries it), or '' without it. */
export function stderrOf(err: unknown): string {
  const stderr = err !== null && typeof err === 'object' && 'stderr' in err ? err.stderr : undefined;
  return typeof stderr === 'string' ? stderr : '';
}
