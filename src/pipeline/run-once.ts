/**
 * One unattended pass: resolve inputs → ledger run (once per forecast key) → analyse → decide → render →
 * store everything in the ledger BEFORE sending → deliver → finish. A crash at any point is resumed by the
 * next start: bulletins already stored are sent exactly to the recipients that have not had them.
 */
import { existsSync } from 'node:fs';
import { dirname } from 'node:path';
import { sweepStaleTemps } from '../core/write-atomic.ts';
import type { ArchiveEntry } from '../render/archive.ts';
import type { Config } from '../config/types.ts';
import { decideStages } from '../decide/decide-stages.ts';
import { parseStageHistory } from '../decide/history.ts';
import { deliverPending, type DeliverOptions } from '../deliver/deliver-pending.ts';
import { sendOperatorNotice } from '../deliver/operator-notice.ts';
import { formatDiagnostic, isBulletinContradiction, type Diagnostic } from '../core/diagnostics.ts';
import { ForelightError, describeError } from '../core/errors.ts';
import { recordDiagnostics, runDiagnostics } from '../ledger/diagnostics.ts';
import { hasBulletins, recordBulletins } from '../ledger/bulletins.ts';
import { openConfiguredLedger } from '../ledger/ledger-target.ts';
import { ledgerWriteFault, type Ledger } from '../ledger/open-ledger.ts';
import type { Extractor } from '../read/extract.ts';
import {
  lastIssuedStages,
  latestStageHistory,
  previousCapAlert,
  recordCapAlert,
  recordDecisions,
  recordProbabilities,
  saveStageHistory,
} from '../ledger/results.ts';
import { beginRun, describeInputFile, finishRun, recordInputs } from '../ledger/runs.ts';
import type { Logger } from '../core/log.ts';
import type { RunContext } from '../core/run-context.ts';
import type { PreviousIssue } from '../render/model.ts';
import { renderBulletins } from '../render/render-bulletins.ts';
import { EXIT, exitCodeForDeliveries, type ExitCode } from '../core/exit-codes.ts';
import { analyse, saveChecksums, type Analysis } from './analyse.ts';
import { buildBulletinRun, highestStageId, issuedRegionStages } from './bulletin-run.ts';
import { tunedThresholds } from './decide-now.ts';
import { resolveInputs, type SourceInputs } from './inputs.ts';
import { missingData } from './missing-data.ts';
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
  /** How input files are read (default: in this process; `--cluster`: by the cluster's workers). */
  readonly extract?: Extractor;
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

/** The forecasts a run would issue, e.g. "short 2026-11-30, subseasonal 2026-11-30, seasonal 2026-11-26". */
export function forecastKey(inputs: readonly SourceInputs[]): string {
  return inputs.map((i) => `${i.source.id} ${i.date ?? 'none'}`).join(', ');
}

async function recordInputFiles(
  ledger: Ledger,
  runId: number,
  analysis: Analysis,
  config: Pick<Config, 'observations'>,
  log: Logger,
): Promise<void> {
  const wanted: [path: string, source: string, referenceTime: string][] = [
    ...analysis.read.sources.flatMap((s) => s.files.map((f): [string, string, string] => [f, s.source.id, s.referenceTime])),
    ...analysis.inputs.flatMap((i) =>
      i.hindcasts.flatMap((h) =>
        h.files.existing.map((f): [string, string, string] => [f, `${i.source.id} hindcast`, `${h.start}T00:00:00Z`]),
      ),
    ),
    ...(config.observations ? [[config.observations.path, 'observations', ''] as [string, string, string]] : []),
  ];
  const files = [];
  for (const [path, source, referenceTime] of wanted) {
    // A file that cannot be read was already reported by the read stage; the ledger keeps what exists.
    if (existsSync(path)) files.push(await describeInputFile(path, source, referenceTime, (p) => analysis.checksums.sha256(p)));
  }
  await saveChecksums(analysis.checksums, log);
  recordInputs(ledger, runId, files);
}

function previousIssue(
  ledger: Ledger,
  config: Pick<Config, 'regions' | 'indicators' | 'stages'>,
  runId: number,
): PreviousIssue | undefined {
  const stages = lastIssuedStages(ledger);
  const alerts = [];
  for (const region of config.regions) {
    for (const ind of config.indicators) {
      const a = previousCapAlert(ledger, region.id, ind.id, runId);
      if (!a || a.msgType === 'Cancel') continue;
      const issued = highestStageId(
        config,
        stages.filter((s) => s.region === region.id && s.indicator === ind.id).map((s) => s.stageId),
      );
      alerts.push({ region: region.id, indicator: ind.id, sender: a.sender, id: a.identifier, sent: a.sent, stageId: issued });
    }
  }
  return stages.length > 0 ? { runId: String(stages[0].runId), alerts } : undefined;
}

/** Computes, stores and renders the bulletins of a new run (nothing is sent here). */
async function prepare(
  ledger: Ledger,
  options: RunOptions,
  runId: number,
  analysis: Analysis,
): Promise<{ bulletins: number; archive: ArchiveEntry }> {
  const { config, run: context } = options;
  const { issueDate, log } = context;
  recordDiagnostics(ledger, runId, analysis.problems);
  if (analysis.read.sources.length === 0) {
    const text = `No forecast of any source could be read for ${issueDate}. No bulletin was issued; earlier advice was not re-sent.`;
    await sendOperatorNotice(config.delivery, `no forecast could be read for ${issueDate}`, text, { log, diagnostics: analysis.problems });
    throw new ForelightError(
      'read',
      'no-forecast-read',
      `no forecast could be read: ${analysis.problems.map(formatDiagnostic).join(' | ')}`,
      'fix the files named above (or sources[].forecast-files in the config) and run again; nothing was issued',
    );
  }
  await recordInputFiles(ledger, runId, analysis, config, log);
  const history = parseStageHistory(latestStageHistory(ledger, runId));
  const decided = decideStages({
    config,
    probabilities: analysis.probabilities,
    history,
    thresholdsFromCostLoss: tunedThresholds(analysis),
    ...missingData(config, analysis),
  });
  recordProbabilities(ledger, runId, analysis.probabilities);
  recordDecisions(ledger, runId, decided.decisions);
  saveStageHistory(ledger, runId, JSON.stringify(decided.nextHistory));
  const previous = issuedRegionStages(
    config,
    lastIssuedStages(ledger).filter((s) => s.runId !== runId),
  );
  const run = buildBulletinRun({
    config,
    runId: `${issueDate}-${runId}`,
    issuedAt: context.now(),
    mode: options.mode,
    sources: analysis.read.sources,
    probabilities: analysis.probabilities,
    decisions: decided.decisions,
    regionStages: decided.regionStages,
    previous,
    notes: analysis.combination,
    problems: analysis.problems,
  });
  const rendered = await renderBulletins(config, run, previousIssue(ledger, config, runId));
  ledger.db.transaction(() => {
    for (const a of rendered.capAlerts)
      recordCapAlert(ledger, runId, a.region, a.indicator, { identifier: a.id, sender: a.sender, sent: a.sent, msgType: a.msgType });
    recordBulletins(ledger, runId, rendered.bulletins);
  })();
  // A bulletin that contradicts itself is a bug: each finding is an error in the log, the ledger and run.json.
  if (rendered.contradictions.length > 0) recordDiagnostics(ledger, runId, [...analysis.problems, ...rendered.contradictions]);
  for (const d of rendered.contradictions) log.error(formatDiagnostic(d), { stage: 'render', code: d.code });
  for (const note of rendered.notes) log.warn(note, { stage: 'render' });
  log.info('bulletins rendered and stored', {
    stage: 'render',
    bulletins: rendered.bulletins.length,
    capAlerts: rendered.capAlerts.length,
  });
  return { bulletins: rendered.bulletins.length, archive: rendered.archive };
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

export async function runOnce(options: RunOptions): Promise<RunOutcome> {
  const { config } = options;
  const { issueDate, log } = options.run;
  const resolved = resolveInputs(config, issueDate);
  if (resolved.every((i) => i.candidates.length === 0)) {
    const text = `No forecast file of any source was found on or before ${issueDate}. No bulletin was issued; earlier advice was not re-sent.`;
    await sendOperatorNotice(config.delivery, `no forecast data for ${issueDate}`, text, { log });
    return { exitCode: EXIT.nothingNew, summary: text, runId: null };
  }
  sweepOutputs(config, log);
  // Unusable is the same as late: the run's key names the forecasts actually used (older ones when newer were unusable).
  const analysis = await analyse(config, options.run, { inputs: resolved, extract: options.extract });
  const key = forecastKey(analysis.inputs);
  const ledger = openConfiguredLedger(config, { now: options.run.now });
  try {
    const begun = beginRun(ledger, key, { force: options.force });
    if (begun.kind === 'already-issued') {
      const text = `The newest forecasts (${key}) were already issued in run ${begun.run.id}; nothing new was sent. Use --force to issue them again.`;
      await sendOperatorNotice(config.delivery, `nothing new for ${issueDate}`, text, { log, diagnostics: analysis.problems });
      // A damaged newer file is an input problem even when the older forecast used was already issued.
      return {
        exitCode: analysis.problems.length > 0 ? EXIT.inputProblem : EXIT.nothingNew,
        summary: text,
        runId: begun.run.id,
        problems: analysis.problems.map(formatDiagnostic),
      };
    }
    const runId = begun.run.id;
    const rlog = log.child({ runId });
    let archive: ArchiveEntry | null = null;
    try {
      if (begun.kind === 'resumed' && hasBulletins(ledger, runId)) rlog.warn('resuming an interrupted run: sending what was not yet sent');
      else ({ archive } = await prepare(ledger, { ...options, run: { ...options.run, runId, log: rlog } }, runId, analysis));
    } catch (err) {
      const fault = ledgerWriteFault(config.ledger, err);
      try {
        finishRun(ledger, runId, 'failed', describeError(fault));
      } catch {
        // the ledger itself refuses writes: the run stays open and is resumed next time
      }
      throw fault;
    }
    const outputProblems = [await publishOrReport(config, archive, rlog)].filter((p): p is string => p !== null);
    const sent = await deliverPending(ledger, config.delivery, rlog, { ...options.deliver, runId });
    if (outputProblems.length > 0) {
      await sendOperatorNotice(
        config.delivery,
        `outputs not written for ${issueDate}`,
        `Run ${runId} (${key}) delivered its bulletins, but these outputs could not be written:\n\n${outputProblems.map((p) => `- ${p}`).join('\n')}\n`,
        { log: rlog, env: options.deliver?.env },
      );
    }
    const deliveryCode = exitCodeForDeliveries(sent, config.delivery.smtp !== null);
    const outputCode = outputProblems.length > 0 ? EXIT.deliveryFailed : EXIT.ok;
    const found: readonly Diagnostic[] = runDiagnostics(ledger, runId); // also those of the interrupted start
    const problems = found.filter((d) => !isBulletinContradiction(d));
    const contradictions = found.filter(isBulletinContradiction);
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
      await sendOperatorNotice(
        config.delivery,
        `bulletin contradiction in the run of ${issueDate}`,
        `Run ${runId} (${key}) was delivered, but its bulletins contain statements that disagree. This is a bug in Forelight, not a problem of the input data: report it with run.json of the run. The bulletins went out as rendered.`,
        { log: rlog, env: options.deliver?.env, diagnostics: contradictions },
      );
    }
    if (problems.length > 0) {
      await sendOperatorNotice(
        config.delivery,
        `input problems in the run of ${issueDate}`,
        `Run ${runId} (${key}) was issued with these input problems; the bulletins say what is missing or which older forecast they are based on.`,
        { log: rlog, env: options.deliver?.env, diagnostics: problems },
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
