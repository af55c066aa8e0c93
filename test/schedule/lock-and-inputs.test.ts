/**
 * Lock file (atomic create with O_EXCL, POSIX open(2)), data arrival polling, fall-back to the newest earlier
 * forecast, and the status file. Expected values follow from the rules in src/schedule/*.ts (no external source).
 */
import { spawnSync } from 'node:child_process';
import { appendFileSync, existsSync, readFileSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { acquireLock } from '../../src/schedule/lock-file.ts';
import { forecastPath, resolveLatestInputs, waitForInputs } from '../../src/schedule/input-arrival.ts';
import { describeService, makeRunReport, nextStatus, readStatus, withServicePid, writeStatus } from '../../src/schedule/status-file.ts';
import { isProcessAlive } from '../../src/core/process-alive.ts';
import { EXIT, exitCodeForDeliveries } from '../../src/core/exit-codes.ts';
import { tempDir } from '../deliver/fixtures.ts';

/** Pid of a process that has exited (a real child, reaped). */
const deadPid = () => spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' }).stdout;

describe('lock file', () => {
  it('one holder at a time; the second sees who holds it; release frees it', () => {
    const path = join(tempDir('lock'), 'forelight.lock');
    const a = acquireLock(path, { maxAgeSeconds: 3600 });
    expect(a.acquired).toBe(true);
    const b = acquireLock(path, { maxAgeSeconds: 3600 });
    expect(b).toEqual({ acquired: false, holder: { pid: process.pid, host: hostname(), startedAt: expect.any(String) } });
    if (a.acquired) a.lock.release();
    expect(existsSync(path)).toBe(false);
    expect(acquireLock(path, { maxAgeSeconds: 3600 }).acquired).toBe(true);
  });

  it('a lock of a dead process, an over-age lock and a half-written lock are stale and taken over', () => {
    const dir = tempDir('lock-stale');
    const path = join(dir, 'forelight.lock');
    writeFileSync(path, JSON.stringify({ pid: Number(deadPid()), host: hostname(), startedAt: new Date().toISOString() }));
    expect(acquireLock(path, { maxAgeSeconds: 3600 }).acquired).toBe(true);
    writeFileSync(path, JSON.stringify({ pid: process.ppid, host: hostname(), startedAt: '2026-11-01T00:00:00Z' }));
    expect(acquireLock(path, { maxAgeSeconds: 3600 }).acquired).toBe(true);
    writeFileSync(path, '{"pid": 12');
    expect(acquireLock(path, { maxAgeSeconds: 3600 }).acquired).toBe(true);
    writeFileSync(path, JSON.stringify({ pid: process.ppid, host: hostname(), startedAt: new Date().toISOString() }));
    expect(acquireLock(path, { maxAgeSeconds: 3600 }).acquired).toBe(false); // live parent process holds it
  });

  it('release does not remove a lock that someone else took over', () => {
    const path = join(tempDir('lock-steal'), 'forelight.lock');
    const a = acquireLock(path, { maxAgeSeconds: 3600 });
    const other = JSON.stringify({ pid: process.ppid, host: hostname(), startedAt: new Date().toISOString() });
    writeFileSync(path, other);
    if (a.acquired) a.lock.release();
    expect(readFileSync(path, 'utf8')).toBe(other);
  });
});

describe('data arrival', () => {
  it('a file counts only once its size is stable across two polls', async () => {
    const dir = tempDir('arrive');
    const a = join(dir, 'fc_20261126.nc');
    const b = join(dir, 'sub_20261126.nc');
    let polls = 0;
    // The "copy" of b grows during the first two polls and is complete after the third.
    const sleep = async () => {
      polls++;
      if (polls === 1) writeFileSync(a, 'complete');
      if (polls <= 3) appendFileSync(b, 'chunk');
    };
    const result = await waitForInputs([a, b], new Date(Date.now() + 60_000), 1, { sleep });
    expect(result).toEqual({ arrived: [a, b], missing: [] });
    expect(polls).toBe(4);
  });

  it('gives up at the deadline and names what is missing', async () => {
    const dir = tempDir('late');
    const p = join(dir, 'fc_20261126.nc');
    let t = Date.parse('2026-11-26T06:00:00Z');
    const slept: number[] = [];
    const result = await waitForInputs([p], new Date('2026-11-26T06:10:00Z'), 240, {
      sleep: async (ms) => {
        slept.push(ms);
        t += ms;
      },
      now: () => new Date(t),
    });
    expect(result).toEqual({ arrived: [], missing: [p] });
    expect(slept).toEqual([240_000, 240_000, 120_000]);
  });

  it('past the deadline (catch-up run), complete files still count after one confirming poll', async () => {
    const dir = tempDir('catchup-files');
    const p = join(dir, 'fc_20261126.nc');
    writeFileSync(p, 'complete');
    const slept: number[] = [];
    const result = await waitForInputs([p], new Date('2026-11-26T06:10:00Z'), 240, {
      sleep: async (ms) => {
        slept.push(ms);
      },
    });
    expect(result).toEqual({ arrived: [p], missing: [] });
    expect(slept).toEqual([2000]);
  });

  it('an aborted signal (service stop) ends the wait at once', async () => {
    const stop = new AbortController();
    const waiting = waitForInputs([join(tempDir('abort'), 'never.nc')], new Date(Date.now() + 3_600_000), 60, { signal: stop.signal });
    stop.abort();
    const t0 = Date.now();
    expect((await waiting).missing).toHaveLength(1);
    expect(Date.now() - t0).toBeLessThan(1000);
  });

  it('resolveLatestInputs falls back to the newest earlier forecast and flags it stale', () => {
    const dir = tempDir('latest');
    const pattern = join(dir, 'subseasonal_{date}.nc');
    writeFileSync(forecastPath(pattern, '2026-11-23'), 'x');
    expect(forecastPath(pattern, '2026-11-23')).toBe(join(dir, 'subseasonal_20261123.nc'));
    expect(resolveLatestInputs(pattern, '2026-11-26', 7)).toEqual({
      expectedDate: '2026-11-26',
      date: '2026-11-23',
      path: join(dir, 'subseasonal_20261123.nc'),
      stale: true,
    });
    writeFileSync(forecastPath(pattern, '2026-11-26'), 'x');
    expect(resolveLatestInputs(pattern, '2026-11-26', 7)).toMatchObject({ date: '2026-11-26', stale: false });
    expect(resolveLatestInputs(pattern, '2026-12-10', 7)).toEqual({ expectedDate: '2026-12-10', date: null, path: null, stale: true });
  });
});

describe('status file', () => {
  it('round-trips and counts consecutive failures', () => {
    const path = join(tempDir('status'), 'status.json');
    expect(readStatus(path)).toBeNull();
    const base = { cron: '0 6 * * 1,4', timezone: 'Africa/Lagos', nextRun: '2026-11-30T05:00:00.000Z' };
    const t = new Date('2026-11-26T05:00:00Z');
    let s = nextStatus(null, base, makeRunReport('scheduled', t, t, EXIT.deliveryFailed, '2 in outbox'));
    s = nextStatus(s, base, makeRunReport('scheduled', t, t, EXIT.unexpected, 'boom'));
    writeStatus(path, s);
    expect(readStatus(path)).toMatchObject({
      consecutiveFailures: 2,
      lastRun: { exitName: 'unexpected' },
      recentFailures: [{ summary: 'boom' }, { summary: '2 in outbox' }],
    });
    expect(nextStatus(s, base, makeRunReport('scheduled', t, t, EXIT.nothingNew, 'no new data')).consecutiveFailures).toBe(0);
    writeFileSync(path, '{');
    expect(() => readStatus(path)).toThrow(/^status file .* is not a status file: not JSON \(.*\) — delete it/);
    // Valid JSON of the wrong shape is refused too, naming the field (ajv, JSON Schema 2020-12), not trusted by a cast.
    writeFileSync(path, JSON.stringify({ ...s, consecutiveFailures: 'two' }));
    expect(() => readStatus(path)).toThrow(/^status file .* is not a status file: \/consecutiveFailures must be integer — delete it/);
  });
});

describe('status: is the service running?', () => {
  const base = { cron: '0 6 * * 1,4', timezone: 'Africa/Lagos', nextRun: '2026-11-30T05:00:00.000Z' };
  const t = new Date('2026-11-26T05:00:00Z');

  it('a service pid that is alive is "running"; one that is gone is "NOT RUNNING" with what to do (kill(2) signal 0 probe)', () => {
    const started = withServicePid(null, base, process.pid, t);
    expect(describeService(started, isProcessAlive)).toBe(`running (pid ${process.pid})`);
    const deadPid = 2 ** 22 + 777; // above Linux's pid_max limit: never alive
    expect(describeService({ ...started, servicePid: deadPid }, isProcessAlive)).toMatch(
      new RegExp(`^NOT RUNNING: process ${deadPid} recorded at .* is gone .* — start it again`),
    );
    expect(describeService(withServicePid(started, base, null, t), isProcessAlive)).toMatch(
      /^not running \(no service has recorded itself; last written by process \d+/,
    );
    expect(describeService(null, isProcessAlive)).toMatch(/^not running/);
  });

  it('a manual run keeps the service pid; a run stopped by a signal is recorded as stopped, not ok, and is no failure', () => {
    const started = withServicePid(null, base, 4242, t);
    const manual = nextStatus(started, base, makeRunReport('manual', t, t, EXIT.ok, 'issued'));
    expect(manual.servicePid).toBe(4242);
    const stopped = nextStatus(
      manual,
      { ...base, servicePid: 4242 },
      makeRunReport('scheduled', t, t, EXIT.stopped, 'stopped by a signal before issuing'),
    );
    expect(stopped.lastRun).toMatchObject({ exitCode: 143, exitName: 'stopped' });
    expect(stopped.consecutiveFailures).toBe(0);
  });
});

describe('exit codes', () => {
  it('outbox counts as delivered only without SMTP; failed or pending is always exit 4', () => {
    expect(exitCodeForDeliveries({ failed: 0, outbox: 3, pending: 0 }, false)).toBe(EXIT.ok);
    expect(exitCodeForDeliveries({ failed: 0, outbox: 1, pending: 0 }, true)).toBe(EXIT.deliveryFailed);
    expect(exitCodeForDeliveries({ failed: 1, outbox: 0, pending: 0 }, false)).toBe(EXIT.deliveryFailed);
    expect(exitCodeForDeliveries({ failed: 0, outbox: 0, pending: 2 }, true)).toBe(4);
  });
});
