/**
 * `forelight check` with the files at hand: a source whose `forecast-files` patterns match files, but one of
 * whose patterns (or one variable's `{var}` file) matches none, has a typo or a missing download; the problem is
 * placed at that pattern's YAML line. A source none of whose patterns match yet is only noted by the grid check
 * (src/pipeline/grid-extents.ts): its files may simply not have arrived.
 *
 * Hindcasts are an archive, not a daily arrival: once a source's forecasts are at hand, a `hindcast-files` pattern
 * matching no file would leave every lead uncalibrated, and is an error at its line; so is one without `{year}` or
 * `{date}` that matches files (no start can be told from their paths), unless its file holds every start along a
 * reference-time dimension (read as one start per index: hindcast-list.ts). Before any file of the source has arrived
 * (a fresh installation) the grid check's note says so (src/pipeline/grid-extents.ts).
 */
import { problem, pointerOf, type ConfigProblem } from '../config/problem.ts';
import type { ConfigSourceMap } from '../config/source-map.ts';
import type { Config } from '../config/types.ts';
import { diagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { fillPattern, hasPlaceholder, matchPattern, PLACEHOLDERS } from '../core/path-patterns.ts';
import { fileVariables } from './split-files.ts';
import { newestForecastFile } from './grid-extents.ts';
import { referenceTimesOf } from '../read/time-axis.ts';
import { withDataset } from '../read/open-dataset.ts';

export function unmatchedPatterns(config: Config, sourceMap: ConfigSourceMap | undefined): Diagnostic[] {
  const out: Diagnostic[] = [];
  config.sources.forEach((source, i) => {
    const tried = source.forecast.flatMap((pattern, k) =>
      (hasPlaceholder(pattern, 'var') ? fileVariables(source) : [undefined]).map((variable) => {
        const filled = variable === undefined ? pattern : fillPattern(pattern, { var: variable });
        return { k, filled, variable, found: matchPattern(filled).length };
      }),
    );
    const matching = tried.find((t) => t.found > 0);
    if (!matching) return;
    for (const t of tried.filter((x) => x.found === 0)) {
      const pointer =
        source.forecast.length > 1 ? pointerOf('sources', i, 'forecast-files', t.k) : pointerOf('sources', i, 'forecast-files');
      const p = problem(
        pointer,
        `source ${source.id}: ${t.filled} matches no file${t.variable ? ` (for variable '${t.variable}')` : ''}, while ${matching.filled} matches ${matching.found}`,
        t.variable
          ? `check that the files of '${t.variable}' are named as the pattern says, or map the quantity to the variable name used in the file names`
          : 'check the spelling of the pattern and that these files are downloaded',
      );
      out.push(
        sourceMap ? sourceMap.place('config-pattern', p) : diagnostic('config-pattern', p.message, p.fix, { file: config.file, pointer }),
      );
    }
  });
  return out;
}

/** Problems of each source's `hindcast-files` with the files at hand: matching no file, or telling no start. */
export async function hindcastPatternProblems(config: Config, sourceMap: ConfigSourceMap | undefined): Promise<Diagnostic[]> {
  const out: Diagnostic[] = [];
  for (const [i, source] of config.sources.entries()) {
    const pattern = source.hindcast;
    if (pattern === undefined) continue;
    const pointer = pointerOf('sources', i, 'hindcast-files');
    const files = matchPattern(pattern).map((m) => m.path);
    const undated = !hasPlaceholder(pattern, 'year') && !hasPlaceholder(pattern, 'date');
    const p =
      files.length === 0
        ? newestForecastFile(source) === null
          ? undefined
          : problem(
              pointer,
              `source ${source.id}: hindcast-files ${pattern} matches no file, so no lead of this source can be calibrated`,
              `check the spelling and folders of hindcast-files (placeholders ${PLACEHOLDERS.map((n) => `{${n}}`).join(', ')}) and that the hindcasts are downloaded`,
            )
        : undated
          ? await undatedProblem(source.id, pattern, files, pointer)
          : undefined;
    if (p)
      out.push(
        sourceMap ? sourceMap.place('config-pattern', p) : diagnostic('config-pattern', p.message, p.fix, { file: config.file, pointer }),
      );
  }
  return out;
}

/** A pattern without a date placeholder: fine when its first file holds several starts (read as one start each: hindcast-list.ts). */
async function undatedProblem(id: string, pattern: string, files: readonly string[], pointer: string): Promise<ConfigProblem | undefined> {
  const ref = await withDataset(files[0], (ds) => referenceTimesOf(ds)).catch(() => null);
  if (ref && ref.timesMs.length > 1) return undefined;
  return problem(
    pointer,
    `source ${id}: hindcast-files ${pattern} has no {year} or {date}, so the start of its ${files.length} file(s) cannot be told (nor does ${files[0]} hold several starts along a reference-time dimension)`,
    'put {year} (with {mmdd}) or {date} where the hindcast file names carry the start date, e.g. hc/{year}/t2m_{year}{mmdd}.nc',
  );
}
