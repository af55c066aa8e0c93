/**
 * Which files one run reads: per source the newest forecast on or before the issue date (an older one, at most
 * the source's `look-back-days` before it, is used and said when the expected one is late), and the hindcast starts within ±windowDays of its day of year.
 */
import type { Config, SourceConfig } from '../config/types.ts';
import { startsWithinWindow } from '../calibrate/climate.ts';
import { existsSync } from 'node:fs';
import { addDays } from '../core/iso-dates.ts';
import { matchPattern } from '../core/path-patterns.ts';
import { forecastPath } from '../schedule/input-arrival.ts';
import type { IsoDate } from '../types.ts';

export interface HindcastFile {
  readonly year: number;
  /** Start date of this hindcast, YYYY-MM-DD. */
  readonly start: IsoDate;
  readonly path: string;
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
   * Every path of the source within the look-back that exists (file, empty file or folder), newest first: the read
   * stage uses the first usable one, so a damaged newest file counts as late (src/pipeline/usable-forecast.ts).
   */
  readonly candidates: readonly ForecastCandidate[];
}

export interface ForecastCandidate {
  readonly date: IsoDate;
  readonly path: string;
}

/** Paths of a source's forecasts on or before `issueDate` within the source's look-back that exist at all, newest first. */
export function forecastCandidates(pattern: string, issueDate: IsoDate, lookbackDays: number): ForecastCandidate[] {
  const out: ForecastCandidate[] = [];
  for (let back = 0; back <= lookbackDays; back++) {
    const date = addDays(issueDate, -back);
    const path = forecastPath(pattern, date);
    if (existsSync(path)) out.push({ date, path });
  }
  return out;
}

/** The hindcast starts of a source that calibrate a forecast of `forecastDate` (within ±windowDays, before it). */
export function hindcastsFor(config: Pick<Config, 'calibration'>, source: SourceConfig, forecastDate: IsoDate): HindcastFile[] {
  const all = source.hindcast ? listHindcasts(source.hindcast) : [];
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

/** Every hindcast file matching the source's pattern (`{year}`, `{mmdd}` or `{date}` anywhere in the path, core/path-patterns.ts). */
export function listHindcasts(pattern: string): HindcastFile[] {
  const out: HindcastFile[] = [];
  for (const { path, values } of matchPattern(pattern)) {
    const year = values.year ?? values.date?.slice(0, 4);
    if (year === undefined) continue;
    const mmdd = values.mmdd ?? values.date?.slice(4) ?? '0101';
    out.push({ year: Number(year), start: `${year}-${mmdd.slice(0, 2)}-${mmdd.slice(2)}`, path });
  }
  return out.sort((a, b) => a.start.localeCompare(b.start));
}

/** Forecast and hindcast files of every source for an issue date (the newest existing forecast; see `candidates`). */
export function resolveInputs(config: Pick<Config, 'sources' | 'calibration'>, issueDate: IsoDate): SourceInputs[] {
  return config.sources.map((source) => {
    const candidates = forecastCandidates(source.forecast, issueDate, source.lookbackDays);
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
