/**
 * Which files one run reads: per source the newest forecast on or before the issue date (an older one, at most
 * the source's `look-back-days` before it, is used and said when the expected one is late), and the hindcast starts within ±windowDays of its day of year.
 */
import type { Config, SourceConfig } from '../config/types.ts';
import { startsWithinWindow } from '../calibrate/climate.ts';
import { addDays } from '../core/iso-dates.ts';
import { compactDate, matchPattern } from '../core/path-patterns.ts';
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
}

export interface SourceInputs {
  readonly source: SourceConfig;
  /** The issue date the forecast was looked for (back to `source.lookbackDays` days before it). */
  readonly issueDate: IsoDate;
  /** The forecast date used, or null when no forecast was found within the look-back. */
  readonly date: IsoDate | null;
  readonly path: string | null;
  /** True when the forecast used is older than the issue date. */
  readonly stale: boolean;
  readonly hindcasts: readonly HindcastFile[];
  /**
   * Every forecast of the source within the look-back of which any file exists (file, empty file or folder), newest
   * first: the read stage uses the first usable one, so a damaged or incomplete newest forecast counts as late
   * (src/pipeline/usable-forecast.ts).
   */
  readonly candidates: readonly ForecastCandidate[];
}

export interface ForecastCandidate {
  readonly date: IsoDate;
  /** The forecast's first file, for messages. */
  readonly path: string;
  /** Every file of this forecast (split by variable or member: src/pipeline/split-files.ts). */
  readonly files: InputFiles;
}

/** The forecasts of a source on or before `issueDate` within the source's look-back of which any file exists, newest first. */
export function forecastCandidates(source: SourceConfig, issueDate: IsoDate): ForecastCandidate[] {
  const out: ForecastCandidate[] = [];
  for (let back = 0; back <= source.lookbackDays; back++) {
    const date = addDays(issueDate, -back);
    const files = findInputFiles(source.forecast, { date: compactDate(date) }, fileVariables(source));
    if (files.existing.length > 0) out.push({ date, path: files.existing[0], files });
  }
  return out;
}

/** The hindcast starts of a source that calibrate a forecast of `forecastDate` (within ±windowDays, before it). */
export function hindcastsFor(config: Pick<Config, 'calibration'>, source: SourceConfig, forecastDate: IsoDate): HindcastFile[] {
  const all = listHindcasts(source);
  const keep = new Set(
    startsWithinWindow(
      forecastDate,
      all.map((h) => h.start),
      config.calibration.windowDays,
    ),
  );
  // A hindcast is a past start: one at or after the forecast date would be the forecast itself.
  return all.filter((h) => keep.has(h.start) && h.start < forecastDate);
}

/**
 * Every hindcast start matching the source's pattern (`{year}`, `{mmdd}` or `{date}` anywhere in the path), with
 * its files (`{var}`, `{member}` expanded as for forecasts).
 */
export function listHindcasts(source: SourceConfig): HindcastFile[] {
  const pattern = source.hindcast;
  if (pattern === undefined) return [];
  const starts = new Map<string, HindcastFile>();
  for (const { values } of matchPattern(pattern)) {
    const year = values.year ?? values.date?.slice(0, 4);
    if (year === undefined) continue;
    const mmdd = values.mmdd ?? values.date?.slice(4) ?? '0101';
    const start = `${year}-${mmdd.slice(0, 2)}-${mmdd.slice(2)}`;
    if (starts.has(start)) continue;
    const fixed = { year, ...(values.mmdd !== undefined ? { mmdd } : {}), ...(values.date !== undefined ? { date: values.date } : {}) };
    const files = findInputFiles([pattern], fixed, fileVariables(source));
    if (files.existing.length > 0) starts.set(start, { year: Number(year), start, path: files.existing[0], files });
  }
  return [...starts.values()].sort((a, b) => a.start.localeCompare(b.start));
}

/** Forecast and hindcast files of every source for an issue date (the newest existing forecast; see `candidates`). */
export function resolveInputs(config: Pick<Config, 'sources' | 'calibration'>, issueDate: IsoDate): SourceInputs[] {
  return config.sources.map((source) => {
    const candidates = forecastCandidates(source, issueDate);
    const newest = candidates[0] ?? null;
    return {
      source,
      issueDate,
      date: newest?.date ?? null,
      path: newest?.path ?? null,
      stale: newest === null || newest.date !== issueDate,
      hindcasts: hindcastsFor(config, source, newest?.date ?? issueDate),
      candidates,
    };
  });
}
