/**
 * Read stage of a run: forecasts and observations → region series, one pass per file (hindcasts are read start by
 * start for the climate build, hindcast-starts.ts). A file that fails is reported (with its path) and the others go
 * on; the run states what it skipped and why.
 */
import type { Config } from '../config/types.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import { extractRegionSeries, type Extractor } from '../read/extract.ts';
import type { RegionQuantities } from '../types.ts';
import { readFile, type SourceRead } from './read-file.ts';
import { readRegions } from '../config/region-views.ts';
import type { SourceInputs } from './inputs.ts';
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
 * later, per source, only when the model-climate cache misses (`reduceStarts`).
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
