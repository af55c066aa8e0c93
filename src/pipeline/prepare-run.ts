/**
 * The part of a run that computes, stores and renders its bulletins (nothing is sent here): the input files and
 * their checksums, the decision against the ledger's stage history, the bulletins and CAP alerts, and the
 * consistency check of what was rendered. A dry run does the same on an in-memory copy of the ledger.
 */
import { existsSync } from 'node:fs';
import type { Config } from '../config/types.ts';
import { formatDiagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { ForelightError } from '../core/errors.ts';
import type { Logger } from '../core/log.ts';
import type { RunContext } from '../core/run-context.ts';
import { diffStages, type RegionStageLike } from '../decide/diff.ts';
import { parseStageHistory } from '../decide/history.ts';
import type { RegionStage, StageChange } from '../decide/types.ts';
import { recordBulletins } from '../ledger/bulletins.ts';
import { recordDiagnostics } from '../ledger/diagnostics.ts';
import type { Ledger } from '../ledger/open-ledger.ts';
import {
  lastIssuedStages,
  latestStageHistory,
  previousCapAlert,
  recordCapAlert,
  recordDecisions,
  recordProbabilities,
  saveStageHistory,
} from '../ledger/results.ts';
import { describeInputFile, recordInputs } from '../ledger/runs.ts';
import type { ArchiveEntry } from '../render/archive.ts';
import type { PreviousIssue } from '../render/model.ts';
import { renderBulletins } from '../render/render-bulletins.ts';
import type { StageDecision } from '../decision-types.ts';
import { saveChecksums, type Analysis } from './analyse.ts';
import { buildBulletinRun, highestStageId, issuedRegionStages } from './bulletin-run.ts';
import { decideAnalysis } from './decide-now.ts';

/** Tells the operators (a real run mails them; a dry run only lists what it would have said). */
export type NotifyOperators = (subject: string, text: string, diagnostics?: readonly Diagnostic[]) => Promise<void>;

export interface PrepareInput {
  readonly config: Config;
  readonly run: RunContext;
  readonly mode: 'live' | 'exercise';
  readonly ledger: Ledger;
  readonly runId: number;
  readonly analysis: Analysis;
  readonly notify: NotifyOperators;
}

export interface Prepared {
  readonly bulletins: number;
  readonly archive: ArchiveEntry;
  /** Region stages of the last issued bulletin before this run, and this run's, with its decisions. */
  readonly previous: readonly RegionStageLike[];
  readonly regionStages: readonly RegionStage[];
  readonly decisions: readonly StageDecision[];
  readonly changes: readonly StageChange[];
  readonly contradictions: readonly Diagnostic[];
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
  const seen = new Set<string>(); // a hindcast file of several starts is one input, recorded with its first start
  for (const [path, source, referenceTime] of wanted) {
    if (seen.has(path)) continue;
    seen.add(path);
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
export async function prepareRun(input: PrepareInput): Promise<Prepared> {
  const { config, run: context, ledger, runId, analysis } = input;
  const { issueDate, log } = context;
  recordDiagnostics(ledger, runId, analysis.problems);
  if (analysis.read.sources.length === 0) {
    const text = `No forecast of any source could be read for ${issueDate}. No bulletin was issued; earlier advice was not re-sent.`;
    await input.notify(`no forecast could be read for ${issueDate}`, text, analysis.problems);
    throw new ForelightError(
      'read',
      'no-forecast-read',
      `no forecast could be read: ${analysis.problems.map(formatDiagnostic).join(' | ')}`,
      'fix the files named above (or sources[].forecast-files in the config) and run again; nothing was issued',
    );
  }
  await recordInputFiles(ledger, runId, analysis, config, log);
  const history = parseStageHistory(latestStageHistory(ledger, runId));
  const decided = decideAnalysis(config, analysis, history);
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
    mode: input.mode,
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
  return {
    bulletins: rendered.bulletins.length,
    archive: rendered.archive,
    previous,
    regionStages: decided.regionStages,
    decisions: decided.decisions,
    changes: diffStages(previous, decided.regionStages, decided.decisions),
    contradictions: rendered.contradictions,
  };
}
