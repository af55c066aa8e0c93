/**
 * Local time of a region: a fixed UTC offset or an IANA time zone (tz database, via the ECMAScript Intl API
 * of Node's ICU), whose offset changes with daylight saving. Offsets are in milliseconds, local = UTC + offset.
 */
const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;

export interface LocalClock {
  /** 'UTC+1' or the zone name: regions with the same key share local days. */
  readonly key: string;
  offsetMs(utcMs: number): number;
}

const formatters = new Map<string, Intl.DateTimeFormat>();

function partsFormatter(zone: string): Intl.DateTimeFormat {
  let f = formatters.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone: zone,
      hourCycle: 'h23',
      year: 'numeric',
      month: 'numeric',
      day: 'numeric',
      hour: 'numeric',
      minute: 'numeric',
      second: 'numeric',
    });
    formatters.set(zone, f);
  }
  return f;
}

/** Offset of IANA zone `zone` at instant `utcMs` (whole seconds). */
export function zoneOffsetMs(zone: string, utcMs: number): number {
  const p = Object.fromEntries(
    partsFormatter(zone)
      .formatToParts(new Date(utcMs))
      .map((x) => [x.type, Number(x.value)]),
  );
  const wall = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
  return wall - Math.floor(utcMs / 1000) * 1000;
}

/** The clock of a region: its `timeZone` when given, else its fixed `utcOffsetHours`. */
export function regionClock(region: { readonly utcOffsetHours: number; readonly timeZone?: string }): LocalClock {
  const zone = region.timeZone;
  if (zone !== undefined) return { key: zone, offsetMs: (t) => zoneOffsetMs(zone, t) };
  const fixed = region.utcOffsetHours * HOUR_MS;
  return { key: `UTC${region.utcOffsetHours >= 0 ? '+' : ''}${region.utcOffsetHours}`, offsetMs: () => fixed };
}

/** Local calendar day number (days since 1970-01-01 in local time) of an instant. */
export function localDayNumber(clock: LocalClock, utcMs: number): number {
  return Math.floor((utcMs + clock.offsetMs(utcMs)) / DAY_MS);
}

/**
 * UTC instant at which local day `day` starts. Where midnight occurs twice, the first; where it is skipped by a
 * spring-forward change, midnight minus the offset in force before the change (the change itself when it
 * happens at midnight), as Python's zoneinfo resolves a skipped time with fold=0 (PEP 495).
 */
export function localDayStartMs(clock: LocalClock, day: number): number {
  const wall = day * DAY_MS;
  const before = clock.offsetMs(wall - 14 * HOUR_MS);
  const after = clock.offsetMs(wall + 14 * HOUR_MS);
  const valid = [wall - before, wall - after].filter((t) => clock.offsetMs(t) === wall - t);
  return valid.length > 0 ? Math.min(...valid) : wall - before;
}

/** Length of local day `day` in ms (23 h or 25 h on daylight-saving change days). */
export function localDayLengthMs(clock: LocalClock, day: number): number {
  return localDayStartMs(clock, day + 1) - localDayStartMs(clock, day);
}

/**
 * ISO 8601 local start of day `isoDay` with its offset, e.g. "2026-12-04T00:00:00+01:00" (CAP 1.2 §3.3.2
 * dateTime form); on a day whose midnight is skipped, the local time the day really starts ("…T01:00:00+03:00").
 */
export function localDayStartIso(clock: LocalClock, isoDay: string): string {
  const start = localDayStartMs(clock, Date.parse(`${isoDay}T00:00:00Z`) / DAY_MS);
  const offsetMin = Math.round(clock.offsetMs(start) / 60_000);
  const wall = new Date(start + offsetMin * 60_000).toISOString().slice(0, 19);
  const abs = Math.abs(offsetMin);
  return `${wall}${offsetMin < 0 ? '-' : '+'}${String(Math.floor(abs / 60)).padStart(2, '0')}:${String(abs % 60).padStart(2, '0')}`;
}
