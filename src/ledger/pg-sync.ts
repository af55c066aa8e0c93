/**
 * PostgreSQL behind the ledger's synchronous `SqlDb` surface: queries go to one connection held by a worker thread
 * (`pg-sync-worker.mjs`); the calling thread blocks on a shared flag (Atomics.wait) until the answer is posted, as
 * with SQLite, whose calls also block. A ledger call is a few short statements on a loopback or LAN server, so the
 * event loop is held for milliseconds, as it is by better-sqlite3.
 */
import { MessageChannel, receiveMessageOnPort, Worker } from 'node:worker_threads';
import { pathToFileURL } from 'node:url';
import { ForelightError } from '../core/errors.ts';
import { isRecord } from '../core/json-shape.ts';
import { packagePath } from '../core/package-root.ts';
import type { RunResult, SqlDb, Statement, Transaction } from './sql-db.ts';

const WORKER_URL = pathToFileURL(packagePath('src/ledger/pg-sync-worker.mjs'));
/** Longest a single statement may take before the ledger gives up (a lock held elsewhere, a server gone). */
const STATEMENT_TIMEOUT_MS = 60_000;
/** Transactions marked immediate take this advisory lock, so they run one at a time across all processes. */
const WRITER_LOCK = 7_061_911;

type Reply =
  { readonly ok: { rows: Record<string, unknown>[]; changes: number } } | { readonly error: { message: string; code: string | null } };

/** The worker's answer (pg-sync-worker.mjs posts exactly one of `ok` or `error`), or undefined when it is neither. */
function replyOf(message: unknown): Reply | undefined {
  if (!isRecord(message)) return undefined;
  const { ok, error } = message;
  if (isRecord(ok) && Array.isArray(ok.rows) && ok.rows.every(isRecord) && typeof ok.changes === 'number') {
    return { ok: { rows: ok.rows, changes: ok.changes } };
  }
  if (isRecord(error) && typeof error.message === 'string') {
    return { error: { message: error.message, code: typeof error.code === 'string' ? error.code : null } };
  }
  return undefined;
}

/** `?` placeholders → `$1, $2, …` (the ledger's statements hold no `?` inside string literals). */
export function numberPlaceholders(sql: string): string {
  let n = 0;
  return sql.replace(/\?/g, () => `$${++n}`);
}

/** Byte columns come back from the worker as Uint8Array; the ledger reads them as Buffers, as from SQLite. */
function asBuffers(row: Record<string, unknown>): Record<string, unknown> {
  for (const [k, v] of Object.entries(row)) if (v instanceof Uint8Array && !Buffer.isBuffer(v)) row[k] = Buffer.from(v);
  return row;
}

export function openPostgres(connectionString: string, password: string | undefined): SqlDb {
  const flag = new SharedArrayBuffer(4);
  const signal = new Int32Array(flag);
  const { port1, port2 } = new MessageChannel();
  const worker = new Worker(WORKER_URL, {
    workerData: { port: port2, flag, connectionString, password },
    transferList: [port2],
    execArgv: [],
  });
  worker.unref();
  const where = connectionString.replace(/\/\/[^@/]*@/, '//');

  const call = (msg: { op: 'query' | 'close'; sql?: string; params?: unknown[] }): { rows: Record<string, unknown>[]; changes: number } => {
    Atomics.store(signal, 0, 0);
    port1.postMessage(msg);
    const waited = Atomics.wait(signal, 0, 0, STATEMENT_TIMEOUT_MS);
    const posted = receiveMessageOnPort(port1);
    if (waited === 'timed-out' || !posted) {
      throw new ForelightError(
        'ledger',
        'ledger-postgres',
        `PostgreSQL ledger ${where} did not answer within ${STATEMENT_TIMEOUT_MS / 1000} s`,
        'check that the server is up and reachable, and that no other session holds a lock for long',
      );
    }
    const got = replyOf(posted.message);
    if (!got) {
      throw new ForelightError(
        'ledger',
        'ledger-postgres',
        `PostgreSQL ledger ${where}: the connection's worker thread posted something that is not an answer`,
        'reinstall Forelight (src/ledger/pg-sync-worker.mjs belongs to this version); report it if it recurs',
      );
    }
    if ('error' in got) {
      throw new ForelightError(
        'ledger',
        'ledger-postgres',
        `PostgreSQL ledger ${where}: ${got.error.message}${got.error.code ? ` (SQLSTATE ${got.error.code})` : ''}`,
        'check the ledger URL, the password variable named by ledger-password-env, and that the database exists',
      );
    }
    return got.ok;
  };
  const query = (sql: string, params: unknown[] = []) => call({ op: 'query', sql, params });

  let depth = 0;
  const transaction = <A extends unknown[], T>(fn: (...args: A) => T): Transaction<A, T> => {
    const runIn = (immediate: boolean, args: A): T => {
      const savepoint = `forelight_sp${depth}`;
      if (depth === 0) {
        query('BEGIN');
        if (immediate) query(`SELECT pg_advisory_xact_lock(${WRITER_LOCK})`);
      } else query(`SAVEPOINT ${savepoint}`);
      depth++;
      try {
        const out = fn(...args);
        depth--;
        query(depth === 0 ? 'COMMIT' : `RELEASE SAVEPOINT ${savepoint}`);
        return out;
      } catch (err) {
        depth--;
        query(depth === 0 ? 'ROLLBACK' : `ROLLBACK TO SAVEPOINT ${savepoint}`);
        throw err;
      }
    };
    const tx = ((...args: A) => runIn(false, args)) as Transaction<A, T>;
    tx.immediate = (...args: A) => runIn(true, args);
    return tx;
  };

  query('SELECT 1'); // connection and authentication problems surface here, while the ledger is being opened

  return {
    dialect: 'postgres',
    prepare(sql: string): Statement {
      const text = numberPlaceholders(sql);
      return {
        run: (...params): RunResult => ({ changes: query(text, params).changes }),
        get: (...params) => {
          const row = query(text, params).rows[0];
          return row ? asBuffers(row) : undefined;
        },
        all: (...params) => query(text, params).rows.map(asBuffers),
      };
    },
    exec: (sql) => {
      query(sql);
    },
    transaction,
    close: () => {
      try {
        call({ op: 'close' });
      } finally {
        void worker.terminate();
      }
    },
  };
}
