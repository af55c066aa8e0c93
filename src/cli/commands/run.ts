/**
 * `forelight run`: one pass now over the newest inputs. `--dry-run`: the same pass on a copy of the ledger, printing
 * what it would issue; it takes no lock and writes no status file (nothing is stored or sent).
 */
import { runOnce, type RunOutcome } from '../../pipeline/run-once.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { acquireLock } from '../../schedule/lock-file.ts';
import { servicePaths } from '../../schedule/run-service.ts';
import { computeNextRuns } from '../../core/next-runs.ts';
import { makeRunReport, nextStatus, readStatus, writeStatus, type RunReport } from '../../schedule/status-file.ts';
import type { Config } from '../../config/types.ts';
import { describeError } from '../../core/errors.ts';
import { stringOption, type ParsedArgs } from '../args.ts';
import { connectCluster } from '../../cluster/coordinator.ts';
import { commandContext } from '../context.ts';
import { startProgress } from '../progress.ts';
import type { RunContext } from '../../core/run-context.ts';

/** A lock older than this is stale even if its process still lives (same as the service's default). */
const LOCK_MAX_AGE_SECONDS = 6 * 3600;

/**
 * The status file `forelight status` reads, updated after a manual run as after a scheduled one. It is one output
 * among others: a failure is printed with the path and the fix, and never hides the run's own result.
 */
function recordStatus(config: Config, report: RunReport): boolean {
  const { statusPath } = servicePaths(config);
  const nextRun = computeNextRuns(config.schedule.cron, config.schedule.timezone, new Date(), 1)[0]?.toISOString() ?? null;
  try {
    writeStatus(
      statusPath,
      nextStatus(readStatus(statusPath), { cron: config.schedule.cron, timezone: config.schedule.timezone, nextRun }, report),
    );
    return true;
  } catch (err) {
    process.stderr.write(`forelight: status file not updated: ${describeError(err)}\n`);
    return false;
  }
}

function printOutcome(outcome: RunOutcome): void {
  process.stdout.write(outcome.summary + '\n');
  for (const p of outcome.problems ?? []) process.stderr.write(`forelight: input problem: ${p}\n`);
  for (const c of outcome.contradictions ?? [])
    process.stderr.write(`forelight: error: bulletin contradiction (a bug in Forelight, report it with run.json): ${c}\n`);
}

/** A rehearsal reads like a run but holds no lock and leaves the status file as it was. */
async function dryRun(args: ParsedArgs, config: Config, run: RunContext): Promise<number> {
  const outcome = await runOnce({ config, run, mode: 'live', force: args.options.force === true });
  printOutcome(outcome);
  return outcome.exitCode;
}

export async function runCommand(args: ParsedArgs): Promise<number> {
  const { config, run: context } = await commandContext(args, 'run');
  const run = { ...context, dryRun: args.options['dry-run'] === true };
  if (run.dryRun) return dryRun(args, config, run);
  const { lockPath } = servicePaths(config);
  const got = acquireLock(lockPath, { maxAgeSeconds: LOCK_MAX_AGE_SECONDS });
  if (!got.acquired) {
    const holder = got.holder ? `process ${got.holder.pid} on ${got.holder.host} since ${got.holder.startedAt}` : 'another process';
    process.stderr.write(
      `forelight: another run holds ${lockPath} (${holder}) — wait for it, or remove the file if that process is gone\n`,
    );
    return EXIT.locked;
  }
  const startedAt = new Date();
  const url = stringOption(args, 'cluster');
  const cluster = url ? await connectCluster(url, { log: run.log, cacheDir: config.calibration.cacheDir }) : null;
  try {
    const outcome = await runOnce({
      config,
      run,
      mode: 'live',
      force: args.options.force === true,
      readers: cluster ?? undefined,
      onStartReduced: startProgress(run),
    });
    const recorded = recordStatus(config, makeRunReport('manual', startedAt, new Date(), outcome.exitCode, outcome.summary));
    printOutcome(outcome);
    return !recorded && outcome.exitCode === EXIT.ok ? EXIT.deliveryFailed : outcome.exitCode;
  } catch (err) {
    recordStatus(config, makeRunReport('manual', startedAt, new Date(), EXIT.unexpected, describeError(err)));
    throw err;
  } finally {
    got.lock.release();
    await cluster?.close();
  }
}
