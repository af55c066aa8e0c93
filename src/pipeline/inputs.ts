/**
 * Which files one run reads: per source the newest forecast on or before the issue date (an older one, at most
 * the source's `look-back-days` before it, is used and said when the expected one is late), and the hindcast starts within ±windowDays of its day of year.
 */
import type { Config, SourceConfig } from '../config/types.ts';
import { startsWithinWindow } from '../calibrate/climate.ts';
import { addDays } from '../core/iso-dates.ts';
import { InputError } from '../core/errors.ts';
import { compactDate, hasPlaceholder } from '../core/path-patterns.ts';
import { fileVariables, findInputFiles, type InputFiles } from './split-files.ts';
import { listHindcasts, startsFromPaths, type HindcastFile } from './hindcast-list.ts';
import type { IsoDate } from '../types.ts';

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

/**
 * The hindcast starts of a source that calibrate a forecast of `forecastDate` (within ±windowDays, before it), and
 * every refused start (named by the read stage). When the starts come from the files' own reference times
 * (`{year}` without `{mmdd}`), files none of whose starts is within the window are one refusal: they do not
 * calibrate this forecast, which is said rather than leaving its leads silently uncalibrated.
 */
export async function hindcastsFor(
  config: Pick<Config, 'calibration'>,
  source: SourceConfig,
  forecastDate: IsoDate,
): Promise<HindcastFile[]> {
  const all = await listHindcasts(source);
  const windowDays = config.calibration.windowDays;
  const keep = new Set(
    startsWithinWindow(
      forecastDate,
      all.map((h) => h.start),
      windowDays,
    ),
  );
  // A hindcast is a past start: one at or after the forecast date would be the forecast itself.
  const used = all.filter((h) => h.start < forecastDate && (keep.has(h.start) || h.refused !== undefined));
  const yearOnly = source.hindcast !== undefined && hasPlaceholder(source.hindcast, 'year') && !startsFromPaths(source.hindcast);
  if (!yearOnly) return used;
  const inWindow = new Set(used.map((h) => h.path));
  const outside = all.filter((h) => !h.refused && h.start < forecastDate && !inWindow.has(h.path));
  const files = new Set(outside.map((h) => h.path));
  if (outside.length === 0) return used;
  const first = outside[0];
  const refused = new InputError(
    'hindcast-start-mismatch',
    first.path,
    `starts on ${first.start} (its forecast reference time), outside the calibration window of ±${windowDays} days around the forecast's ${forecastDate.slice(5)}` +
      (files.size > 1 ? `, as do ${files.size - 1} other hindcast file(s) of source '${source.id}'` : '') +
      ': they do not calibrate this forecast',
    "point hindcast-files at the hindcasts started near the forecast's day of year (or widen calibration.window-days)",
  );
  return [...used, { ...first, refused }];
}

/** Forecast and hindcast files of every source for an issue date (the newest existing forecast; see `candidates`). */
export async function resolveInputs(config: Pick<Config, 'sources' | 'calibration'>, issueDate: IsoDate): Promise<SourceInputs[]> {
  const out: SourceInputs[] = [];
  for (const source of config.sources) {
    const candidates = forecastCandidates(source, issueDate);
    const newest = candidates[0] ?? null;
    out.push({
      source,
      issueDate,
      date: newest?.date ?? null,
      path: newest?.path ?? null,
      stale: newest === null || newest.date !== issueDate,
      hindcasts: await hindcastsFor(config, source, newest?.date ?? issueDate),
      candidates,
    });
  }
  return out;
}
