/**
 * One unattended pass: resolve inputs → ledger run (once per forecast key) → analyse → decide → render →
 * store everything in the ledger BEFORE sending → deliver → finish. A crash at any point is resumed by the
 * next start: bulletins already stored are sent exactly to the recipients that have not had them.
 * A dry run (`run.dryRun`) takes the same path on an in-memory copy of the ledger and stops before any output:
 * no archive, no region maps, no delivery, no operator notice; it reports what it would have issued instead.
 */
import { dirname } from 'node:path';
import { sweepStaleTemps } from '../core/write-atomic.ts';
import type { ArchiveEntry } from '../render/archive.ts';
import type { Config } from '../config/types.ts';
import { deliverPending, type DeliverOptions } from '../deliver/deliver-pending.ts';
import { sendOperatorNotice } from '../deliver/operator-notice.ts';
import { formatDiagnostic, isBulletinContradiction, type Diagnostic } from '../core/diagnostics.ts';
import { describeError } from '../core/errors.ts';
import { runDiagnostics } from '../ledger/diagnostics.ts';
import { hasBulletins } from '../ledger/bulletins.ts';
import { pendingDeliveries } from '../ledger/deliveries.ts';
import { openConfiguredLedger } from '../ledger/ledger-target.ts';
import { ledgerWriteFault, openLedgerCopy } from '../ledger/open-ledger.ts';
import { beginRun, finishRun } from '../ledger/runs.ts';
import type { Logger } from '../core/log.ts';
import type { RunContext } from '../core/run-context.ts';
import { EXIT, exitCodeForDeliveries, type ExitCode } from '../core/exit-codes.ts';
import { analyse, type AnalyseOptions, type Readers } from './analyse.ts';
import { dryRunReport } from './dry-run-report.ts';
import { resolveInputs, type SourceInputs } from './inputs.ts';
import { prepareRun, type NotifyOperators, type Prepared } from './prepare-run.ts';
import { writeRegionMaps } from './region-maps.ts';
import { publishArchive } from './publish.ts';

export interface RunOptions {
  readonly config: Config;
  /** Issue date, clock, logger and stop signal; the run id is filled in once the ledger registers the run. */
  readonly run: RunContext;
  readonly mode: 'live' | 'exercise';
  readonly force?: boolean;
  /** Passed to delivery (fault injection in tests). */
  readonly deliver?: DeliverOptions;
  /** How input files are read and hindcast starts reduced (default: in this process; `--cluster`: by the cluster's workers). */
  readonly readers?: Readers;
  /** Progress of a first-time climate build (the command's progress bar or JSON lines). */
  readonly onStartReduced?: AnalyseOptions['onStartReduced'];
}

export interface RunOutcome {
  readonly exitCode: ExitCode;
  readonly summary: string;
  readonly runId: number | null;
  /** Every input problem of the run, one line each (file, variable, region, reason and fix), for the terminal. */
  readonly problems?: readonly string[];
  /** Statements of the run's bulletins that disagree (a bug in Forelight, not an input problem), one line each. */
  readonly contradictions?: readonly string[];
}

/** A run's diagnostics (also those of an interrupted start): input problems apart from bulletin contradictions. */
function runFindings(found: readonly Diagnostic[]): { problems: Diagnostic[]; contradictions: Diagnostic[] } {
  return { problems: found.filter((d) => !isBulletinContradiction(d)), contradictions: found.filter(isBulletinContradiction) };
}

/** The forecasts a run would issue, e.g. "short 2026-11-30, subseasonal 2026-11-30, seasonal 2026-11-26". */
export function forecastKey(inputs: readonly SourceInputs[]): string {
  return inputs.map((i) => `${i.source.id} ${i.date ?? 'none'}`).join(', ');
}

/** The archive site is one output among others: a folder that cannot be written is reported, never stops delivery. */
async function publishOrReport(config: Config, entry: ArchiveEntry | null, log: Logger): Promise<string | null> {
  if (!entry) return null;
  try {
    await writeRegionMaps(config, log);
    const index = publishArchive(config, entry);
    log.info('archive written', { stage: 'render', archive: index });
    return null;
  } catch (err) {
    log.error('archive not written; the bulletins are delivered anyway', { stage: 'render', error: describeError(err) });
    return `archive: ${describeError(err)}`;
  }
}

/** Removes temporary files that a process killed mid-write left in the output folders. */
function sweepOutputs(config: Config, log: Logger): void {
  const folders: [string, boolean][] = [
    [config.delivery.outbox, false],
    [config.delivery.archive, true],
    [dirname(config.ledger), false],
  ];
  if (config.calibration.cacheDir) folders.push([config.calibration.cacheDir, false]);
  const removed = folders.flatMap(([dir, recursive]) => sweepStaleTemps(dir, recursive));
  if (removed.length > 0) log.warn('removed temporary files left by an interrupted write', { files: removed });
}

/** `write()`, with a failure of the ledger's disk said as one line naming the ledger and the fix. */
function withLedgerFault<T>(path: string, write: () => T): T {
  try {
    return write();
  } catch (err) {
    throw ledgerWriteFault(path, err);
  }
}

/** Mails the operators; a dry run only collects what it would have told them. */
function operatorNotifier(options: RunOptions, log: Logger, wouldNotify: string[]): NotifyOperators {
  return async (subject, text, diagnostics) => {
    if (options.run.dryRun) wouldNotify.push(subject);
    else await sendOperatorNotice(options.config.delivery, subject, text, { log, env: options.deliver?.env, diagnostics });
  };
}

export async function runOnce(options: RunOptions): Promise<RunOutcome> {
  const { config } = options;
  const { issueDate, log, dryRun } = options.run;
  const wouldNotify: string[] = [];
  const notify = operatorNotifier(options, log, wouldNotify);
  const resolved = await resolveInputs(config, issueDate);
  if (resolved.every((i) => i.candidates.length === 0)) {
    const text = `No forecast file of any source was found on or before ${issueDate}. No bulletin was issued; earlier advice was not re-sent.`;
    await notify(`no forecast data for ${issueDate}`, text);
    return { exitCode: EXIT.nothingNew, summary: dryRun ? `dry run: ${text}` : text, runId: null };
  }
  if (!dryRun) sweepOutputs(config, log);
  // Unusable is the same as late: the run's key names the forecasts actually used (older ones when newer were unusable).
  const analysis = await analyse(config, options.run, { inputs: resolved, ...options.readers, onStartReduced: options.onStartReduced });
  const key = forecastKey(analysis.inputs);
  const ledger = dryRun ? openLedgerCopy(config.ledger, { now: options.run.now }) : openConfiguredLedger(config, { now: options.run.now });
  try {
    const begun = withLedgerFault(config.ledger, () => beginRun(ledger, key, { force: options.force }));
    if (begun.kind === 'already-issued') {
      const text = `The newest forecasts (${key}) were already issued in run ${begun.run.id}; nothing new was sent. Use --force to issue them again.`;
      await notify(`nothing new for ${issueDate}`, text, analysis.problems);
      // A damaged newer file is an input problem even when the older forecast used was already issued.
      return {
        exitCode: analysis.problems.length > 0 ? EXIT.inputProblem : EXIT.nothingNew,
        summary: dryRun ? `dry run: ${text}` : text,
        runId: begun.run.id,
        problems: analysis.problems.map(formatDiagnostic),
      };
    }
    const runId = begun.run.id;
    const rlog = log.child({ runId });
    let prepared: Prepared | null = null;
    try {
      if (begun.kind === 'resumed' && hasBulletins(ledger, runId)) rlog.warn('resuming an interrupted run: sending what was not yet sent');
      else prepared = await prepareRun({ ...options, run: { ...options.run, runId, log: rlog }, ledger, runId, analysis, notify });
    } catch (err) {
      const fault = ledgerWriteFault(config.ledger, err);
      try {
        finishRun(ledger, runId, 'failed', describeError(fault));
      } catch {
        // the ledger itself refuses writes: the run stays open and is resumed next time
      }
      throw fault;
    }
    if (dryRun) {
      const { problems, contradictions } = runFindings(runDiagnostics(ledger, runId));
      if (contradictions.length > 0) wouldNotify.push(`bulletin contradiction in the run of ${issueDate}`);
      if (problems.length > 0) wouldNotify.push(`input problems in the run of ${issueDate}`);
      const summary = dryRunReport({ config, issueDate, key, prepared, pending: pendingDeliveries(ledger, runId), wouldNotify });
      const exitCode = contradictions.length > 0 ? EXIT.contradiction : problems.length > 0 ? EXIT.inputProblem : EXIT.ok;
      return {
        exitCode,
        summary,
        runId: null,
        problems: problems.map(formatDiagnostic),
        contradictions: contradictions.map(formatDiagnostic),
      };
    }
    const outputProblems = [await publishOrReport(config, prepared?.archive ?? null, rlog)].filter((p): p is string => p !== null);
    const sent = await deliverPending(ledger, config.delivery, rlog, { ...options.deliver, runId });
    if (outputProblems.length > 0) {
      await notify(
        `outputs not written for ${issueDate}`,
        `Run ${runId} (${key}) delivered its bulletins, but these outputs could not be written:\n\n${outputProblems.map((p) => `- ${p}`).join('\n')}\n`,
      );
    }
    const deliveryCode = exitCodeForDeliveries(sent, config.delivery.smtp !== null);
    const outputCode = outputProblems.length > 0 ? EXIT.deliveryFailed : EXIT.ok;
    const found = runDiagnostics(ledger, runId); // also those of the interrupted start
    const { problems, contradictions } = runFindings(found);
    const status = found.length > 0 || deliveryCode !== EXIT.ok || outputCode !== EXIT.ok ? 'partial' : 'ok';
    finishRun(ledger, runId, status, outputProblems.length > 0 ? outputProblems.join(' | ') : undefined);
    const summary =
      `issued ${key}: ${sent.sent} sent, ${sent.outbox} to the outbox, ${sent.failed} failed, ${sent.pending} pending; ${problems.length} input problem(s)` +
      (contradictions.length > 0
        ? `; ${contradictions.length} bulletin contradiction(s), a bug in Forelight: report it with run.json`
        : '') +
      (outputProblems.length > 0 ? `; ${outputProblems.length} output problem(s): ${outputProblems.join(' | ')}` : '');
    if (contradictions.length > 0) rlog.error(summary, { stage: 'deliver' });
    else rlog.info(summary, { stage: 'deliver' });
    if (contradictions.length > 0) {
      await notify(
        `bulletin contradiction in the run of ${issueDate}`,
        `Run ${runId} (${key}) was delivered, but its bulletins contain statements that disagree. This is a bug in Forelight, not a problem of the input data: report it with run.json of the run. The bulletins went out as rendered.`,
        contradictions,
      );
    }
    if (problems.length > 0) {
      await notify(
        `input problems in the run of ${issueDate}`,
        `Run ${runId} (${key}) was issued with these input problems; the bulletins say what is missing or which older forecast they are based on.`,
        problems,
      );
    }
    // Recipients without their bulletin first, then a bug in what was sent, then missing inputs (README, exit codes).
    const exitCode =
      deliveryCode !== EXIT.ok
        ? deliveryCode
        : outputCode !== EXIT.ok
          ? outputCode
          : contradictions.length > 0
            ? EXIT.contradiction
            : problems.length > 0
              ? EXIT.inputProblem
              : EXIT.ok;
    return { exitCode, summary, runId, problems: problems.map(formatDiagnostic), contradictions: contradictions.map(formatDiagnostic) };
  } finally {
    ledger.close();
  }
}
