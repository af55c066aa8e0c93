/**
 * Everything a run computes before deciding: inputs → read → indicators → calibrated probabilities (per
 * source, merged within each tier by the source-combination rule). Shared by `run`, `diff`, `explain` and
 * `skill`, so what they show is exactly what a run would issue.
 */
import type { Config } from '../config/types.ts';
import { openChecksumMemo, type ChecksumMemo } from '../core/file-checksums.ts';
import { combineOutcomes } from '../calibrate/combine-outcomes.ts';
import { observedContext, type CalibrateContext, type RegionCalibrator } from '../calibrate/model-climate.ts';
import { cachedClimates } from '../calibrate/skill-cache.ts';
import { forecastIndicators, forecastLeadOne, sourceProbabilities, type SourceOutcome } from '../calibrate/source-probabilities.ts';
import { formatDiagnostic, uniqueDiagnostics, type Diagnostic } from '../core/diagnostics.ts';
import { describeError, type ForelightError } from '../core/errors.ts';
import type { Logger } from '../core/log.ts';
import type { RunContext } from '../core/run-context.ts';
import type { IsoDate } from '../types.ts';
import type { LeadProbability } from '../probability-types.ts';
import { extractRegionSeries, type Extractor } from '../read/extract.ts';
import { specificHumidityNote } from '../indicators/specific-humidity.ts';
import { resolveInputs, type SourceInputs } from './inputs.ts';
import type { SourceRead } from './read-file.ts';
import { readAll, type ReadResult } from './read-stage.ts';
import { localStartReducer, reduceStarts, regionClimatologies, type StartReducer } from './hindcast-starts.ts';

export interface Analysis {
  readonly issueDate: IsoDate;
  readonly inputs: readonly SourceInputs[];
  readonly read: ReadResult;
  readonly sources: readonly SourceOutcome[];
  /** Probabilities kept after combining sources within each tier. */
  readonly probabilities: readonly LeadProbability[];
  /** The combination rule and what it dropped, for the output. */
  readonly combination: readonly string[];
  /** One diagnostic per file, region or indicator skipped, with the reason. */
  readonly problems: readonly Diagnostic[];
  /** Input file checksums remembered across runs (saved under calibration.cacheDir). */
  readonly checksums: ChecksumMemo;
}

export interface AnalyseOptions {
  /** Progress of the sources (the CLI's progress bar). */
  readonly onProgress?: (done: number, total: number, label: string) => void;
  /** The files to use, when the caller already resolved them (a run keys its ledger entry on them). */
  readonly inputs?: readonly SourceInputs[];
  /** How files are read (default: in this process; a cluster's workers with `forelight run --cluster`). */
  readonly extract?: Extractor;
  /** How each hindcast start of a first-time climate build is read and reduced (default: in this process, through `extract`). */
  readonly reduceStart?: StartReducer;
  /** How each region of a first-time climate build is calibrated (default: in this process). */
  readonly calibrateRegion?: RegionCalibrator;
  /** Progress of a first-time climate build, per hindcast start of each source. */
  readonly onStartReduced?: (source: string, done: number, total: number) => void;
}

/** How a run reads files, reduces hindcast starts and calibrates regions (this process, or a cluster's workers). */
export type Readers = Pick<AnalyseOptions, 'extract' | 'reduceStart' | 'calibrateRegion'>;

/** Reads and computes everything for the run's issue date; never throws for a bad file, region or indicator. */
export async function analyse(config: Config, run: RunContext, options: AnalyseOptions = {}): Promise<Analysis> {
  const { issueDate, log } = run;
  const { onProgress, extract = extractRegionSeries } = options;
  const inputs = options.inputs ?? (await resolveInputs(config, issueDate));
  const total = inputs.length + 1;
  onProgress?.(0, total, 'reading forecasts and observations');
  const started = Date.now(); // elapsed times for the log, not the run's clock
  const read = await readAll(config, issueDate, inputs, extract);
  log.info('read forecasts and observations', { stage: 'read', ms: Date.now() - started, sources: read.sources.length });
  const climatology = regionClimatologies(config, read.observed, (region, err) =>
    log.warn('no climatology from observations', { region, error: describeError(err) }),
  );
  const checksums = await openChecksumMemo(config.calibration.cacheDir);
  const ctx: CalibrateContext = {
    config,
    observed: read.observed,
    observationsPath: config.observations?.path ?? null,
    climatology,
    observedMemo: new Map(),
    checksums,
    calibrateRegion: options.calibrateRegion,
  };
  const fileProblems: ForelightError[] = [...read.problems];
  const reducer = options.reduceStart ?? localStartReducer(extract, observedContext(ctx));
  const sources: SourceOutcome[] = [];
  for (const s of read.sources) {
    const t0 = Date.now();
    const input = read.inputs.find((i) => i.source.id === s.source.id) as SourceInputs; // every read source comes from one of the inputs
    const onStart = options.onStartReduced && ((done: number, n: number) => options.onStartReduced?.(s.source.id, done, n));
    const outcome = await calibrateSource(config, ctx, s, input, { fileProblems, reducer, onStart });
    log.info('calibrated source', {
      stage: 'calibrate',
      source: s.source.id,
      ms: Date.now() - t0,
      fromCache: outcome.fromCache,
      probabilities: outcome.probabilities.length,
    });
    sources.push(outcome);
    onProgress?.(sources.length, total, `calibrated ${s.source.id}`);
  }
  onProgress?.(total, total, 'done');
  const { kept, notes } = combineOutcomes(sources, (source) => ({
    priority: config.sources.find((s) => s.id === source)?.priority ?? 0,
    issued: read.sources.find((s) => s.source.id === source)?.referenceTime ?? '1970-01-01T00:00:00Z',
  }));
  for (const s of sources.filter((o) => o.cacheNote)) {
    log.warn('model-climate cache', { source: s.source, note: s.cacheNote });
    notes.push(`${s.source}: ${s.cacheNote}`);
  }
  const problems = uniqueDiagnostics([...fileProblems.map((p) => p.diagnostic), ...sources.flatMap((s) => s.problems)]);
  for (const p of problems) log.warn('skipped', { code: p.code, problem: formatDiagnostic(p) });
  await saveChecksums(checksums, log);
  const timeNotes = read.sources.flatMap((s) => s.notes);
  const humidityNotes = [
    ...read.sources.flatMap((s) => specificHumidityNote(`source ${s.source.id}`, s.source.variables)),
    ...(config.observations ? specificHumidityNote('observations', config.observations.variables) : []),
  ];
  return {
    issueDate,
    inputs: read.inputs,
    read,
    sources,
    probabilities: kept,
    combination: [...notes, ...timeNotes, ...humidityNotes],
    problems,
    checksums,
  };
}

/** One source's model climate (cached, or its hindcast starts read and reduced), then its forecast's probabilities. */
async function calibrateSource(
  config: Config,
  ctx: CalibrateContext,
  read: SourceRead,
  input: SourceInputs,
  options: { fileProblems: ForelightError[]; reducer: StartReducer; onStart?: (done: number, total: number) => void },
): Promise<SourceOutcome> {
  const forecast = forecastIndicators(ctx, read);
  const model = await cachedClimates(
    ctx,
    input.source,
    input.hindcasts.map((h) => h.path),
    () => reduceStarts(config, input.source, input.hindcasts, read.series, options.reducer, options.fileProblems, options.onStart),
    (region, indicator) => forecastLeadOne(forecast, region, indicator),
  );
  return sourceProbabilities(ctx, read, model, forecast);
}

/** The checksum memo only saves work: a memo that cannot be written is logged, never stops the run. */
export async function saveChecksums(checksums: ChecksumMemo, log: Logger): Promise<void> {
  try {
    await checksums.save();
  } catch (err) {
    log.warn('input checksums not remembered (they are computed again next run)', { error: describeError(err) });
  }
}
