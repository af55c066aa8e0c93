/**
 * Service mode: catch-up once after downtime, scheduled runs, lock contention, graceful stop (in-process
 * and a real child process receiving SIGTERM). Expected behaviour from src/schedule/run-service.ts.
 */
import { spawn } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { openLedger } from '../../src/ledger/open-ledger.ts';
import { beginRun, finishRun } from '../../src/ledger/runs.ts';
import { silentLogger } from '../../src/core/log.ts';
import { EXIT } from '../../src/core/exit-codes.ts';
import { runService, type RunContext } from '../../src/schedule/run-service.ts';
import { readStatus } from '../../src/schedule/status-file.ts';
import { tempDir } from '../deliver/fixtures.ts';

const schedule = (cron: string) => ({ cron, timezone: 'Europe/Lisbon', waitForDataMinutes: 0, pollSeconds: 1 });
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('runService', () => {
  it('after downtime with several missed slots, catches up with ONE run, then waits for the next slot', async () => {
    const dir = tempDir('svc-catchup');
    const calls: RunContext[] = [];
    const stop = new AbortController();
    // The last completed run, read from a real ledger, started 10 days ago: ~3 Mon/Thu slots missed.
    const ledger = openLedger(join(dir, 'ledger.sqlite'), { now: () => new Date(Date.now() - 10 * 86_400_000) });
    finishRun(ledger, beginRun(ledger, '2026-11-19').run.id, 'ok');
    ledger.close();
    const service = runService({
      config: { ledger: join(dir, 'ledger.sqlite'), schedule: schedule('0 6 * * 1,4') },
      log: silentLogger,
      signal: stop.signal,
      handleSignals: false,
      checkEverySeconds: 0.02,
      runOnce: async (ctx) => {
        calls.push(ctx);
        return { exitCode: EXIT.ok, summary: 'issued' };
      },
    });
    await sleep(300);
    stop.abort();
    await service;
    expect(calls).toHaveLength(1);
    expect(calls[0].reason).toBe('catch-up');
    const status = readStatus(join(dir, 'ledger.sqlite.status.json'))!;
    expect(status.lastRun).toMatchObject({ reason: 'catch-up', exitCode: 0, summary: 'issued' });
    expect(Date.parse(status.nextRun!)).toBeGreaterThan(Date.now());
  });

  it('a fresh install does not catch up; a due slot runs as "scheduled"', async () => {
    const dir = tempDir('svc-sched');
    const calls: RunContext[] = [];
    const stop = new AbortController();
    const service = runService({
      config: { ledger: join(dir, 'ledger.sqlite'), schedule: schedule('* * * * * *') },
      log: silentLogger,
      signal: stop.signal,
      handleSignals: false,
      runOnce: async (ctx) => {
        calls.push(ctx);
        return { exitCode: EXIT.nothingNew, summary: 'no new data' };
      },
    });
    await sleep(1600);
    stop.abort();
    await service;
    expect(calls.length).toBeGreaterThanOrEqual(1);
    expect(calls.every((c) => c.reason === 'scheduled')).toBe(true);
    expect(readStatus(join(dir, 'ledger.sqlite.status.json'))).toMatchObject({
      consecutiveFailures: 0,
      lastRun: { exitName: 'nothingNew' },
    });
  });

  it('skips the slot when another live process holds the lock (exit code locked)', async () => {
    const dir = tempDir('svc-lock');
    const ledger = join(dir, 'ledger.sqlite');
    writeFileSync(`${ledger}.lock`, JSON.stringify({ pid: process.ppid, host: hostname(), startedAt: new Date().toISOString() }));
    let calls = 0;
    const stop = new AbortController();
    const service = runService({
      config: { ledger, schedule: schedule('0 6 * * 1,4') },
      log: silentLogger,
      signal: stop.signal,
      handleSignals: false,
      lastCompletedAt: () => new Date(Date.now() - 10 * 86_400_000),
      runOnce: async () => {
        calls++;
        return { exitCode: EXIT.ok, summary: '' };
      },
    });
    await sleep(200);
    stop.abort();
    await service;
    expect(calls).toBe(0);
    expect(readStatus(`${ledger}.status.json`)?.lastRun).toMatchObject({ exitCode: EXIT.locked, exitName: 'locked' });
  });

  it('stopping waits for the run in flight, which sees its signal aborted; a thrown error is exit 1', async () => {
    const dir = tempDir('svc-stop');
    const stop = new AbortController();
    let sawAbort = false;
    const service = runService({
      config: { ledger: join(dir, 'ledger.sqlite'), schedule: schedule('0 6 * * 1,4') },
      log: silentLogger,
      signal: stop.signal,
      handleSignals: false,
      lastCompletedAt: () => new Date(Date.now() - 10 * 86_400_000),
      runOnce: async (ctx) => {
        await sleep(300);
        sawAbort = ctx.signal.aborted;
        throw new Error('disk full');
      },
    });
    await sleep(50);
    stop.abort();
    await service;
    expect(sawAbort).toBe(true);
    expect(readStatus(join(dir, 'ledger.sqlite.status.json'))).toMatchObject({
      consecutiveFailures: 1,
      lastRun: { exitCode: 1, summary: 'disk full' },
    });
    expect(existsSync(join(dir, 'ledger.sqlite.lock'))).toBe(false);
  });

  it('a real service process stops on SIGTERM after finishing the current run', async () => {
    const dir = tempDir('svc-sigterm');
    const marker = join(dir, 'marker');
    const child = spawn(process.execPath, ['--import', 'tsx', join(import.meta.dirname, 'service-child.ts')], {
      cwd: join(import.meta.dirname, '..', '..'),
      env: { ...process.env, FL_LEDGER: join(dir, 'ledger.sqlite'), FL_MARKER: marker },
      stdio: 'ignore',
    });
    const exited = new Promise<number | null>((r) => child.on('exit', (code) => r(code)));
    const end = Date.now() + 20_000;
    while (!(existsSync(marker) && readFileSync(marker, 'utf8').endsWith('start\n'))) {
      if (Date.now() > end) throw new Error('service child never started a run');
      await sleep(20);
    }
    child.kill('SIGTERM');
    expect(await exited).toBe(0);
    const lines = readFileSync(marker, 'utf8').trim().split('\n');
    expect(lines.slice(-3)).toEqual(['start', 'end aborted=true', 'stopped']);
    expect(readStatus(join(dir, 'ledger.sqlite.status.json'))?.lastRun?.summary).toBe('child run');
  });
});
