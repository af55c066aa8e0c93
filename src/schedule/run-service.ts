/**
 * Service mode: wake at each slot of `schedule.cron` in `schedule.timezone`, run once per slot under the
 * lock file, write the status file, stop gracefully on SIGTERM/SIGINT (the current run finishes first).
 *
 * Which slot is due is decided by computeNextRuns (DST-correct), not by the timer alone: node-cron wakes
 * the service at slot times and a backstop timer re-checks every minute, so a slot the timer misses (node-cron
 * runs a time skipped by a spring-forward gap when the gap ends, computeNextRuns shifts it by the gap) or that
 * passed while the machine slept still runs — once. On start, if a slot passed since the last completed run in
 * the ledger, the service catches up with ONE run, however many slots were missed (each run issues the newest
 * forecast anyway).
 */
import type { Config } from '../config/types.ts';
import { describeError } from '../core/errors.ts';
import { localStatePrefix, openConfiguredLedger, type LedgerSettings } from '../ledger/ledger-target.ts';
import { lastCompletedRun } from '../ledger/runs.ts';
import type { Logger } from '../core/log.ts';
import { EXIT, type ExitCode } from '../core/exit-codes.ts';
import { acquireLock } from './lock-file.ts';
import { checkCron, checkTimeZone, computeNextRuns, wakeAtSlots } from '../core/next-runs.ts';
import { makeRunReport, nextStatus, readStatus, withServicePid, writeStatus, type RunReport } from './status-file.ts';

export interface RunContext {
  readonly reason: 'scheduled' | 'catch-up';
  /** The scheduled slot this run stands for. */
  readonly slot: Date;
  /** Aborted on SIGTERM/SIGINT: finish or stop at the next safe point. */
  readonly signal: AbortSignal;
  readonly log: Logger;
}

export interface RunResult {
  readonly exitCode: ExitCode;
  /** One line for the status file, e.g. "issued 2026-11-26: 5 bulletins, 12 sent". */
  readonly summary: string;
}

export interface ServiceOptions {
  readonly config: Pick<Config, 'schedule'> & LedgerSettings;
  readonly runOnce: (ctx: RunContext) => Promise<RunResult>;
  readonly log: Logger;
  /** Stops the service when aborted (in addition to SIGTERM/SIGINT). */
  readonly signal?: AbortSignal;
  /** Start of the last completed run; default: read from the ledger (null on a fresh install: no catch-up). */
  readonly lastCompletedAt?: () => Date | null;
  /** Default `<ledger>.status.json`. */
  readonly statusPath?: string;
  /** Default `<ledger>.lock`. */
  readonly lockPath?: string;
  /** A lock older than this is stale even if its process lives (default 6 h). */
  readonly lockMaxAgeSeconds?: number;
  /** Backstop check interval (default 60 s). */
  readonly checkEverySeconds?: number;
  /** Listen to SIGTERM/SIGINT (default true). */
  readonly handleSignals?: boolean;
  readonly now?: () => Date;
}

/** A slot later than this behind "now" is reported as a catch-up run. */
const CATCH_UP_AFTER_MS = 120_000;

function ledgerLastCompletedAt(config: LedgerSettings): Date | null {
  const ledger = openConfiguredLedger(config);
  try {
    const run = lastCompletedRun(ledger);
    return run ? new Date(run.startedAt) : null;
  } finally {
    ledger.close();
  }
}

/** Where the service keeps its status file and lock, next to a SQLite ledger (also for `forelight run` / `status`). */
export function servicePaths(config: LedgerSettings): { statusPath: string; lockPath: string } {
  const prefix = localStatePrefix(config);
  return { statusPath: `${prefix}.status.json`, lockPath: `${prefix}.lock` };
}

/** Runs until stopped; resolves after the in-flight run (if any) has finished. */
export async function runService(options: ServiceOptions): Promise<void> {
  const { config, log } = options;
  const { cron: expr, timezone } = config.schedule;
  checkCron(expr);
  checkTimeZone(timezone);
  const now = options.now ?? (() => new Date());
  const statusPath = options.statusPath ?? servicePaths(config).statusPath;
  const lockPath = options.lockPath ?? servicePaths(config).lockPath;
  const startedAt = now();
  let lastRunAt = (options.lastCompletedAt ?? (() => ledgerLastCompletedAt(config)))() ?? startedAt;
  let inFlight: Promise<void> | null = null;
  let stopping = false;
  const abort = new AbortController();
  const nextRun = () => computeNextRuns(expr, timezone, now(), 1)[0]?.toISOString() ?? null;

  const record = (run: RunReport) => {
    try {
      writeStatus(
        statusPath,
        nextStatus(readStatus(statusPath), { cron: expr, timezone, nextRun: nextRun(), servicePid: process.pid }, run),
      );
    } catch (err) {
      log.error('could not write the status file', { statusPath, error: describeError(err) });
    }
  };
  const markService = (pid: number | null) => {
    try {
      writeStatus(statusPath, withServicePid(readStatus(statusPath), { cron: expr, timezone, nextRun: nextRun() }, pid, now()));
    } catch (err) {
      log.error('could not write the status file', { statusPath, error: describeError(err) });
    }
  };
  markService(process.pid);

  const runSlot = async (slot: Date, reason: RunContext['reason']) => {
    const runStart = now();
    lastRunAt = runStart;
    const rlog = log.child({ slot: slot.toISOString(), reason });
    const got = acquireLock(lockPath, { maxAgeSeconds: options.lockMaxAgeSeconds ?? 6 * 3600, now });
    if (!got.acquired) {
      const holder = got.holder ? `process ${got.holder.pid} on ${got.holder.host} since ${got.holder.startedAt}` : 'another process';
      rlog.warn('skipping this slot: another Forelight run holds the lock', { lockPath, holder });
      record(makeRunReport(reason, runStart, now(), EXIT.locked, `skipped: lock ${lockPath} held by ${holder}`));
      return;
    }
    let result: RunResult;
    try {
      rlog.info('run starting');
      result = await options.runOnce({ reason, slot, signal: abort.signal, log: rlog });
    } catch (err) {
      result = { exitCode: EXIT.unexpected, summary: describeError(err) };
    } finally {
      got.lock.release();
    }
    if (result.exitCode === EXIT.ok) rlog.info('run finished', { exitCode: result.exitCode, summary: result.summary });
    else rlog.error('run finished', { exitCode: result.exitCode, summary: result.summary });
    record(makeRunReport(reason, runStart, now(), result.exitCode, result.summary));
  };

  /** Run if a slot is due since the last run; never two at once. */
  const wake = () => {
    if (inFlight || stopping) return;
    const due = computeNextRuns(expr, timezone, lastRunAt, 1)[0];
    const t = now().getTime();
    if (!due || due.getTime() > t + 1000) return;
    const reason = t - due.getTime() > CATCH_UP_AFTER_MS ? 'catch-up' : 'scheduled';
    inFlight = runSlot(due, reason).finally(() => {
      inFlight = null;
    });
  };

  const task = wakeAtSlots(expr, timezone, wake);
  const backstop = setInterval(wake, (options.checkEverySeconds ?? 60) * 1000);
  log.info('service started', { cron: expr, timezone, nextRun: nextRun(), lastRunAt: lastRunAt.toISOString() });
  wake();

  await new Promise<void>((resolve) => {
    const onSignal = (sig: NodeJS.Signals) => stop(sig);
    const stop = (why: string) => {
      if (stopping) return;
      stopping = true;
      process.off('SIGTERM', onSignal);
      process.off('SIGINT', onSignal);
      log.info('service stopping', { why, waitingForRun: inFlight !== null });
      abort.abort();
      resolve();
    };
    if (options.handleSignals ?? true) {
      process.once('SIGTERM', onSignal);
      process.once('SIGINT', onSignal);
    }
    if (options.signal?.aborted) stop('abort signal');
    options.signal?.addEventListener('abort', () => stop('abort signal'), { once: true });
  });
  clearInterval(backstop);
  task.stop();
  await inFlight;
  markService(null);
  log.info('service stopped');
}
