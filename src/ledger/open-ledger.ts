/**
 * The audit ledger: one SQLite file (WAL mode) recording every run, its inputs, probabilities, decisions,
 * the rendered bulletins (stored BEFORE sending) and each per-recipient delivery. See migrations.ts.
 */
import Database from 'better-sqlite3';
import { hostname } from 'node:os';
import { ForelightError, describeError } from '../core/errors.ts';
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

/** ISO timestamp from the ledger clock. */
export function stamp(ledger: Ledger): string {
  return ledger.now().toISOString();
}
