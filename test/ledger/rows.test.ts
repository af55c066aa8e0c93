/**
 * Ledger rows are checked as they are read back: a row edited by hand or written by another program (a status
 * outside its set, text in an integer column, NULL in a NOT NULL column) is one `ledger-row` error naming the
 * ledger, the table and the column, never a value of the wrong type passed on. Real SQLite files (better-sqlite3);
 * expected messages follow src/ledger/rows.ts (no external source).
 */
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { ForelightError } from '../../src/core/errors.ts';
import { issuedBulletins, readBulletin, recordBulletins } from '../../src/ledger/bulletins.ts';
import { listDeliveries } from '../../src/ledger/deliveries.ts';
import { openLedger, type Ledger } from '../../src/ledger/open-ledger.ts';
import { rowReader } from '../../src/ledger/rows.ts';
import { beginRun, finishRun, getRun, lastCompletedRun } from '../../src/ledger/runs.ts';
import { sampleBulletins, tempDir } from '../deliver/fixtures.ts';

const open: Ledger[] = [];
afterEach(() => {
  for (const l of open.splice(0)) l.close();
});

function fresh(): Ledger {
  const ledger = openLedger(join(tempDir('ledger-rows'), 'ledger.sqlite'));
  open.push(ledger);
  return ledger;
}

function ledgerRowError(fn: () => unknown): ForelightError {
  try {
    fn();
  } catch (err) {
    if (err instanceof ForelightError) return err;
    throw err;
  }
  throw new Error('expected a ledger-row error');
}

describe('ledger rows read back', () => {
  it('a run whose status was edited to an unknown word is a ledger-row error naming the column and the words allowed', () => {
    const ledger = fresh();
    const { run } = beginRun(ledger, '2026-11-26');
    ledger.db.exec('PRAGMA ignore_check_constraints = ON'); // as another program writing the file might (SQLite docs)
    ledger.db.prepare("UPDATE runs SET status = 'done' WHERE id = ?").run(run.id);
    const err = ledgerRowError(() => getRun(ledger, run.id));
    expect(err.code).toBe('ledger-row');
    expect(err.message).toContain(
      `ledger ${ledger.path}: runs row, column status is "done", not one of running, ok, partial, nothing-new, failed, abandoned`,
    );
  });

  it('text in an integer column and NULL in a NOT NULL column are named (SQLite keeps what it is given: type affinity)', () => {
    const ledger = fresh();
    const { run } = beginRun(ledger, '2026-11-26');
    finishRun(ledger, run.id, 'ok');
    ledger.db.prepare("UPDATE runs SET pid = 'four' WHERE id = ?").run(run.id);
    expect(ledgerRowError(() => lastCompletedRun(ledger)).message).toContain(
      `ledger ${ledger.path}: runs row, column pid is string "four", not integer`,
    );
    recordBulletins(ledger, run.id, sampleBulletins());
    ledger.db.prepare('UPDATE deliveries SET attempts = 1.5').run();
    expect(ledgerRowError(() => listDeliveries(ledger)).message).toContain('deliveries row, column attempts is number 1.5, not integer');
    ledger.db.prepare('UPDATE deliveries SET attempts = 0').run();
    expect(listDeliveries(ledger).length).toBeGreaterThan(0);
  });

  it('well-formed rows come back unchanged: bulletins, attachments as bytes, counts', () => {
    const ledger = fresh();
    const { run } = beginRun(ledger, '2026-11-26');
    const bulletins = sampleBulletins();
    const [rowId] = recordBulletins(ledger, run.id, bulletins);
    finishRun(ledger, run.id, 'ok');
    const back = readBulletin(ledger, rowId);
    expect(back.subject).toBe(bulletins[0].subject);
    expect(back.attachments.map((a) => Buffer.from(a.content).toString('hex'))).toEqual(
      bulletins[0].attachments.map((a) => Buffer.from(a.content).toString('hex')),
    );
    expect(issuedBulletins(ledger)[0].deliveries).toEqual({ pending: bulletins[0].to.length });
  });

  it('a row that is not an object, or misses a column, is refused', () => {
    const reader = rowReader('t', { a: 'integer', b: 'text?', c: ['x', null] });
    expect(reader.one(undefined, 'L')).toBeUndefined();
    expect(reader.one({ a: 1, b: null, c: null }, 'L')).toEqual({ a: 1, b: null, c: null });
    expect(() => reader.one(7, 'L')).toThrow('ledger L: a t row is not a row');
    expect(() => reader.all([{ a: 1, c: 'x' }], 'L')).toThrow('ledger L: t row, column b is absent');
    expect(() => reader.one({ a: 1, b: 'y', c: 'z' }, 'L')).toThrow('ledger L: t row, column c is "z", not one of x, null');
  });
});
