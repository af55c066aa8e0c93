/**
 * `forelight check` with the files at hand: a source whose `forecast-files` patterns match files, but one of
 * whose patterns (or one variable's `{var}` file) matches none, has a typo or a missing download; the problem is
 * placed at that pattern's YAML line. A source none of whose patterns match yet is only noted by the grid check
 * (src/pipeline/grid-extents.ts): its files may simply not have arrived.
 *
 * Hindcasts are an archive, not a daily arrival: once a source's forecasts are at hand, a `hindcast-files` pattern
 * matching no file would leave every lead uncalibrated, and is an error at its line; so is one without `{year}` or
 * `{date}` that matches files (no start can be told from their paths). Before any file of the source has arrived
 * (a fresh installation) the grid check's note says so (src/pipeline/grid-extents.ts).
 */
import { problem, pointerOf } from '../config/problem.ts';
import type { ConfigSourceMap } from '../config/source-map.ts';
import type { Config } from '../config/types.ts';
import { diagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { fillPattern, hasPlaceholder, matchPattern, PLACEHOLDERS } from '../core/path-patterns.ts';
import { fileVariables } from './split-files.ts';
import { newestForecastFile } from './grid-extents.ts';

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
export function hindcastPatternProblems(config: Config, sourceMap: ConfigSourceMap | undefined): Diagnostic[] {
  const out: Diagnostic[] = [];
  config.sources.forEach((source, i) => {
    const pattern = source.hindcast;
    if (pattern === undefined) return;
    const pointer = pointerOf('sources', i, 'hindcast-files');
    const found = matchPattern(pattern).length;
    const forecastsHere = newestForecastFile(source) !== null;
    const p =
      found === 0 && !forecastsHere
        ? undefined
        : found === 0
          ? problem(
              pointer,
              `source ${source.id}: hindcast-files ${pattern} matches no file, so no lead of this source can be calibrated`,
              `check the spelling and folders of hindcast-files (placeholders ${PLACEHOLDERS.map((n) => `{${n}}`).join(', ')}) and that the hindcasts are downloaded`,
            )
          : !hasPlaceholder(pattern, 'year') && !hasPlaceholder(pattern, 'date')
            ? problem(
                pointer,
                `source ${source.id}: hindcast-files ${pattern} has no {year} or {date}, so the start of its ${found} file(s) cannot be told`,
                'put {year} (with {mmdd}) or {date} where the hindcast file names carry the start date, e.g. hc/{year}/t2m_{year}{mmdd}.nc',
              )
            : undefined;
    if (p)
      out.push(
        sourceMap ? sourceMap.place('config-pattern', p) : diagnostic('config-pattern', p.message, p.fix, { file: config.file, pointer }),
      );
  });
  return out;
}
