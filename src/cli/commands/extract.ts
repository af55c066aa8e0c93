/**
 * `forelight extract <file> --var NAME --box S,N,W,E [--daily max|min|mean|sum] [--utc-offset H] --json`:
 * prints exactly what Forelight sees in a file for one box, as JSON.
 */
import { extractBoxJson } from '../../read/extract.ts';
import type { DailyMethod } from '../../read/daily.ts';
import { EXIT } from '../../core/exit-codes.ts';
import { stringOption, usageError, type ParsedArgs } from '../args.ts';

const DAILY: readonly DailyMethod[] = ['max', 'min', 'mean', 'sum'];

function parseBox(text: string | undefined): { south: number; north: number; west: number; east: number } {
  const parts = (text ?? '').split(',').map(Number);
  if (parts.length !== 4 || parts.some((v) => !Number.isFinite(v))) {
    throw usageError(`--box needs four numbers south,north,west,east (degrees), got '${text ?? ''}'`);
  }
  const [south, north, west, east] = parts;
  if (south > north) throw usageError(`--box south ${south} is north of north ${north}: write south,north,west,east`);
  // West > east is a box across 180° (read eastwards from west), as in the YAML.
  if (west === east) throw usageError(`--box west ${west} equals east ${east}: the box has no width (across 180° write west > east, e.g. 172,-174)`);
  return { south, north, west, east };
}

export async function extractCommand(args: ParsedArgs): Promise<number> {
  const file = args.positionals[0];
  if (!file) throw usageError('extract needs a file: forelight extract <file> --var NAME --box S,N,W,E --json');
  const variable = stringOption(args, 'var');
  if (!variable) throw usageError('extract needs --var NAME (the variable name in the file)');
  if (!args.options.json) throw usageError('extract prints JSON only: add --json');
  const daily = stringOption(args, 'daily');
  if (daily !== undefined && !DAILY.includes(daily as DailyMethod)) throw usageError(`--daily must be one of ${DAILY.join(', ')}, got '${daily}'`);
  const offsetText = stringOption(args, 'utc-offset');
  const utcOffsetHours = offsetText === undefined ? 0 : Number(offsetText);
  if (!Number.isFinite(utcOffsetHours) || Math.abs(utcOffsetHours) > 14) throw usageError(`--utc-offset must be hours between -14 and 14, got '${offsetText}'`);
  const result = await extractBoxJson(file, { variable, box: parseBox(stringOption(args, 'box')), daily: daily as DailyMethod | undefined, utcOffsetHours });
  process.stdout.write(JSON.stringify(result) + '\n');
  return EXIT.ok;
}
