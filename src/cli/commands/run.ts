/**
 * `forelight run`: one pass now over the newest inputs. `--dry-run`: the same pass on a copy of the ledger, printing
 * what it would issue; it takes no lock and writes no status file (nothing is stored or sent). `--config` repeated:
 * the configurations are issued together, reading each file they share once.
 */
import { runOnce, type RunOutcome } from '../../pipeline/run-once.ts';
import { EXIT, type ExitCode } from '../../core/exit-codes.ts';
import { acquireLock } from '../../schedule/lock-file.ts';
import { servicePaths } from '../../schedule/run-service.ts';
import { computeNextRuns } from '../../core/next-runs.ts';
import { makeRunReport, nextStatus, readStatus, writeStatus, type RunReport } from '../../schedule/status-file.ts';
import type { Config } from '../../config/types.ts';
import { describeError, ForelightError } from '../../core/errors.ts';
import { stringOption, stringOptions, type ParsedArgs } from '../args.ts';
import { connectCluster } from '../../cluster/coordinator.ts';
import { issueDateOf } from '../context.ts';
import { loadConfig } from '../../config/load-config.ts';
import { createLogger } from '../../core/log.ts';
import { runContext } from '../../core/run-context.ts';
import type { Readers } from '../../pipeline/analyse.ts';
import { combinedExitCode, runSeveral } from '../../pipeline/run-several.ts';
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

/** The run's summary and problems; `label` (the configuration file) when several configurations ran together. */
function printOutcome(outcome: RunOutcome, label: string): void {
  process.stdout.write(label + outcome.summary + '\n');
  for (const p of outcome.problems ?? []) process.stderr.write(`forelight: ${label}input problem: ${p}\n`);
  for (const c of outcome.contradictions ?? [])
    process.stderr.write(`forelight: ${label}error: bulletin contradiction (a bug in Forelight, report it with run.json): ${c}\n`);
}

interface Pass {
  readonly args: ParsedArgs;
  readonly config: Config;
  readonly run: RunContext;
  readonly readers: Readers;
  readonly label: string;
}

/** A rehearsal reads like a run but holds no lock and leaves the status file as it was. */
async function dryRun({ args, config, run, readers, label }: Pass): Promise<ExitCode> {
  const outcome = await runOnce({ config, run, mode: 'live', force: args.options.force === true, readers: { extract: readers.extract } });
  printOutcome(outcome, label);
  return outcome.exitCode;
}

/** One configuration's pass under its lock, its status file updated after it. */
async function issue({ args, config, run, readers, label }: Pass): Promise<ExitCode> {
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
  try {
    const outcome = await runOnce({
      config,
      run,
      mode: 'live',
      force: args.options.force === true,
      readers,
      onStartReduced: startProgress(run),
    });
    const recorded = recordStatus(config, makeRunReport('manual', startedAt, new Date(), outcome.exitCode, outcome.summary));
    printOutcome(outcome, label);
    return !recorded && outcome.exitCode === EXIT.ok ? EXIT.deliveryFailed : outcome.exitCode;
  } catch (err) {
    recordStatus(config, makeRunReport('manual', startedAt, new Date(), EXIT.unexpected, describeError(err)));
    throw err;
  } finally {
    got.lock.release();
  }
}

/** A configuration of several whose pass failed: said with its file; the others' results stand. */
function failed(config: Config, err: unknown): ExitCode {
  process.stderr.write(`forelight: ${config.file}: ${describeError(err)}\n`);
  return err instanceof ForelightError && err.code === 'run-in-progress' ? EXIT.locked : EXIT.unexpected;
}

/**
 * `--config` may be repeated: the configurations are issued together, each with its own ledger, lock, status file
 * and outputs, and every file they share is read once (pipeline/run-several.ts).
 */
export async function runCommand(args: ParsedArgs): Promise<number> {
  const files = stringOptions(args, 'config');
  const configs: Config[] = [];
  for (const file of files.length > 0 ? files : [undefined]) configs.push(await loadConfig(file));
  const dry = args.options['dry-run'] === true;
  const url = stringOption(args, 'cluster');
  const logFor = (config: Config) => createLogger({ base: { command: 'run', ...(configs.length > 1 ? { config: config.file } : {}) } });
  const cluster = url && !dry ? await connectCluster(url, { log: logFor(configs[0]), cacheDir: configs[0].calibration.cacheDir }) : null;
  try {
    const settled = await runSeveral(configs, cluster?.readers ?? {}, (config, readers) => {
      const run = runContext({ log: logFor(config), issueDate: issueDateOf(args, config), dryRun: dry });
      const pass = { args, config, run, readers, label: configs.length > 1 ? `${config.file}: ` : '' };
      return dry ? dryRun(pass) : issue(pass);
    });
    if (configs.length === 1 && settled[0].status === 'rejected') throw settled[0].reason;
    return combinedExitCode(settled.map((r, i) => (r.status === 'fulfilled' ? r.value : failed(configs[i], r.reason))));
  } finally {
    await cluster?.close();
  }
}
