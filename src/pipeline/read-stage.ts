/**
 * Read stage of a run: forecasts, hindcasts and observations → region series, one pass per file. A file that
 * fails is reported (with its path) and the others go on; the run states what it skipped and why.
 */
import type { Config, RegionConfig, SourceConfig } from '../config/types.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import { extractRegionSeries, type Extractor } from '../read/extract.ts';
import type { HindcastRead, RegionQuantities } from '../types.ts';
import { readFile, readInputFiles, regionCells, type FileRequest, type SourceRead } from './read-file.ts';
import { readRegions } from '../config/region-views.ts';
import type { SourceInputs } from './inputs.ts';
import { hindcastRequest, type HindcastFile } from './hindcast-list.ts';
import { addDays } from '../core/iso-dates.ts';
import { forecastPath } from '../schedule/input-arrival.ts';
import { readUsableForecast } from './usable-forecast.ts';

export interface ReadResult {
  readonly sources: readonly SourceRead[];
  /** Per source, the inputs of the forecast used (an older one when newer ones were unusable) or, without one, as resolved. */
  readonly inputs: readonly SourceInputs[];
  readonly observed: RegionQuantities | null;
  /** Every file, variable or region that could not be read, as one-line messages. */
  readonly problems: readonly ForelightError[];
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
 * Reads the hindcast files of one source (each file's problems collected, the others go on). With the forecast's
 * cells per region, a hindcast on another grid (a region covering another number of cells) is left out for that
 * region with a message, so its leads are not calibrated on a different grid.
 */
export async function readHindcasts(
  source: SourceConfig,
  files: readonly HindcastFile[],
  regions: readonly RegionConfig[],
  problems: ForelightError[],
  forecastCells?: ReadonlyMap<string, number>,
  extract: Extractor = extractRegionSeries,
  weights: Pick<FileRequest, 'weightsCacheDir' | 'population'> = {},
): Promise<HindcastRead[]> {
  const out: HindcastRead[] = [];
  // Problems are kept per file and appended in file order, so a parallel read reports as a sequential one.
  const read = await inOrder(files, extract.parallel ?? 1, async (h) => {
    const own: ForelightError[] = h.refused ? [h.refused] : [];
    if (h.refused) return { series: null, own };
    return {
      series: await readInputFiles(extract, h.files, source.variables, regions, { ...hindcastRequest(h, source), ...weights }, own),
      own,
    };
  });
  const said = new Set<string>(); // the starts of one file share its problems: each said once
  for (const [i, h] of files.entries()) {
    const { series, own } = read[i];
    for (const p of own) if (!said.has(p.message)) (problems.push(p), said.add(p.message));
    if (!series) continue;
    for (const [region, cells] of regionCells(series)) {
      const expected = forecastCells?.get(region);
      if (expected === undefined || expected === cells) continue;
      series.delete(region);
      problems.push(
        new InputError(
          'hindcast-grid',
          h.path,
          `region '${region}' covers ${cells} grid cells here but ${expected} in the forecast: the hindcast grid differs`,
          `provide hindcasts of source '${source.id}' on the forecast's grid; this region's leads are not calibrated on them`,
        ),
      );
    }
    out.push({ year: h.year, start: h.start, path: h.path, series });
  }
  return out;
}

/** No forecast within the look-back: names the pattern and the dates tried (issue date back to look-back-days before). */
function forecastMissing(input: SourceInputs): InputError {
  const { source, issueDate } = input;
  const oldest = addDays(issueDate, -source.lookbackDays);
  const on = (date: string) => source.forecast.map((p) => forecastPath(p, date)).join(' + ');
  return new InputError(
    'forecast-missing',
    source.forecast[0],
    `no forecast of source '${source.id}': tried ${on(issueDate)} and every date back to ${on(oldest)} (${issueDate} to ${oldest}, look-back-days ${source.lookbackDays})`,
    'check that the files arrived and the forecast-files pattern of this source; a source issued less often needs a larger look-back-days',
  );
}

/**
 * Reads every source's forecast and the observations, collecting problems instead of stopping. Hindcasts are read
 * later, per source, only when the model-climate cache misses (`readHindcasts`).
 */
export async function readAll(
  config: Config,
  issueDate: string,
  inputs: readonly SourceInputs[],
  extract: Extractor = extractRegionSeries,
): Promise<ReadResult> {
  const problems: ForelightError[] = [];
  const sources: SourceRead[] = [];
  const used: SourceInputs[] = [];
  for (const input of inputs) {
    if (input.candidates.length === 0) {
      problems.push(forecastMissing(input));
      used.push(input);
      continue;
    }
    const usable = await readUsableForecast(config, issueDate, input, problems, extract);
    if (!usable) {
      problems.push(forecastMissing(input));
      used.push({ ...input, date: null, path: null, stale: true });
      continue;
    }
    sources.push(usable.read);
    used.push(usable.input);
  }
  const observed = config.observations
    ? await readFile(
        extract,
        config.observations.path,
        config.observations.variables,
        readRegions(config),
        { weightsCacheDir: config.calibration.cacheDir, population: config.population },
        problems,
      )
    : null;
  return { sources, inputs: used, observed, problems };
}
