/**
 * Typed, actionable errors. Every message is one line: what failed, where (file, variable, region or
 * YAML line), and what to do. `code` is stable for tests and logs.
 */

export type Stage = 'config' | 'read' | 'indicators' | 'calibrate' | 'decide' | 'render' | 'deliver' | 'ledger' | 'schedule' | 'cli';

export class ForelightError extends Error {
  readonly code: string;
  readonly stage: Stage;
  readonly hint: string;

  constructor(stage: Stage, code: string, message: string, hint: string, options?: { cause?: unknown }) {
    super(hint ? `${message} — ${hint}` : message, options);
    this.name = new.target.name;
    this.code = code;
    this.stage = stage;
    this.hint = hint;
  }
}

/** A configuration problem; `problems` holds every `file:line:col: message — fix` line found. */
export class ConfigError extends ForelightError {
  readonly problems: readonly string[];
  constructor(problems: readonly string[]) {
    super('config', 'config-invalid', problems.join('\n'), '');
    this.problems = problems;
  }
}

/** A problem with an input file (NetCDF, observations): names the file and the variable. */
export class InputError extends ForelightError {
  readonly file: string;
  constructor(code: string, file: string, message: string, hint: string, options?: { cause?: unknown }) {
    super('read', code, `${file}: ${message}`, hint, options);
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

/** One-line text for any thrown value, for stderr and logs. */
export function describeError(err: unknown): string {
  if (err instanceof Error) return err.message.split('\n').join(' | ');
  return String(err);
}
