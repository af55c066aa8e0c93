/**
 * Ledger schema, one migration set for SQLite and PostgreSQL (written in SQLite's DDL; `toPostgresDdl` adapts the
 * few words that differ). The version is SQLite's `PRAGMA user_version`, or the one row of table
 * `forelight_schema` in PostgreSQL. Each entry moves the schema one version up; never edit a released entry,
 * append a new one. Version N of the ledger = MIGRATIONS.length applied.
 */
import { ForelightError } from '../core/errors.ts';
import { rowReader } from './rows.ts';
import { toPostgresDdl, type SqlDb } from './sql-db.ts';

export const MIGRATIONS: readonly string[] = [
  `
  CREATE TABLE runs (
    id INTEGER PRIMARY KEY,
    forecast_key TEXT NOT NULL,
    started_at TEXT NOT NULL,
    finished_at TEXT,
    status TEXT NOT NULL CHECK (status IN ('running', 'ok', 'partial', 'nothing-new', 'failed', 'abandoned')),
    forced INTEGER NOT NULL DEFAULT 0,
    error TEXT,
    host TEXT NOT NULL,
    pid INTEGER NOT NULL
  );
  CREATE INDEX runs_by_key ON runs (forecast_key, id);

  CREATE TABLE input_files (
    run_id INTEGER NOT NULL REFERENCES runs (id),
    path TEXT NOT NULL,
    sha256 TEXT NOT NULL,
    size_bytes INTEGER NOT NULL,
    source TEXT NOT NULL,
    reference_time TEXT NOT NULL,
    PRIMARY KEY (run_id, path)
  );

  CREATE TABLE probabilities (
    run_id INTEGER NOT NULL REFERENCES runs (id),
    source TEXT NOT NULL,
    region TEXT NOT NULL,
    indicator TEXT NOT NULL,
    tier TEXT NOT NULL,
    lead_index INTEGER NOT NULL,
    lead_start TEXT NOT NULL,
    lead_end TEXT NOT NULL,
    probability REAL,
    base_rate REAL,
    members INTEGER NOT NULL,
    valid_members INTEGER NOT NULL,
    threshold_value REAL,
    threshold_units TEXT NOT NULL,
    threshold_origin TEXT NOT NULL,
    calibrated INTEGER NOT NULL,
    flags_json TEXT NOT NULL,
    skill_json TEXT,
    PRIMARY KEY (run_id, source, region, indicator, tier, lead_index)
  );

  CREATE TABLE decisions (
    run_id INTEGER NOT NULL REFERENCES runs (id),
    region TEXT NOT NULL,
    indicator TEXT NOT NULL,
    tier TEXT NOT NULL,
    stage_id TEXT NOT NULL,
    raw_stage_id TEXT NOT NULL,
    rule_id TEXT,
    reasons_json TEXT NOT NULL,
    PRIMARY KEY (run_id, region, indicator, tier)
  );

  CREATE TABLE stage_history (
    run_id INTEGER PRIMARY KEY REFERENCES runs (id),
    state_json TEXT NOT NULL,
    saved_at TEXT NOT NULL
  );

  CREATE TABLE bulletins (
    id INTEGER PRIMARY KEY,
    run_id INTEGER NOT NULL REFERENCES runs (id),
    bulletin_key TEXT NOT NULL,
    team TEXT NOT NULL,
    locale TEXT NOT NULL,
    subject TEXT NOT NULL,
    html TEXT NOT NULL,
    text TEXT NOT NULL,
    content_sha256 TEXT NOT NULL,
    created_at TEXT NOT NULL,
    UNIQUE (run_id, bulletin_key)
  );

  CREATE TABLE attachments (
    bulletin_id INTEGER NOT NULL REFERENCES bulletins (id),
    position INTEGER NOT NULL,
    cid TEXT NOT NULL,
    filename TEXT NOT NULL,
    content_type TEXT NOT NULL,
    content BLOB NOT NULL,
    PRIMARY KEY (bulletin_id, position)
  );

  CREATE TABLE deliveries (
    id INTEGER PRIMARY KEY,
    bulletin_id INTEGER NOT NULL REFERENCES bulletins (id),
    recipient TEXT NOT NULL,
    status TEXT NOT NULL CHECK (status IN ('pending', 'sending', 'sent', 'outbox', 'failed', 'superseded')),
    attempts INTEGER NOT NULL DEFAULT 0,
    last_error TEXT,
    message_id TEXT UNIQUE,
    claimed_by TEXT,
    claimed_at TEXT,
    outbox_path TEXT,
    -- 'due': the operators must be told of this failure; 'done': told (notice sent or in the outbox)
    notice TEXT CHECK (notice IN ('due', 'done')),
    created_at TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    UNIQUE (bulletin_id, recipient)
  );
  CREATE INDEX deliveries_by_status ON deliveries (status);

  CREATE TABLE cap_alerts (
    identifier TEXT PRIMARY KEY,
    run_id INTEGER NOT NULL REFERENCES runs (id),
    region TEXT NOT NULL,
    indicator TEXT NOT NULL,
    sender TEXT NOT NULL,
    sent TEXT NOT NULL,
    msg_type TEXT NOT NULL
  );
  CREATE INDEX cap_alerts_by_subject ON cap_alerts (region, indicator, run_id);
  `,
  // 2: every input problem of a run as data (src/core/diagnostics.ts), in the order found.
  `
  CREATE TABLE run_diagnostics (
    run_id INTEGER NOT NULL REFERENCES runs (id),
    position INTEGER NOT NULL,
    code TEXT NOT NULL,
    severity TEXT NOT NULL,
    diagnostic_json TEXT NOT NULL,
    PRIMARY KEY (run_id, position)
  );
  `,
];

const sqliteVersion = rowReader('PRAGMA user_version', { user_version: 'integer' });
const postgresVersion = rowReader('forelight_schema', { v: 'integer?' });

function schemaVersion(db: SqlDb, path: string): number {
  if (db.dialect === 'sqlite') return sqliteVersion.one(db.prepare('PRAGMA user_version').get(), path)?.user_version ?? 0;
  db.exec('CREATE TABLE IF NOT EXISTS forelight_schema (version INTEGER NOT NULL)');
  return postgresVersion.one(db.prepare('SELECT max(version) AS v FROM forelight_schema').get(), path)?.v ?? 0;
}

function setSchemaVersion(db: SqlDb, version: number): void {
  if (db.dialect === 'sqlite') db.exec(`PRAGMA user_version = ${version}`);
  else {
    db.exec('DELETE FROM forelight_schema');
    db.prepare('INSERT INTO forelight_schema (version) VALUES (?)').run(version);
  }
}

/** Bring `db` to the newest schema inside one transaction; refuses a ledger written by a newer Forelight. */
export function applyMigrations(db: SqlDb, path: string): { from: number; to: number } {
  const current = db.transaction(() => schemaVersion(db, path)).immediate();
  if (current > MIGRATIONS.length) {
    throw new ForelightError(
      'ledger',
      'ledger-newer',
      `ledger ${path} has schema version ${current}, this Forelight knows up to ${MIGRATIONS.length}`,
      'upgrade Forelight or point config "ledger" at another database',
    );
  }
  if (current < MIGRATIONS.length) {
    db.transaction(() => {
      // Another process may have migrated between the check and the lock.
      const now = schemaVersion(db, path);
      for (let v = now; v < MIGRATIONS.length; v++) db.exec(db.dialect === 'postgres' ? toPostgresDdl(MIGRATIONS[v]) : MIGRATIONS[v]);
      setSchemaVersion(db, MIGRATIONS.length);
    }).immediate();
  }
  return { from: current, to: MIGRATIONS.length };
}
