/**
 * Runs: one row per attempt to issue the bulletins of a forecast key (the forecast date, e.g. "2026-11-26").
 * A key is issued once; a second start for the same key resumes an unfinished run or does nothing, unless forced.
 */
import { stat } from 'node:fs/promises';
import { ForelightError } from '../core/errors.ts';
import { sha256File } from '../core/file-checksums.ts';
import { isProcessAlive } from '../core/process-alive.ts';
import { stamp, type Ledger } from './open-ledger.ts';
import { idRows, returnedId, rowReader, type RowType } from './rows.ts';
import { upsertSql } from './sql-db.ts';

const RUN_STATUSES = ['running', 'ok', 'partial', 'nothing-new', 'failed', 'abandoned'] as const;
export type RunStatus = (typeof RUN_STATUSES)[number];

export interface RunRecord {
  readonly id: number;
  readonly forecastKey: string;
  readonly startedAt: string;
  readonly finishedAt: string | null;
  readonly status: RunStatus;
  readonly forced: boolean;
  readonly error: string | null;
  readonly host: string;
  readonly pid: number;
}

/**
 * `new`: start from scratch. `resumed`: an earlier run for this key crashed or left deliveries unsent;
 * continue it (skip rendering when `hasBulletins(ledger, run.id)`). `already-issued`: nothing to do — the key
 * was issued, or was superseded by a newer forecast (run.status `abandoned`); `force` issues it again.
 */
export type BeginRun =
  | { readonly kind: 'new'; readonly run: RunRecord }
  | { readonly kind: 'resumed'; readonly run: RunRecord }
  | { readonly kind: 'already-issued'; readonly run: RunRecord };

const runRows = rowReader('runs', {
  id: 'integer',
  forecast_key: 'text',
  started_at: 'text',
  finished_at: 'text?',
  status: RUN_STATUSES,
  forced: 'integer',
  error: 'text?',
  host: 'text',
  pid: 'integer',
});
type RunRow = RowType<typeof runRows>;

const toRecord = (r: RunRow): RunRecord => ({
  id: r.id,
  forecastKey: r.forecast_key,
  startedAt: r.started_at,
  finishedAt: r.finished_at,
  status: r.status,
  forced: r.forced === 1,
  error: r.error,
  host: r.host,
  pid: r.pid,
});

export function getRun(ledger: Ledger, runId: number): RunRecord {
  const row = runRows.one(ledger.db.prepare('SELECT * FROM runs WHERE id = ?').get(runId), ledger.path);
  if (!row)
    throw new ForelightError('ledger', 'run-unknown', `run ${runId} is not in ledger ${ledger.path}`, 'list runs with "forelight status"');
  return toRecord(row);
}

const UNFINISHED = `(status IN ('running', 'failed')
  OR EXISTS (SELECT 1 FROM deliveries d JOIN bulletins b ON b.id = d.bulletin_id
             WHERE b.run_id = runs.id AND d.status IN ('pending', 'sending')))`;

export function beginRun(ledger: Ledger, forecastKey: string, options: { force?: boolean } = {}): BeginRun {
  const { db, owner } = ledger;
  return db
    .transaction((): BeginRun => {
      const latest = runRows.one(
        db.prepare(`SELECT * FROM runs WHERE forecast_key = ? ORDER BY id DESC LIMIT 1`).get(forecastKey),
        ledger.path,
      );
      if (latest && latest.status === 'running' && latest.host === owner.host && latest.pid !== owner.pid && isProcessAlive(latest.pid)) {
        throw new ForelightError(
          'ledger',
          'run-in-progress',
          `forecast ${forecastKey} is being issued by process ${latest.pid} (run ${latest.id})`,
          'wait for it to finish or stop that process',
        );
      }
      // A key that ended "nothing-new" was never issued: late data for it starts a fresh run.
      if (latest && latest.status !== 'nothing-new' && !options.force) {
        const unfinished = db.prepare(`SELECT 1 FROM runs WHERE id = ? AND ${UNFINISHED}`).get(latest.id);
        if (!unfinished) return { kind: 'already-issued', run: toRecord(latest) };
        db.prepare(`UPDATE runs SET status = 'running', finished_at = NULL, host = ?, pid = ? WHERE id = ?`).run(
          owner.host,
          owner.pid,
          latest.id,
        );
        abandonOthers(ledger, latest.id);
        return { kind: 'resumed', run: getRun(ledger, latest.id) };
      }
      const inserted = db
        .prepare(
          `INSERT INTO runs (forecast_key, started_at, status, forced, host, pid)
      VALUES (?, ?, 'running', ?, ?, ?) RETURNING id`,
        )
        .get(forecastKey, stamp(ledger), options.force ? 1 : 0, owner.host, owner.pid);
      const id = returnedId('runs', inserted, ledger.path);
      abandonOthers(ledger, id);
      return { kind: 'new', run: getRun(ledger, id) };
    })
    .immediate();
}

/**
 * A run makes every other unfinished run of the same or an older forecast key stale: their unsent
 * deliveries become `superseded`, so that old advice is never sent later as if it were new.
 * (Keys are ISO dates, so text order is date order.)
 */
function abandonOthers(ledger: Ledger, keepRunId: number): void {
  const now = stamp(ledger);
  const stale = idRows.all(
    ledger.db
      .prepare(
        `SELECT id FROM runs WHERE id <> ? AND ${UNFINISHED}
    AND forecast_key <= (SELECT forecast_key FROM runs WHERE id = ?)`,
      )
      .all(keepRunId, keepRunId),
    ledger.path,
  );
  for (const { id } of stale) {
    ledger.db
      .prepare(
        `UPDATE deliveries SET status = 'superseded', updated_at = ?,
      last_error = coalesce(last_error || ' | ', '') || 'superseded by run ' || CAST(? AS TEXT)
      WHERE status IN ('pending', 'sending') AND bulletin_id IN (SELECT id FROM bulletins WHERE run_id = ?)`,
      )
      .run(now, keepRunId, id);
    ledger.db
      .prepare(
        `UPDATE runs SET status = CASE WHEN status IN ('running', 'failed') THEN 'abandoned' ELSE status END,
      finished_at = coalesce(finished_at, ?) WHERE id = ?`,
      )
      .run(now, id);
  }
}

export function finishRun(ledger: Ledger, runId: number, status: Exclude<RunStatus, 'running' | 'abandoned'>, error?: string): RunRecord {
  ledger.db.prepare('UPDATE runs SET status = ?, finished_at = ?, error = ? WHERE id = ?').run(status, stamp(ledger), error ?? null, runId);
  return getRun(ledger, runId);
}

/** Latest run that completed (ok, partial or nothing-new): the reference for catch-up after downtime. */
export function lastCompletedRun(ledger: Ledger): RunRecord | null {
  const row = runRows.one(
    ledger.db
      .prepare(
        `SELECT * FROM runs WHERE status IN ('ok', 'partial', 'nothing-new')
    ORDER BY started_at DESC, id DESC LIMIT 1`,
      )
      .get(),
    ledger.path,
  );
  return row ? toRecord(row) : null;
}

export interface InputFileRecord {
  readonly path: string;
  readonly sha256: string;
  readonly sizeBytes: number;
  readonly source: string;
  /** ISO 8601 UTC forecast reference time. */
  readonly referenceTime: string;
}

/** Hash a file (streamed) for `recordInputs`; `checksum` may come from a memo of earlier runs. */
export async function describeInputFile(
  path: string,
  source: string,
  referenceTime: string,
  checksum: (path: string) => Promise<string> = sha256File,
): Promise<InputFileRecord> {
  return { path, sha256: await checksum(path), sizeBytes: (await stat(path)).size, source, referenceTime };
}

export function recordInputs(ledger: Ledger, runId: number, files: readonly InputFileRecord[]): void {
  const insert = ledger.db.prepare(
    upsertSql('input_files', ['run_id', 'path', 'sha256', 'size_bytes', 'source', 'reference_time'], ['run_id', 'path']),
  );
  ledger.db.transaction(() => {
    for (const f of files) insert.run(runId, f.path, f.sha256, f.sizeBytes, f.source, f.referenceTime);
  })();
}

const inputFileRows = rowReader('input_files', {
  path: 'text',
  sha256: 'text',
  size_bytes: 'integer',
  source: 'text',
  reference_time: 'text',
});

export function runInputs(ledger: Ledger, runId: number): InputFileRecord[] {
  return inputFileRows
    .all(ledger.db.prepare('SELECT * FROM input_files WHERE run_id = ? ORDER BY path').all(runId), ledger.path)
    .map((r) => ({ path: r.path, sha256: r.sha256, sizeBytes: r.size_bytes, source: r.source, referenceTime: r.reference_time }));
}
