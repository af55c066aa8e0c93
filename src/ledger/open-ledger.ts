/**
 * The audit ledger: one SQLite file (WAL mode) recording every run, its inputs, probabilities, decisions,
 * the rendered bulletins (stored BEFORE sending) and each per-recipient delivery. See migrations.ts.
 */
import Database from 'better-sqlite3';
import { hostname } from 'node:os';
import { dirname } from 'node:path';
import { ForelightError, describeError } from '../core/errors.ts';
import { fixFor } from '../core/write-atomic.ts';
import { applyMigrations } from './migrations.ts';

export interface Ledger {
  readonly path: string;
  readonly db: Database.Database;
  /** Clock for timestamps (injectable for tests). */
  readonly now: () => Date;
  /** `host:pid` of this process, written into runs and delivery claims. */
  readonly owner: { readonly host: string; readonly pid: number };
  close(): void;
}

export function openLedger(path: string, options: { now?: () => Date } = {}): Ledger {
  let db: Database.Database;
  try {
    db = new Database(path);
    db.pragma('journal_mode = WAL');
    db.pragma('synchronous = FULL');
    db.pragma('foreign_keys = ON');
    db.pragma('busy_timeout = 5000');
  } catch (err) {
    throw new ForelightError(
      'ledger',
      'ledger-open',
      `cannot open ledger ${path}: ${describeError(err)}`,
      'check that its folder exists and is writable, or change config "ledger"',
      { cause: err },
    );
  }
  applyMigrations(db, path);
  return {
    path,
    db,
    now: options.now ?? (() => new Date()),
    owner: { host: hostname(), pid: process.pid },
    close: () => db.close(),
  };
}

/** SQLite result codes that mean the ledger's file system refuses the write (SQLite C API, "Result and Error Codes"). */
const WRITE_FAULTS: Readonly<Record<string, string>> = { SQLITE_FULL: 'ENOSPC', SQLITE_READONLY: 'EROFS', SQLITE_CANTOPEN: 'EACCES', SQLITE_IOERR: 'EIO' };

/**
 * A ledger write that failed because of its disk, as one line naming the ledger and the fix (nothing is sent
 * without the ledger: it records each bulletin before sending). Any other error is returned unchanged.
 */
export function ledgerWriteFault(path: string, err: unknown): unknown {
  const code = (err as { code?: string }).code ?? '';
  const base = Object.keys(WRITE_FAULTS).find((k) => code === k || code.startsWith(`${k}_`));
  if (!base) return err;
  return new ForelightError('ledger', 'ledger-write', `ledger cannot be written (${code}: ${describeError(err)})`,
    `${fixFor(WRITE_FAULTS[base], dirname(path))}; nothing was sent, the next run resumes this one`, { cause: err, place: { file: path } });
}

/** ISO timestamp from the ledger clock. */
export function stamp(ledger: Ledger): string {
  return ledger.now().toISOString();
}
