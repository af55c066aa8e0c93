/**
 * The audit ledger: one SQLite file (WAL mode), or a PostgreSQL database shared by several machines, recording every
 * run, its inputs, probabilities, decisions, the rendered bulletins (stored BEFORE sending) and each per-recipient
 * delivery. Both hold the same schema (migrations.ts) and take the same statements (sql-db.ts).
 */
import Database from 'better-sqlite3';
import { existsSync } from 'node:fs';
import { hostname } from 'node:os';
import { dirname } from 'node:path';
import { ForelightError, describeError, errnoCode } from '../core/errors.ts';
import { fixFor } from '../core/write-atomic.ts';
import { applyMigrations } from './migrations.ts';
import { openPostgres } from './pg-sync.ts';
import { isPostgresUrl, type SqlDb } from './sql-db.ts';

export interface Ledger {
  /** The SQLite file, or the PostgreSQL URL without its password. */
  readonly path: string;
  readonly db: SqlDb;
  /** Clock for timestamps (injectable for tests). */
  readonly now: () => Date;
  /** `host:pid` of this process, written into runs and delivery claims. */
  readonly owner: { readonly host: string; readonly pid: number };
  close(): void;
}

export interface OpenLedgerOptions {
  readonly now?: () => Date;
  /** Password of a PostgreSQL ledger (from the environment variable named by `ledger-password-env`). */
  readonly password?: string;
  /** Bring the schema up to date on opening (default); `forelight ledger migrate` does it itself to report it. */
  readonly migrate?: boolean;
}

function openSqlite(path: string): SqlDb {
  const db = new Database(path);
  db.pragma('journal_mode = WAL');
  db.pragma('synchronous = FULL');
  db.pragma('foreign_keys = ON');
  db.pragma('busy_timeout = 5000');
  return Object.assign(db, { dialect: 'sqlite' as const });
}

/** Opens (and migrates) the ledger named by config `ledger`: a file path (SQLite) or `postgres://user@host:port/db`. */
export function openLedger(target: string, options: OpenLedgerOptions = {}): Ledger {
  const postgres = isPostgresUrl(target);
  const shown = postgres ? target.replace(/\/\/([^:@/]*)(:[^@/]*)?@/, '//$1@') : target;
  let db: SqlDb;
  try {
    db = postgres ? openPostgres(target, options.password) : openSqlite(target);
  } catch (err) {
    // A full or read-only disk already refuses the WAL set-up: said as such, with the fix.
    // (SQLITE_CANTOPEN keeps the open message below: a missing or unwritable folder, not a failing write.)
    const cantOpen = (errnoCode(err) ?? '').startsWith('SQLITE_CANTOPEN');
    const fault = postgres || cantOpen ? err : ledgerWriteFault(target, err);
    if (fault !== err) throw fault;
    throw new ForelightError(
      'ledger',
      'ledger-open',
      `cannot open ledger ${shown}: ${describeError(err)}`,
      postgres
        ? 'check the server, the URL and ledger-password-env'
        : 'check that its folder exists and is writable, or change config "ledger"',
      { cause: err },
    );
  }
  if (options.migrate !== false) {
    try {
      applyMigrations(db, shown);
    } catch (err) {
      db.close();
      throw postgres ? err : ledgerWriteFault(target, err);
    }
  }
  return {
    path: shown,
    db,
    now: options.now ?? (() => new Date()),
    owner: { host: hostname(), pid: process.pid },
    close: () => db.close(),
  };
}

/**
 * An in-memory copy of a SQLite ledger (an empty one when the file does not exist yet), brought up to the current
 * schema: a dry run stores, reads back and combines exactly as a real run does, and the file itself is never
 * written. A PostgreSQL ledger is refused (its rows are not copied), with the command that only looks.
 */
export function openLedgerCopy(target: string, options: Pick<OpenLedgerOptions, 'now'> = {}): Ledger {
  if (isPostgresUrl(target)) {
    throw new ForelightError(
      'ledger',
      'ledger-dry-run',
      'a dry run rehearses on a copy of a SQLite ledger; this ledger is PostgreSQL',
      'use `forelight diff` to see which stages would change without writing anything',
    );
  }
  let db: SqlDb;
  try {
    let image: Buffer | undefined;
    if (existsSync(target)) {
      const file = new Database(target, { readonly: true, fileMustExist: true });
      try {
        image = file.serialize();
        // An in-memory database cannot be in WAL mode: mark the copy's header as rollback-journal (file format write
        // and read versions at offsets 18 and 19: 1 legacy, 2 WAL; SQLite "Database File Format" §1.3.3).
        image[18] = 1;
        image[19] = 1;
      } finally {
        file.close();
      }
    }
    const copy = image ? new Database(image) : new Database(':memory:');
    copy.pragma('foreign_keys = ON');
    db = Object.assign(copy, { dialect: 'sqlite' as const });
  } catch (err) {
    throw new ForelightError(
      'ledger',
      'ledger-open',
      `cannot read ledger ${target} for a dry run: ${describeError(err)}`,
      'check that the file is readable, or change config "ledger"',
      {
        cause: err,
      },
    );
  }
  applyMigrations(db, `${target} (dry-run copy)`);
  return {
    path: `${target} (dry-run copy)`,
    db,
    now: options.now ?? (() => new Date()),
    owner: { host: hostname(), pid: process.pid },
    close: () => db.close(),
  };
}

/** SQLite result codes that mean the ledger's file system refuses the write (SQLite C API, "Result and Error Codes"). */
const WRITE_FAULTS: Readonly<Record<string, string>> = {
  SQLITE_FULL: 'ENOSPC',
  // "may indicate that the underlying filesystem volume is out of space" (same page, quoted from memory): WAL's shm file
  // cannot grow on a full tmpfs. Listed before SQLITE_IOERR, which matches every extended I/O code.
  SQLITE_IOERR_SHMSIZE: 'ENOSPC',
  SQLITE_READONLY: 'EROFS',
  SQLITE_CANTOPEN: 'EACCES',
  SQLITE_IOERR: 'EIO',
};

/**
 * A ledger write that failed because of its disk, as one line naming the ledger and the fix (nothing is sent
 * without the ledger: it records each bulletin before sending). Any other error is returned unchanged.
 */
export function ledgerWriteFault(path: string, err: unknown): unknown {
  const code = errnoCode(err) ?? '';
  const base = Object.keys(WRITE_FAULTS).find((k) => code === k || code.startsWith(`${k}_`));
  if (!base) return err;
  return new ForelightError(
    'ledger',
    'ledger-write',
    `ledger cannot be written (${code}: ${describeError(err)})`,
    `${fixFor(WRITE_FAULTS[base], dirname(path))}; nothing was sent, the next run resumes this one`,
    { cause: err, place: { file: path } },
  );
}

/** ISO timestamp from the ledger clock. */
export function stamp(ledger: Ledger): string {
  return ledger.now().toISOString();
}
