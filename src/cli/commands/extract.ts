/**
 * `forelight extract <file> --var NAME (--box S,N,W,E | --regions FILE [--id-property P] [--name-property P])
 * [--daily max|min|mean|sum] [--utc-offset H | --time-zone ZONE] [--cells overlap|centre] [--reference-time DATE] [--start K]
 * [--population RASTER [--population-variable V] [--population-values people-per-pixel|people-per-km2]] --json`:
 * prints exactly what Forelight sees in a file for one box or for every region of a boundary file, as JSON;
 * with --population the region means are weighted by the people of that raster (NetCDF or GeoTIFF). --reference-time
 * is the forecast date `run` takes from the file name: periods are then read from it and the file is checked against
 * it, as in a run. --start K reads start K of a file holding several starts along a reference-time dimension, as a
 * run reads each hindcast start of such a file. A monthly-mean file prints one value per month (times `YYYY-MM`), with or without --daily.
 */
import { resolve } from 'node:path';
import { loadBoundarySet } from '../../config/boundaries/boundary-sets.ts';
import type { CellRule, PopulationConfig } from '../../config/types.ts';
import { timeZoneProblem } from '../../core/next-runs.ts';
import { extractBoxJson } from '../../read/extract.ts';
import { extractRegionsJson } from '../../read/extract-raw.ts';
import type { DailyMethod } from '../../read/daily.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { choiceOption, stringOption, usageError, type ParsedArgs } from '../args.ts';

const DAILY: readonly DailyMethod[] = ['max', 'min', 'mean', 'sum'];
const RULES: readonly CellRule[] = ['overlap', 'centre'];
const PEOPLE_VALUES: readonly PopulationConfig['values'][] = ['people-per-pixel', 'people-per-km2'];

function populationOption(args: ParsedArgs): PopulationConfig | null {
  const file = stringOption(args, 'population');
  const variable = stringOption(args, 'population-variable');
  const values = choiceOption(args, 'population-values', PEOPLE_VALUES);
  if (file === undefined) {
    if (variable !== undefined || values !== undefined)
      throw usageError('--population-variable and --population-values need --population RASTER');
    return null;
  }
  return { file: resolve(file), values: values ?? 'people-per-pixel', ...(variable !== undefined ? { variable } : {}) };
}

function parseBox(text: string | undefined): { south: number; north: number; west: number; east: number } {
  const parts = (text ?? '').split(',').map(Number);
  if (parts.length !== 4 || parts.some((v) => !Number.isFinite(v))) {
    throw usageError(`--box needs four numbers south,north,west,east (degrees), got '${text ?? ''}'`);
  }
  const [south, north, west, east] = parts;
  if (south > north) throw usageError(`--box south ${south} is north of north ${north}: write south,north,west,east`);
  // West > east is a box across 180° (read eastwards from west), as in the YAML.
  if (west === east)
    throw usageError(`--box west ${west} equals east ${east}: the box has no width (across 180° write west > east, e.g. 172,-174)`);
  return { south, north, west, east };
}

function clockOptions(args: ParsedArgs): { utcOffsetHours: number; timeZone?: string } {
  const offsetText = stringOption(args, 'utc-offset');
  const zone = stringOption(args, 'time-zone');
  if (zone !== undefined && offsetText !== undefined) throw usageError('give --time-zone or --utc-offset, not both');
  if (zone !== undefined) {
    const issue = timeZoneProblem(zone);
    if (issue) throw usageError(`--time-zone: ${issue.message}; ${issue.fix}`);
    return { utcOffsetHours: 0, timeZone: zone };
  }
  const utcOffsetHours = offsetText === undefined ? 0 : Number(offsetText);
  if (!Number.isFinite(utcOffsetHours) || Math.abs(utcOffsetHours) > 14)
    throw usageError(`--utc-offset must be hours between -14 and 14, got '${offsetText}'`);
  return { utcOffsetHours };
}

/** `--start K`: one start of a file holding several along a reference-time dimension (0 = the first). */
function startOption(args: ParsedArgs): { startIndex?: number } {
  const text = stringOption(args, 'start');
  if (text === undefined) return {};
  if (!/^\d+$/.test(text))
    throw usageError(`--start must be a start index 0, 1, … along the file's reference-time dimension, got '${text}'`);
  return { startIndex: Number(text) };
}

async function regionsJson(
  file: string,
  variable: string,
  boundaries: string,
  args: ParsedArgs,
  daily: DailyMethod | undefined,
  cellRule: CellRule | undefined,
): Promise<object> {
  const entry = { boundaries, 'id-property': stringOption(args, 'id-property'), 'name-property': stringOption(args, 'name-property') };
  const set = await loadBoundarySet(entry, 0, process.cwd(), { ...clockOptions(args), ...(cellRule ? { cellRule } : {}) });
  if (set.problems.length > 0) throw usageError(set.problems.map((p) => `${p.message} — ${p.fix}`).join('\n'));
  const population = populationOption(args);
  const regions = population ? set.regions.map((r) => ({ ...r, weighting: 'population' as const })) : set.regions;
  return extractRegionsJson(file, variable, regions, daily ?? null, {
    population,
    referenceTime: stringOption(args, 'reference-time'),
    ...startOption(args),
  });
}

export async function extractCommand(args: ParsedArgs): Promise<number> {
  const file = args.positionals[0];
  if (!file) throw usageError('extract needs a file: forelight extract <file> --var NAME (--box S,N,W,E | --regions FILE) --json');
  const variable = stringOption(args, 'var');
  if (!variable) throw usageError('extract needs --var NAME (the variable name in the file)');
  if (!args.options.json) throw usageError('extract prints JSON only: add --json');
  const daily = choiceOption(args, 'daily', DAILY);
  const cellRule = choiceOption(args, 'cells', RULES);
  const boundaries = stringOption(args, 'regions');
  const box = stringOption(args, 'box');
  if ((boundaries === undefined) === (box === undefined)) throw usageError('extract needs exactly one of --box S,N,W,E and --regions FILE');
  if (box !== undefined && stringOption(args, 'population') !== undefined)
    throw usageError('--population goes with --regions FILE, not --box');
  const result =
    boundaries !== undefined
      ? await regionsJson(file, variable, boundaries, args, daily, cellRule)
      : await extractBoxJson(file, {
          variable,
          box: parseBox(box),
          daily,
          ...clockOptions(args),
          ...(cellRule ? { cellRule } : {}),
          referenceTime: stringOption(args, 'reference-time'),
          ...startOption(args),
        });
  process.stdout.write(JSON.stringify(result) + '\n');
  return EXIT.ok;
}
