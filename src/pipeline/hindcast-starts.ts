/**
 * First-time climate build, one hindcast start at a time: each start of a source is read, checked against the
 * forecast's grid and reduced to lead values (calibrate/start-reduction.ts) by a `StartReducer`, in this process or
 * by a cluster's workers (one job per start, src/cluster/). A `StartRequest` is plain JSON and holds everything the
 * reduction depends on besides the files' contents, so it keys the job together with the files' checksums.
 */
import { readRegions } from '../config/region-views.ts';
import type { Config, SourceConfig } from '../config/types.ts';
import { InputError, type ForelightError } from '../core/errors.ts';
import { regionClimatology } from '../calibrate/indicator-context.ts';
import { reduceStart, type ObservedContext, type StartReduction } from '../calibrate/start-reduction.ts';
import type { IndicatorClimatology } from '../indicators/compute.ts';
import type { Extractor } from '../read/extract.ts';
import type { HindcastRead, RegionQuantities } from '../types.ts';
import { hindcastRequest, type HindcastFile } from './hindcast-list.ts';
import { readInputFiles, regionCells } from './read-file.ts';

/** The part of the configuration a start's read and reduction use (all of it JSON). */
export type StartConfig = Pick<Config, 'regions' | 'indicators' | 'observations'> & {
  readonly population: Config['population'] | null;
  readonly weightsCacheDir: string;
};

export interface StartRequest {
  readonly config: StartConfig;
  readonly source: Pick<SourceConfig, 'id' | 'tier' | 'variables'>;
  readonly start: {
    readonly year: number;
    readonly start: string;
    readonly path: string;
    readonly files: readonly string[];
    /** The start's reference time (from its path, or from the file). */
    readonly referenceTime: string;
    /** In a file holding several starts: this start's index along the reference-time dimension. */
    readonly startIndex?: number;
  };
  /** Files per variable and pattern, in member order (split-files.ts `InputFiles.byVariable`). */
  readonly byVariable: readonly (readonly [string, readonly (readonly string[])[]])[];
  /** Grid cells of each region in the forecast: a region covering another number here is left out (another grid). */
  readonly forecastCells: readonly (readonly [string, number])[];
}

export interface StartOutcome {
  /** Null when the start could not be read at all. */
  readonly reduction: StartReduction | null;
  /** The start's problems, in the order a read in this process meets them. */
  readonly problems: readonly ForelightError[];
}

/** Reduces one hindcast start; `parallel`: how many the build may keep in flight (1 when absent). */
export interface StartReducer {
  (request: StartRequest): Promise<StartOutcome>;
  readonly parallel?: number;
}

export function startConfig(config: Config): StartConfig {
  const { regions, indicators, observations, population } = config;
  return { regions, indicators, observations, population: population ?? null, weightsCacheDir: config.calibration.cacheDir };
}

function startOf(h: HindcastFile, source: SourceConfig): Pick<StartRequest['start'], 'referenceTime' | 'startIndex'> {
  const { referenceTime, startIndex } = hindcastRequest(h, source);
  return { referenceTime: referenceTime ?? h.start, ...(startIndex !== undefined ? { startIndex } : {}) };
}

export function startRequest(config: Config, source: SourceConfig, h: HindcastFile, forecast: RegionQuantities): StartRequest {
  return {
    config: startConfig(config),
    source: { id: source.id, tier: source.tier, variables: source.variables },
    start: { year: h.year, start: h.start, path: h.path, files: h.files.existing, ...startOf(h, source) },
    byVariable: [...h.files.byVariable],
    forecastCells: [...regionCells(forecast)],
  };
}

/** A start's region series (null when unreadable), regions on another grid than the forecast's left out with a problem. */
export async function readStart(extract: Extractor, request: StartRequest, problems: ForelightError[]): Promise<HindcastRead | null> {
  const { config, source, start } = request;
  const files = { existing: start.files, byVariable: new Map(request.byVariable), missing: [] };
  const series = await readInputFiles(
    extract,
    files,
    source.variables,
    readRegions(config),
    {
      referenceTime: start.referenceTime,
      tier: source.tier,
      ...(start.startIndex !== undefined ? { startIndex: start.startIndex } : {}),
      weightsCacheDir: config.weightsCacheDir,
      population: config.population,
    },
    problems,
  );
  if (!series) return null;
  const expectedCells = new Map(request.forecastCells);
  for (const [region, cells] of regionCells(series)) {
    const expected = expectedCells.get(region);
    if (expected === undefined || expected === cells) continue;
    series.delete(region);
    problems.push(
      new InputError(
        'hindcast-grid',
        start.path,
        `region '${region}' covers ${cells} grid cells here but ${expected} in the forecast: the hindcast grid differs`,
        `provide hindcasts of source '${source.id}' on the forecast's grid; this region's leads are not calibrated on them`,
      ),
    );
  }
  return { year: start.year, start: start.start, path: start.path, series };
}

/** The reducer of this process: each start read through `extract` and reduced against `observed`. */
export function localStartReducer(extract: Extractor, observed: ObservedContext): StartReducer {
  const reduce = async (request: StartRequest): Promise<StartOutcome> => {
    const problems: ForelightError[] = [];
    const read = await readStart(extract, request, problems);
    return { reduction: read && reduceStart(request.config, request.source.tier, read, observed), problems };
  };
  return Object.assign(reduce, { parallel: extract.parallel });
}

/** `work` over `items` with at most `parallel` in flight; results in input order. */
async function inOrder<T, R>(items: readonly T[], parallel: number, work: (item: T) => Promise<R>): Promise<R[]> {
  const out: R[] = new Array(items.length);
  let next = 0;
  const lane = async (): Promise<void> => {
    for (let i = next++; i < items.length; i = next++) out[i] = await work(items[i]);
  };
  await Promise.all(Array.from({ length: Math.max(1, Math.min(parallel, items.length)) }, lane));
  return out;
}

/**
 * `work` on every start that can be read (in start order; at most `parallel` in flight), the others' reasons given:
 * a start refused by the hindcast list (hindcast-list.ts) or missing some of its files (each missing file named, as
 * for a forecast) is not read. Problems are appended per start in start order, so a parallel or distributed build
 * reports as a sequential one, and each once: the starts of one file share its problems. `onStart` is told after
 * each start (progress).
 */
export async function eachStart<T>(
  starts: readonly HindcastFile[],
  parallel: number,
  work: (h: HindcastFile) => Promise<{ readonly value: T | null; readonly problems: readonly ForelightError[] }>,
  problems: ForelightError[],
  onStart?: (done: number, total: number) => void,
): Promise<T[]> {
  let done = 0;
  const outcomes = await inOrder(starts, parallel, async (h) => {
    const reason = h.refused ? [h.refused] : h.files.missing;
    const outcome = reason.length > 0 ? { value: null, problems: reason } : await work(h);
    onStart?.(++done, starts.length);
    return outcome;
  });
  const said = new Set<string>();
  for (const p of outcomes.flatMap((o) => o.problems)) if (!said.has(p.message)) (said.add(p.message), problems.push(p));
  return outcomes.flatMap((o) => (o.value === null ? [] : [o.value]));
}

/** Every start of `source` reduced by `reducer` for the forecast read as `forecast` (see `eachStart`). */
export function reduceStarts(
  config: Config,
  source: SourceConfig,
  starts: readonly HindcastFile[],
  forecast: RegionQuantities,
  reducer: StartReducer,
  problems: ForelightError[],
  onStart?: (done: number, total: number) => void,
): Promise<StartReduction[]> {
  const work = async (h: HindcastFile) => {
    const { reduction, problems: own } = await reducer(startRequest(config, source, h, forecast));
    return { value: reduction, problems: own };
  };
  return eachStart(starts, reducer.parallel ?? 1, work, problems, onStart);
}

/** Climatology of every configured region from the observations; a region whose observations cannot give one gets none (`onProblem`). */
export function regionClimatologies(
  config: Pick<Config, 'regions'>,
  observed: RegionQuantities | null,
  onProblem: (region: string, err: unknown) => void,
): Map<string, IndicatorClimatology> {
  return new Map(
    config.regions.map((r) => {
      try {
        return [r.id, regionClimatology(observed?.get(r.id))];
      } catch (err) {
        onProblem(r.id, err);
        return [r.id, {}];
      }
    }),
  );
}
