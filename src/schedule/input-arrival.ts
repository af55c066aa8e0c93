/**
 * Waiting for the files of a new forecast, and falling back to the newest earlier forecast when a source
 * is late. Source path patterns use `{date}` = YYYYMMDD of the forecast reference date (SourceConfig.forecast).
 */
import { statSync } from 'node:fs';
import { addDays } from '../core/iso-dates.ts';
import { compactDate, fillPattern } from '../core/path-patterns.ts';
import type { IsoDate } from '../types.ts';

/** Pattern with `{date}` replaced by the compact date of `date` (YYYY-MM-DD). */
export function forecastPath(pattern: string, date: IsoDate): string {
  return fillPattern(pattern, { date: compactDate(date) });
}

function sizeOf(path: string): number | null {
  try {
    const s = statSync(path);
    return s.isFile() ? s.size : null;
  } catch {
    return null;
  }
}

export interface ArrivalResult {
  readonly arrived: readonly string[];
  readonly missing: readonly string[];
}

/**
 * Poll until every path exists with a non-zero size that did not change between two polls (a file still
 * being copied keeps growing), or until `deadline`. A file first seen at the deadline (e.g. a catch-up run
 * long after its slot) gets one more poll, at most 2 s later, to confirm it. `signal` (service stop) ends
 * the wait early. Returns which files arrived and which did not.
 */
export async function waitForInputs(
  expectedPaths: readonly string[],
  deadline: Date,
  pollSeconds: number,
  options: { readonly sleep?: (ms: number) => Promise<void>; readonly now?: () => Date; readonly signal?: AbortSignal } = {},
): Promise<ArrivalResult> {
  const { sleep, now = () => new Date(), signal } = options;
  const pause = sleep ? (ms: number) => abortable(sleep(ms), signal) : (ms: number) => timer(ms, signal);
  const lastSize = new Map<string, number>();
  const arrived = new Set<string>();
  let confirmedAtDeadline = false;
  for (;;) {
    for (const path of expectedPaths) {
      if (arrived.has(path)) continue;
      const size = sizeOf(path);
      if (size !== null && size > 0 && lastSize.get(path) === size) arrived.add(path);
      else if (size !== null) lastSize.set(path, size);
      else lastSize.delete(path);
    }
    const missing = expectedPaths.filter((p) => !arrived.has(p));
    const result = { arrived: expectedPaths.filter((p) => arrived.has(p)), missing };
    if (missing.length === 0 || signal?.aborted) return result;
    const left = deadline.getTime() - now().getTime();
    if (left <= 0) {
      if (confirmedAtDeadline || !missing.some((p) => lastSize.has(p))) return result;
      confirmedAtDeadline = true;
      await pause(Math.min(pollSeconds * 1000, 2000));
      continue;
    }
    await pause(Math.min(pollSeconds * 1000, left));
  }
}

/** A timer that an abort clears (so a stopped service does not linger until the next poll). */
function timer(ms: number, signal: AbortSignal | undefined): Promise<void> {
  return new Promise((resolve) => {
    const onAbort = () => {
      clearTimeout(t);
      resolve();
    };
    const t = setTimeout(() => {
      signal?.removeEventListener('abort', onAbort);
      resolve();
    }, ms);
    signal?.addEventListener('abort', onAbort, { once: true });
  });
}

/** Resolves when `p` does or when `signal` aborts (listener removed either way). */
function abortable(p: Promise<void>, signal: AbortSignal | undefined): Promise<void> {
  if (!signal) return p;
  let onAbort = () => {};
  const aborted = new Promise<void>((resolve) => {
    onAbort = resolve;
    signal.addEventListener('abort', onAbort, { once: true });
  });
  return Promise.race([p, aborted]).finally(() => signal.removeEventListener('abort', onAbort));
}

export interface LatestInput {
  /** The forecast date asked for. */
  readonly expectedDate: IsoDate;
  /** Newest date within the look-back with a non-empty file, or null. */
  readonly date: IsoDate | null;
  readonly path: string | null;
  /** True when the newest file is older than `expectedDate` ("based on the forecast of <date>"). */
  readonly stale: boolean;
}

/** Newest available forecast of one source on or before `date`, looking back `lookbackDays` days. */
export function resolveLatestInputs(pattern: string, date: IsoDate, lookbackDays: number): LatestInput {
  for (let back = 0; back <= lookbackDays; back++) {
    const day = addDays(date, -back);
    const path = forecastPath(pattern, day);
    if ((sizeOf(path) ?? 0) > 0) return { expectedDate: date, date: day, path, stale: back > 0 };
  }
  return { expectedDate: date, date: null, path: null, stale: true };
}
