/**
 * The ledger on both of its databases — SQLite (better-sqlite3, real files) and PostgreSQL (a throw-away Debian
 * `postgresql` cluster on a loopback port): schema version, run bookkeeping (once per forecast key, resume after a
 * crash, force), superseding stale deliveries, stage history, CAP alert references and the archive listing, each
 * suite run on both. Expected values follow from the rules documented in src/ledger/*.ts (no external source).
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { bulletinContentHash, hasBulletins, issuedBulletins, readBulletin, recordBulletins } from '../../src/ledger/bulletins.ts';
import { claimDelivery, deliveryCounts, listDeliveries, markDelivery, pendingDeliveries } from '../../src/ledger/deliveries.ts';
import { MIGRATIONS } from '../../src/ledger/migrations.ts';
import { openLedger, type Ledger } from '../../src/ledger/open-ledger.ts';
import {
  latestStageHistory,
  lastIssuedStages,
  previousCapAlert,
  recordCapAlert,
  recordDecisions,
  recordProbabilities,
  saveStageHistory,
} from '../../src/ledger/results.ts';
import { beginRun, describeInputFile, finishRun, lastCompletedRun, recordInputs, runInputs } from '../../src/ledger/runs.ts';
import type { StageDecision } from '../../src/decision-types.ts';
import type { LeadProbability } from '../../src/probability-types.ts';
import { sampleBulletin, sampleBulletins, tempDir } from '../deliver/fixtures.ts';
import { startPostgres, type TestPostgres } from '../support/servers.ts';

const open: Ledger[] = [];
afterEach(() => {
  for (const l of open.splice(0)) l.close();
});
let postgres: TestPostgres;
let databases = 0;
beforeAll(async () => {
  postgres = await startPostgres();
});
afterAll(() => postgres?.stop());

type Dialect = 'sqlite' | 'postgres';
/** A new, empty ledger: a SQLite file, or a new database in the test cluster. */
function fresh(dialect: Dialect = 'sqlite'): { ledger: Ledger; dir: string } {
  const dir = tempDir('ledger');
  let ledger: Ledger;
  if (dialect === 'sqlite') ledger = openLedger(join(dir, 'ledger.sqlite'));
  else {
    const name = `ledger_${++databases}`;
    postgres.createDatabase(name);
    ledger = openLedger(postgres.url(name), { password: postgres.password });
  }
  open.push(ledger);
  return { ledger, dir };
}

const decision = (region: string, stageId: string): StageDecision => ({
  region,
  indicator: 'heat-index',
  tier: 'weeks',
  stageId,
  rawStageId: stageId,
  ruleId: 'hi-weeks',
  lead: null,
  withheldLeads: [],
  reasons: ['test'],
});

describe('ledger schema', () => {
  it('sets user_version to the number of migrations and uses WAL (SQLite docs: PRAGMA user_version, journal_mode)', () => {
    const { ledger } = fresh();
    expect(ledger.db.prepare('PRAGMA user_version').get()).toEqual({ user_version: MIGRATIONS.length });
    expect(ledger.db.prepare('PRAGMA journal_mode').get()).toEqual({ journal_mode: 'wal' });
  });

  it('refuses a ledger from a newer Forelight with a one-line error', () => {
    const dir = tempDir('ledger-newer');
    const path = join(dir, 'l.sqlite');
    const db = new Database(path);
    db.pragma(`user_version = ${MIGRATIONS.length + 1}`);
    db.close();
    expect(() => openLedger(path)).toThrow(
      `ledger ${path} has schema version ${MIGRATIONS.length + 1}, this Forelight knows up to ${MIGRATIONS.length} — upgrade Forelight`,
    );
  });

  it('names the file when it cannot be opened', () => {
    const dir = tempDir('ledger-bad');
    writeFileSync(join(dir, 'file'), '');
    expect(() => openLedger(join(dir, 'file', 'l.sqlite'))).toThrow(
      /^cannot open ledger .*file\/l\.sqlite: .* — check that its folder exists/,
    );
  });

  it('PostgreSQL: the same migrations give the same tables; the version is kept in forelight_schema', () => {
    const { ledger } = fresh('postgres');
    const tables = (
      ledger.db.prepare(`SELECT table_name AS t FROM information_schema.tables WHERE table_schema = 'public' ORDER BY 1`).all() as {
        t: string;
      }[]
    ).map((r) => r.t);
    const sqlite = fresh('sqlite').ledger;
    const sqliteTables = (
      sqlite.db.prepare(`SELECT name AS t FROM sqlite_master WHERE type = 'table' ORDER BY 1`).all() as { t: string }[]
    ).map((r) => r.t);
    expect(tables).toEqual([...sqliteTables, 'forelight_schema'].sort());
    expect(ledger.db.prepare('SELECT version FROM forelight_schema').get()).toEqual({ version: MIGRATIONS.length });
    // Opening again migrates nothing and keeps one version row.
    const again = openLedger(ledger.path, { password: postgres.password });
    open.push(again);
    expect(again.db.prepare('SELECT count(*) AS n FROM forelight_schema').get()).toEqual({ n: 1 });
  });

  it('PostgreSQL: a wrong password is one line naming the server (password never printed), SQLSTATE given', () => {
    const name = `ledger_${++databases}`;
    postgres.createDatabase(name);
    const url = postgres.url(name);
    expect(() => openLedger(url, { password: 'wrong' })).toThrow(
      /^cannot open ledger postgres:\/\/forelight@127\.0\.0\.1:\d+\/ledger_\d+: .*password authentication failed.*SQLSTATE 28P01/,
    );
    expect(() => openLedger(url, { password: 'wrong' })).not.toThrow(/wrong/);
  });
});

describe.each(['sqlite', 'postgres'] as const)('runs (%s)', (dialect) => {
  it('issues a forecast key once; a finished key is already-issued; force starts a new run', () => {
    const { ledger } = fresh(dialect);
    const first = beginRun(ledger, '2026-11-26');
    expect(first.kind).toBe('new');
    finishRun(ledger, first.run.id, 'ok');
    expect(beginRun(ledger, '2026-11-26')).toMatchObject({ kind: 'already-issued', run: { id: first.run.id } });
    const forced = beginRun(ledger, '2026-11-26', { force: true });
    expect(forced).toMatchObject({ kind: 'new', run: { forced: true } });
    expect(forced.run.id).not.toBe(first.run.id);
  });

  it('a crashed run (still running, its process gone) is resumed and keeps what it rendered first', () => {
    const { ledger } = fresh(dialect);
    const first = beginRun(ledger, '2026-11-26');
    const ids = recordBulletins(ledger, first.run.id, sampleBulletins());
    const resumed = beginRun(ledger, '2026-11-26');
    expect(resumed).toMatchObject({ kind: 'resumed', run: { id: first.run.id, status: 'running' } });
    expect(hasBulletins(ledger, first.run.id)).toBe(true);
    const changed = sampleBulletins().map((b) => ({ ...b, subject: 'changed' }));
    expect(recordBulletins(ledger, first.run.id, changed)).toEqual(ids);
    expect(readBulletin(ledger, ids[0]).subject).not.toBe('changed');
    expect(pendingDeliveries(ledger)).toHaveLength(5);
  });

  it('a finished run with deliveries still pending is resumed, not skipped', () => {
    const { ledger } = fresh(dialect);
    const run = beginRun(ledger, '2026-11-26').run;
    recordBulletins(ledger, run.id, sampleBulletins());
    finishRun(ledger, run.id, 'partial');
    expect(beginRun(ledger, '2026-11-26').kind).toBe('resumed');
  });

  it('a newer forecast supersedes the unsent deliveries of an unfinished older run (no stale advice later)', () => {
    const { ledger } = fresh(dialect);
    const old = beginRun(ledger, '2026-11-23').run;
    recordBulletins(ledger, old.id, sampleBulletins('2026-11-23'));
    const d = pendingDeliveries(ledger)[0];
    claimDelivery(ledger, d.id, 'h:1:t', '<m@x>');
    markDelivery(ledger, d.id, 'sent');
    const next = beginRun(ledger, '2026-11-26');
    expect(next.kind).toBe('new');
    expect(deliveryCounts(ledger, old.id)).toMatchObject({ sent: 1, superseded: 4, pending: 0 });
    expect(beginRun(ledger, '2026-11-23').kind).toBe('already-issued');
    // A forced re-issue of an older key leaves the newer run's unsent deliveries alone.
    recordBulletins(ledger, next.run.id, sampleBulletins('2026-11-26'));
    beginRun(ledger, '2026-11-23', { force: true });
    expect(deliveryCounts(ledger, next.run.id)).toMatchObject({ pending: 5, superseded: 0 });
  });

  it('a key that ended nothing-new is not blocked: late data for it starts a new run', () => {
    const { ledger } = fresh(dialect);
    const a = beginRun(ledger, '2026-11-26').run;
    finishRun(ledger, a.id, 'nothing-new');
    expect(beginRun(ledger, '2026-11-26')).toMatchObject({ kind: 'new', run: { forced: false } });
  });

  it('lastCompletedRun ignores failed and running runs', () => {
    const { ledger } = fresh(dialect);
    expect(lastCompletedRun(ledger)).toBeNull();
    const a = beginRun(ledger, '2026-11-23').run;
    finishRun(ledger, a.id, 'nothing-new');
    const b = beginRun(ledger, '2026-11-26').run;
    finishRun(ledger, b.id, 'failed', 'boom');
    expect(lastCompletedRun(ledger)?.id).toBe(a.id);
  });

  it('records input files with their SHA-256 (checked against sha256sum of "forelight\\n")', async () => {
    const { ledger, dir } = fresh(dialect);
    const path = join(dir, 'fc_20261126.nc');
    writeFileSync(path, 'forelight\n');
    const run = beginRun(ledger, '2026-11-26').run;
    recordInputs(ledger, run.id, [await describeInputFile(path, 'subseasonal', '2026-11-26T00:00:00Z')]);
    // `printf 'forelight\n' | sha256sum` (GNU coreutils)
    expect(runInputs(ledger, run.id)).toEqual([
      {
        path,
        sha256: 'c2f0473d1f7538514aa1ac4446348684b875c3259c19d875df29e6a3ac55c377',
        sizeBytes: 10,
        source: 'subseasonal',
        referenceTime: '2026-11-26T00:00:00Z',
      },
    ]);
  });
});

describe.each(['sqlite', 'postgres'] as const)('results and archive (%s)', (dialect) => {
  it('stage history and issued stages come from the latest issued run, not the current one', () => {
    const { ledger } = fresh(dialect);
    const a = beginRun(ledger, '2026-11-23').run;
    saveStageHistory(ledger, a.id, JSON.stringify({ v: 'a' }));
    recordDecisions(ledger, a.id, [decision('kessan-lowlands', 'brace'), decision('orrin-coast', 'quiet')]);
    finishRun(ledger, a.id, 'ok');
    const b = beginRun(ledger, '2026-11-26').run;
    saveStageHistory(ledger, b.id, JSON.stringify({ v: 'b' }));
    expect(latestStageHistory(ledger, b.id)).toBe('{"v":"a"}');
    expect(lastIssuedStages(ledger).map((s) => [s.region, s.stageId])).toEqual([
      ['kessan-lowlands', 'brace'],
      ['orrin-coast', 'quiet'],
    ]);
    finishRun(ledger, b.id, 'ok');
    expect(latestStageHistory(ledger)).toBe('{"v":"b"}');
    expect(() => saveStageHistory(ledger, b.id, '{oops')).toThrow(/stage history of run \d+ is not JSON/);
  });

  it('previousCapAlert returns the last issued alert for region × indicator', () => {
    const { ledger } = fresh(dialect);
    expect(previousCapAlert(ledger, 'tulva-delta', 'heat-index')).toBeNull();
    const a = beginRun(ledger, '2026-11-23').run;
    recordCapAlert(ledger, a.id, 'tulva-delta', 'heat-index', {
      identifier: 'fl-1',
      sender: 'desk@health.veloria.example',
      sent: '2026-11-23T06:00:00+01:00',
      msgType: 'Alert',
    });
    finishRun(ledger, a.id, 'ok');
    const b = beginRun(ledger, '2026-11-26').run;
    recordCapAlert(ledger, b.id, 'tulva-delta', 'heat-index', {
      identifier: 'fl-2',
      sender: 'desk@health.veloria.example',
      sent: '2026-11-26T06:00:00+01:00',
      msgType: 'Update',
    });
    expect(previousCapAlert(ledger, 'tulva-delta', 'heat-index', b.id)?.identifier).toBe('fl-1');
    expect(previousCapAlert(ledger, 'kessan-lowlands', 'heat-index')).toBeNull();
  });

  it('stores probabilities with NaN as NULL', () => {
    const { ledger } = fresh(dialect);
    const run = beginRun(ledger, '2026-11-26').run;
    const p: LeadProbability = {
      source: 'subseasonal',
      region: 'kessan-lowlands',
      indicator: 'heat-index',
      lead: { tier: 'weeks', index: 2, start: '2026-12-03', end: '2026-12-09' },
      probability: 0.6,
      baseRate: Number.NaN,
      members: 11,
      validMembers: 11,
      threshold: { value: 32, units: 'degC', origin: 'test' },
      operator: '>',
      flags: [],
      skill: null,
      calibrated: false,
    };
    recordProbabilities(ledger, run.id, [p]);
    expect(ledger.db.prepare('SELECT probability, base_rate FROM probabilities').get()).toEqual({ probability: 0.6, base_rate: null });
  });

  it('issuedBulletins lists issued runs with delivery counts and content hashes', () => {
    const { ledger } = fresh(dialect);
    const run = beginRun(ledger, '2026-11-26').run;
    const b = sampleBulletin('orrin-health', ['orrin@health.veloria.example', 'ORRIN@health.veloria.example '], '2026-11-26');
    recordBulletins(ledger, run.id, [b]);
    expect(issuedBulletins(ledger)).toEqual([]); // still running: not issued
    const d = listDeliveries(ledger)[0];
    claimDelivery(ledger, d.id, 'h:1:t', '<m@x>');
    markDelivery(ledger, d.id, 'sent');
    finishRun(ledger, run.id, 'ok');
    const listed = issuedBulletins(ledger);
    expect(listed).toHaveLength(1);
    expect(listed[0]).toMatchObject({
      team: 'orrin-health',
      forecastKey: '2026-11-26',
      deliveries: { sent: 1 },
      contentSha256: bulletinContentHash(b),
    });
  });

  it('a delivery is claimed once: a second claim of the same row fails', () => {
    const { ledger } = fresh(dialect);
    recordBulletins(ledger, beginRun(ledger, '2026-11-26').run.id, sampleBulletins());
    const d = pendingDeliveries(ledger)[0];
    expect(claimDelivery(ledger, d.id, 'h:1:a', '<a@x>')).toMatchObject({ status: 'sending', attempts: 1, messageId: '<a@x>' });
    expect(claimDelivery(ledger, d.id, 'h:2:b', '<b@x>')).toBeNull();
    expect(markDelivery(ledger, d.id, 'sent')).toBe(true);
    expect(markDelivery(ledger, d.id, 'failed')).toBe(false); // only a `sending` row can be marked
  });
});
