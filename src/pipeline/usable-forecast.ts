/**
 * Unusable is the same as late: per source, the forecast files within the look-back are tried newest first, and
 * the first usable one is used, exactly as when the newest file is missing ("based on the forecast of <date>").
 * A file is unusable when it cannot be opened or decoded (empty, a folder, truncated, bad header), when one of the
 * source's variables cannot be read for any region (renamed, no units...), when no region has a value, or when its
 * grid differs from the hindcasts' (regions covering other cells). Every file skipped is an input problem naming
 * the file and why. Regions without cells or without values in the file used are problems too; their tier is then
 * held by the decide stage.
 */
import { readRegions } from '../config/region-views.ts';
import type { Config } from '../config/types.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import type { RegionQuantities } from '../types.ts';
import { hindcastsFor, type ForecastCandidate, type SourceInputs } from './inputs.ts';
import { hindcastRequest } from './hindcast-list.ts';
import type { Extractor } from '../read/extract.ts';
import { readInputFiles, regionCells, type SourceRead } from './read-file.ts';
import { entriesOf } from '../core/typed-entries.ts';

export interface UsableForecast {
  readonly read: SourceRead;
  /** The inputs of the file used (date, path and the hindcast window of that date). */
  readonly input: SourceInputs;
}

/** Why a read file cannot stand for its source, or null when it can (regions it lacks are reported, not fatal). */
function whyUnusable(source: SourceInputs['source'], series: RegionQuantities): string | null {
  if (series.size === 0) return 'no region has a usable value in it';
  const wanted = entriesOf(source.variables).map(([q]) => q);
  const lacking = wanted.filter((q) => ![...series.values()].some((byQ) => byQ.has(q)));
  if (lacking.length > 0) return `${lacking.map((q) => `'${source.variables[q]}' (${q})`).join(', ')} could not be read for any region`;
  return null;
}

/** Regions whose cell count differs from the first hindcast's (another grid); null when there is no hindcast to compare. */
async function gridMismatch(
  config: Config,
  input: SourceInputs,
  series: RegionQuantities,
  problems: ForelightError[],
  extract: Extractor,
): Promise<string[] | null> {
  const first = input.hindcasts.find((h) => !h.refused);
  if (!first) return null;
  const [quantity, variable] = entriesOf(input.source.variables)[0];
  const hindcast = await readInputFiles(
    extract,
    first.files,
    { [quantity]: variable },
    readRegions(config),
    { ...hindcastRequest(first, input.source), weightsCacheDir: config.calibration.cacheDir, population: config.population },
    problems,
  );
  if (!hindcast) return null;
  const theirs = regionCells(hindcast);
  return [...regionCells(series)].filter(([region, cells]) => theirs.has(region) && theirs.get(region) !== cells).map(([region]) => region);
}

/** The newest usable forecast of one source within its candidates; null when none is usable. */
export async function readUsableForecast(
  config: Config,
  issueDate: string,
  input: SourceInputs,
  problems: ForelightError[],
  extract: Extractor,
): Promise<UsableForecast | null> {
  const tried: string[] = [];
  for (const candidate of input.candidates) {
    const notes: string[] = [];
    const series = await readInputFiles(
      extract,
      candidate.files,
      input.source.variables,
      readRegions(config),
      {
        referenceTime: candidate.date,
        tier: input.source.tier,
        notes,
        weightsCacheDir: config.calibration.cacheDir,
        population: config.population,
      },
      problems,
    );
    const at = await candidateInputs(config, input, candidate, issueDate);
    let why = series === null ? 'it could not be read (see above)' : whyUnusable(input.source, series);
    if (series && why === null) {
      const differ = await gridMismatch(config, at, series, problems, extract);
      if (differ && differ.length === series.size) why = `its grid differs from the hindcasts' (${differ.join(', ')} cover other cells)`;
      else if (differ) {
        for (const region of differ) {
          series.delete(region);
          problems.push(
            new InputError(
              'forecast-grid',
              candidate.path,
              `region '${region}' covers other grid cells than in the hindcasts`,
              `provide forecasts and hindcasts of source '${input.source.id}' on one grid; this region's ${input.source.tier} part is held`,
            ),
          );
        }
      }
    }
    if (series && why === null) {
      if (tried.length > 0) {
        problems.push(
          new InputError(
            'forecast-fallback',
            candidate.path,
            `used instead of the newer ${tried.join(', ')} of source '${input.source.id}'`,
            'replace the damaged file(s); the bulletin says it is based on this older forecast',
          ),
        );
      }
      return {
        read: {
          source: input.source,
          date: candidate.date,
          path: candidate.path,
          files: candidate.files.existing,
          stale: at.stale,
          referenceTime: `${candidate.date}T00:00:00Z`,
          series,
          notes,
        },
        input: at,
      };
    }
    if (series !== null)
      problems.push(
        new InputError(
          'forecast-unusable',
          candidate.path,
          `cannot be used for source '${input.source.id}': ${why}`,
          'replace the file; an older forecast within the look-back is used meanwhile',
        ),
      );
    tried.push(`${candidate.path} (${candidate.date})`);
  }
  return null;
}

async function candidateInputs(
  config: Config,
  input: SourceInputs,
  candidate: ForecastCandidate,
  issueDate: string,
): Promise<SourceInputs> {
  return {
    ...input,
    date: candidate.date,
    path: candidate.path,
    stale: candidate.date !== issueDate,
    hindcasts: await hindcastsFor(config, input.source, candidate.date),
  };
}
