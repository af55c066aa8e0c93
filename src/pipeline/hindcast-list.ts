/**
 * Every hindcast start of a source (src/read/DECISIONS.md §4b). The start is read from the path (`{year}` with
 * `{mmdd}`, or `{date}`, anywhere in it) or, when the path does not give it, from the file itself: a file holding
 * every start along a reference-time dimension (CF 1.11 §4.4 `forecast_reference_time`; `hindcast-files` without a
 * date placeholder) gives one start per index, read as if it had been split per start (src/read/start-slice.ts), and
 * a `{year}` file without `{mmdd}` gives its own reference time. A start whose file contradicts its path is kept
 * as a refusal, so the run names it instead of leaving its leads silently uncalibrated.
 */
import type { SourceConfig } from '../config/types.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import { hasPlaceholder, matchPattern, type PlaceholderValues } from '../core/path-patterns.ts';
import { findCoordinates } from '../read/coordinates.ts';
import { referenceTimesOf } from '../read/time-axis.ts';
import { withDataset } from '../read/open-dataset.ts';
import type { FileRequest } from './read-file.ts';
import { fileVariables, findInputFiles, type InputFiles } from './split-files.ts';
import type { IsoDate } from '../types.ts';

export interface HindcastFile {
  readonly year: number;
  /** Start date of this hindcast, YYYY-MM-DD. */
  readonly start: IsoDate;
  /** The (first) file of this start, for messages. */
  readonly path: string;
  /** Every file of this start (split by variable or member: src/pipeline/split-files.ts). */
  readonly files: InputFiles;
  /** In a file holding several starts: this start's index along the reference-time dimension. */
  readonly startIndex?: number;
  /** The start's reference time (ISO instant) when it was read from the file rather than from the path. */
  readonly referenceTime?: string;
  /** Why this start cannot be used (its file contradicts its path, or cannot tell its start): reported, never read. */
  readonly refused?: ForelightError;
}

/** What the read of one hindcast start asks of its files: its reference time, tier and, in a file of several starts, its index. */
export function hindcastRequest(h: HindcastFile, source: SourceConfig): FileRequest {
  return {
    referenceTime: h.referenceTime ?? h.start,
    tier: source.tier,
    ...(h.startIndex !== undefined ? { startIndex: h.startIndex } : {}),
  };
}

const isoInstant = (ms: number): string => new Date(ms).toISOString().replace('.000Z', 'Z');
const isoDate = (ms: number): IsoDate => isoInstant(ms).slice(0, 10);

/** True when the path alone tells each start (`{date}`, or `{year}` with `{mmdd}`). */
export function startsFromPaths(pattern: string): boolean {
  return hasPlaceholder(pattern, 'date') || (hasPlaceholder(pattern, 'year') && hasPlaceholder(pattern, 'mmdd'));
}

/** Every hindcast start matching the source's pattern, sorted by start (see the module comment). */
export async function listHindcasts(source: SourceConfig): Promise<HindcastFile[]> {
  const pattern = source.hindcast;
  if (pattern === undefined) return [];
  const byPath = startsFromPaths(pattern);
  const seen = new Set<string>();
  const starts = new Map<string, HindcastFile>();
  const refused: HindcastFile[] = [];
  for (const { values } of matchPattern(pattern)) {
    const fixed: PlaceholderValues = {
      ...(values.year !== undefined ? { year: values.year } : {}),
      ...(values.mmdd !== undefined ? { mmdd: values.mmdd } : {}),
      ...(values.date !== undefined ? { date: values.date } : {}),
    };
    const key = JSON.stringify(fixed);
    if (seen.has(key) || (values.mmdd !== undefined && values.year === undefined)) continue; // {mmdd} alone: a check error
    seen.add(key);
    const files = findInputFiles([pattern], fixed, fileVariables(source));
    if (files.existing.length === 0) continue;
    const found = byPath ? [fromPath(fixed, files)] : await startsInFile(files, fixed.year);
    for (const h of found) {
      if (h.refused) refused.push(h);
      else if (!starts.has(h.start)) starts.set(h.start, h); // a start two files claim: the first
    }
  }
  return [...starts.values(), ...refused].sort((a, b) => a.start.localeCompare(b.start));
}

function fromPath(values: PlaceholderValues, files: InputFiles): HindcastFile {
  const year = values.year ?? values.date!.slice(0, 4);
  const mmdd = values.mmdd ?? values.date!.slice(4);
  return { year: Number(year), start: `${year}-${mmdd.slice(0, 2)}-${mmdd.slice(2)}`, path: files.existing[0], files };
}

/** The starts a file states itself: one per index of a reference-time dimension, or its one reference time. */
async function startsInFile(files: InputFiles, year: string | undefined): Promise<HindcastFile[]> {
  const path = files.existing[0];
  const refuse = (start: IsoDate, err: ForelightError): HindcastFile => ({
    year: Number(start.slice(0, 4)),
    start,
    path,
    files,
    refused: err,
  });
  const fallback = year === undefined ? '0000-01-01' : `${year}-01-01`;
  let times: Float64Array | null;
  try {
    times = await withDataset(path, async (ds) => {
      const ref = await referenceTimesOf(ds);
      if (ref && ref.timesMs.length > 1) return ref.timesMs;
      if (year === undefined) return null; // one start and no date in the path: a check error (pattern-check.ts)
      const { referenceMs } = await findCoordinates(ds);
      return referenceMs === null ? new Float64Array() : Float64Array.of(referenceMs);
    });
  } catch (err) {
    if (!(err instanceof ForelightError)) throw err;
    return [refuse(fallback, err)]; // an unreadable file is named by the run, never left out silently
  }
  if (times === null) return [];
  if (times.length === 0)
    return [
      refuse(
        fallback,
        new InputError(
          'hindcast-start-unknown',
          path,
          'states no forecast reference time, and hindcast-files names its {year} without {mmdd}',
          "put {mmdd} (or {date}) in hindcast-files where the file names carry the start's month and day, or add a forecast_reference_time variable to the file",
        ),
      ),
    ];
  const bad = contradiction(times);
  if (bad)
    return [
      refuse(
        fallback,
        new InputError(
          'hindcast-starts-invalid',
          path,
          bad,
          'replace the file (a damaged or truncated download), or provide one file per start named with {date}',
        ),
      ),
    ];
  return [...times].map((ms, k) => {
    const start = isoDate(ms);
    const own = {
      year: Number(start.slice(0, 4)),
      start,
      path,
      files,
      referenceTime: isoInstant(ms),
      ...(times.length > 1 ? { startIndex: k } : {}),
    };
    if (year === undefined || start.startsWith(`${year}-`)) return own;
    return {
      ...own,
      refused: new InputError(
        'hindcast-start-mismatch',
        path,
        `its forecast reference time ${isoInstant(ms)} is not in ${year}, the year its path gives`,
        'rename the file or correct hindcast-files: with {year} and no {mmdd} the start is the reference time inside the file',
      ),
    };
  });
}

/** Why the reference times of a file of several starts cannot be its starts (two on one day), or null. */
function contradiction(times: Float64Array): string | null {
  const days = [...times].map(isoDate);
  const twice = days.findIndex((d, k) => days.indexOf(d) !== k);
  if (twice >= 0) return `its forecast reference times ${days.indexOf(days[twice])} and ${twice} fall on the same day ${days[twice]}`;
  return null;
}
