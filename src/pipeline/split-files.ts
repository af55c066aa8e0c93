/**
 * The files of one forecast (or one hindcast start) of a source, when portals split it: one file per variable
 * (`{var}` in `forecast-files`), one file per member or member group (`{member}`: `07`, or `00-09`), or a list of
 * patterns whose files together make the forecast. Rules (src/read/DECISIONS.md §5):
 *
 * - `{var}` is the file variable a quantity is mapped to (`sources[].variables`).
 * - `{member}` files are the members in the order of their numbers (a group by its first number); the numbers
 *   must run on without a gap, and every variable must have the same ones: a file missing from the run is
 *   named. (A missing LAST member cannot be told from a smaller ensemble.)
 * - Several patterns: a variable is read from the files of the patterns that hold it, in list order; patterns
 *   holding the same variable are member groups of one ensemble, concatenated in list order.
 * - Every file a pattern asks for must be there: a missing one makes the forecast unusable, which counts as late
 *   (src/pipeline/usable-forecast.ts), so an older complete forecast is used and said, never fewer members.
 */
import { existsSync } from 'node:fs';
import { InputError } from '../core/errors.ts';
import type { SourceConfig } from '../config/types.ts';
import { compactDate, fillPattern, hasPlaceholder, matchPattern, type PlaceholderValues } from '../core/path-patterns.ts';
import type { Dataset } from '../read/dataset.ts';
import { openDataset } from '../read/open-dataset.ts';
import type { IsoDate, Quantity } from '../types.ts';
import { entriesOf } from '../core/typed-entries.ts';

/** The files of one forecast, as found on disk (no file opened yet). */
export interface InputFiles {
  /** Every file that exists, in pattern and member order (for checksums and the ledger). */
  readonly existing: readonly string[];
  /** Per file variable, per pattern: the files of that pattern holding its members, in member order. */
  readonly byVariable: ReadonlyMap<string, readonly (readonly string[])[]>;
  /** Files the patterns ask for that are not there (a member gap, a variable's file, a fixed name). */
  readonly missing: readonly InputError[];
}

/** One read: files that are the member parts of one dataset, and the quantities read from it. */
export interface FileGroup {
  readonly files: readonly string[];
  readonly quantities: Partial<Record<Quantity, string>>;
}

/** First member number of a `{member}` value (`07` → 7, `10-19` → 10) and the last. */
function memberRange(value: string): [number, number] {
  const [a, b] = value.split('-').map(Number);
  return [a, b ?? a];
}

function missingFile(path: string, why: string): InputError {
  return new InputError(
    'input-missing',
    path,
    `is missing: ${why}`,
    'wait for the file or download it again; until then an older complete forecast is used',
  );
}

/** The member files of one `{member}` pattern, in member order, and the files missing from a gap in the numbers. */
function memberFiles(pattern: string): { files: string[]; values: string[]; missing: InputError[] } {
  const found = matchPattern(pattern)
    .flatMap((m) => (m.values.member === undefined ? [] : [{ path: m.path, member: m.values.member }]))
    .sort((a, b) => memberRange(a.member)[0] - memberRange(b.member)[0]);
  const missing: InputError[] = [];
  if (found.length === 0) missing.push(missingFile(pattern, 'no member file matches this pattern'));
  for (let k = 1; k < found.length; k++) {
    const before = memberRange(found[k - 1].member)[1];
    const next = memberRange(found[k].member)[0];
    const width = found[k].member.split('-')[0].length;
    for (let m = before + 1; m < next; m++) {
      const path = fillPattern(pattern, { member: String(m).padStart(width, '0') });
      missing.push(missingFile(path, `member ${m} of the forecast lies between ${found[k - 1].path} and ${found[k].path}`));
    }
  }
  return { files: found.map((m) => m.path), values: found.map((m) => m.member), missing };
}

/**
 * The files of the forecast whose placeholders are `fixed` (e.g. `{ date: '20261130' }`), for the file variables
 * `variables`, as `patterns` ask for them. Nothing is opened.
 */
export function findInputFiles(patterns: readonly string[], fixed: PlaceholderValues, variables: readonly string[]): InputFiles {
  const byVariable = new Map<string, string[][]>();
  const missing: InputError[] = [];
  const seenMembers = new Map<number, { variable: string; values: string[]; pattern: string }>();
  const existing: string[] = [];
  for (const variable of variables) {
    const lists: string[][] = [];
    patterns.forEach((raw, i) => {
      const pattern = fillPattern(raw, { ...fixed, var: variable });
      if (hasPlaceholder(pattern, 'member')) {
        const found = memberFiles(pattern);
        missing.push(...found.missing);
        const first = seenMembers.get(i);
        if (!first) seenMembers.set(i, { variable, values: found.values, pattern });
        else {
          for (const v of first.values.filter((x) => !found.values.includes(x)))
            missing.push(
              missingFile(fillPattern(pattern, { member: v }), `'${first.variable}' has member file ${v}, '${variable}' has not`),
            );
          for (const v of found.values.filter((x) => !first.values.includes(x)))
            missing.push(
              missingFile(fillPattern(first.pattern, { member: v }), `'${variable}' has member file ${v}, '${first.variable}' has not`),
            );
        }
        lists.push(found.files);
      } else if (existsSync(pattern)) lists.push([pattern]);
      else missing.push(missingFile(pattern, `it is one of the files of this forecast (forecast-files)`));
    });
    byVariable.set(variable, lists);
    for (const f of lists.flat()) if (!existing.includes(f)) existing.push(f);
  }
  const byPath = new Map<string, InputError>();
  for (const m of missing) if (!byPath.has(m.file)) byPath.set(m.file, m);
  return { existing, byVariable, missing: [...byPath.values()] };
}

/** The file variables a source's patterns are expanded for (`{var}`). */
export function fileVariables(source: SourceConfig): string[] {
  return [...new Set(Object.values(source.variables))];
}

/**
 * The files of a source's forecast of `date` that can be named before they arrive (for the service's wait): every
 * pattern with `{date}` and `{var}` filled; `{member}` files cannot be counted in advance and are read as found.
 */
export function namedForecastFiles(source: SourceConfig, date: IsoDate): string[] {
  const variables = fileVariables(source);
  const named = source.forecast.flatMap((p) =>
    hasPlaceholder(p, 'var')
      ? variables.map((v) => fillPattern(p, { date: compactDate(date), var: v }))
      : [fillPattern(p, { date: compactDate(date) })],
  );
  return [...new Set(named.filter((p) => !hasPlaceholder(p, 'member')))];
}

/** Whether `file` has a variable `name` (headers only; a file that cannot be opened counts as having it, so its read names the problem). */
async function holds(file: string, name: string, opened: Map<string, Dataset | null>): Promise<boolean> {
  if (!opened.has(file)) opened.set(file, await openDataset(file).catch(() => null));
  const ds = opened.get(file);
  return ds === null || ds?.variable(name) !== undefined;
}

/**
 * The reads of one forecast: per variable the member files it is read from (patterns holding it, in list order),
 * quantities with the same files read together. Opens headers only when several patterns could hold a variable.
 */
export async function groupInputFiles(files: InputFiles, quantities: Partial<Record<Quantity, string>>): Promise<FileGroup[]> {
  const opened = new Map<string, Dataset | null>();
  const groups = new Map<string, { files: readonly string[]; quantities: Partial<Record<Quantity, string>> }>();
  try {
    for (const [quantity, variable] of entriesOf(quantities)) {
      const lists = (files.byVariable.get(variable) ?? []).filter((l) => l.length > 0);
      let chosen = lists;
      if (lists.length > 1) {
        const holding = [];
        for (const l of lists) if (await holds(l[0], variable, opened)) holding.push(l);
        chosen = holding.length > 0 ? holding : lists.slice(0, 1);
      }
      const parts = chosen.flat();
      if (parts.length === 0) continue;
      const key = parts.join('\u0000');
      const group = groups.get(key) ?? { files: parts, quantities: {} };
      group.quantities[quantity] = variable;
      groups.set(key, group);
    }
  } finally {
    for (const ds of opened.values()) await ds?.close().catch(() => undefined);
  }
  return [...groups.values()];
}
