/**
 * CF time decoding, after Eaton et al., "NetCDF Climate and Forecast (CF) Metadata Conventions" 1.x, §4.4
 * (time coordinate `<unit> since <reference date>`) and §4.4.1 (calendars). Dates are returned as calendar
 * components (CfDateTime), because non-standard calendars have dates JavaScript's Date cannot hold
 * (360_day's February 30). `standard`/`gregorian` is the mixed Julian/Gregorian calendar: dates before
 * 1582-10-15 are Julian-calendar dates (as cftime's num2date returns them). Day-number algorithms:
 * Richards, E.G. (2013), "Calendars", Explanatory Supplement to the Astronomical Almanac, 3rd ed., §15.11
 * (Julian Day Number from/to Julian and Gregorian dates).
 */
import { UnitError } from '../core/errors.ts';
import { fromDayNumber, isGregorianLeap, toDayNumber, type CalendarName } from '../core/calendar-days.ts';

export type CfCalendar = CalendarName;

const CALENDAR_ALIASES: Readonly<Record<string, CfCalendar>> = {
  standard: 'standard',
  gregorian: 'standard',
  proleptic_gregorian: 'proleptic_gregorian',
  julian: 'julian',
  noleap: 'noleap',
  '365_day': 'noleap',
  all_leap: 'all_leap',
  '366_day': 'all_leap',
  '360_day': '360_day',
};

const SECONDS_PER_UNIT: Readonly<Record<string, number>> = {
  microseconds: 1e-6,
  microsecond: 1e-6,
  us: 1e-6,
  milliseconds: 1e-3,
  millisecond: 1e-3,
  msec: 1e-3,
  ms: 1e-3,
  seconds: 1,
  second: 1,
  secs: 1,
  sec: 1,
  s: 1,
  minutes: 60,
  minute: 60,
  mins: 60,
  min: 60,
  hours: 3600,
  hour: 3600,
  hrs: 3600,
  hr: 3600,
  h: 3600,
  days: 86400,
  day: 86400,
  d: 86400,
};

/** Seconds in one time unit as CF/UDUNITS names it ("days", "h", "ms", …, any case); undefined when not a fixed-length unit. */
export function secondsPerUnit(unit: string): number | undefined {
  return SECONDS_PER_UNIT[unit.toLowerCase()];
}

const pad = (n: number, width = 2): string => String(n).padStart(width, '0');

/** One decoded time: calendar-date components in the variable's own calendar (UTC). */
export class CfDateTime {
  constructor(
    readonly calendar: CfCalendar,
    readonly year: number,
    /** 1-12 */
    readonly month: number,
    /** 1-31 (1-30 in 360_day) */
    readonly day: number,
    readonly hour: number,
    readonly minute: number,
    /** Seconds including the fraction, rounded to the microsecond. */
    readonly second: number,
  ) {}

  /** `YYYY-MM-DD` in the variable's calendar (the key for building local days). */
  toIsoDate(): string {
    return `${pad(this.year, 4)}-${pad(this.month)}-${pad(this.day)}`;
  }

  /** `YYYY-MM-DDTHH:MM:SS[.ffffff]` in the variable's calendar. */
  toIsoString(): string {
    const whole = Math.floor(this.second);
    const micro = Math.round((this.second - whole) * 1e6);
    return `${this.toIsoDate()}T${pad(this.hour)}:${pad(this.minute)}:${pad(whole)}${micro ? `.${pad(micro, 6)}` : ''}`;
  }

  /**
   * Milliseconds since 1970-01-01T00:00Z of the same components on the proleptic Gregorian timeline,
   * or undefined when the components do not exist there (Feb 29 of a common year, Feb 30).
   */
  gregorianMs(): number | undefined {
    const ms = Date.UTC(2000, this.month - 1, this.day, this.hour, this.minute, 0) + this.second * 1000;
    const check = new Date(ms);
    if (check.getUTCMonth() !== this.month - 1 || check.getUTCDate() !== this.day) return undefined;
    if (this.month === 2 && this.day === 29 && !isGregorianLeap(this.year)) return undefined;
    const date = new Date(0);
    date.setUTCFullYear(this.year, this.month - 1, this.day);
    return date.getTime() + ((this.hour * 60 + this.minute) * 60 + this.second) * 1000;
  }
}

const REFERENCE =
  /^(-?\d{1,4})-(\d{1,2})-(\d{1,2})(?:[T ](\d{1,2}):(\d{1,2})(?::(\d{1,2}(?:\.\d+)?))?)?\s*(Z|UTC|GMT|[+-]\d{1,2}(?::?\d{2})?)?$/i;

export interface TimeUnits {
  readonly secondsPerUnit: number;
  readonly calendar: CfCalendar;
  /** Reference instant as (day number, seconds into that day, UTC). */
  readonly refDay: number;
  readonly refSecond: number;
}

/** Parses `<unit> since <date>` and the calendar name; UnitError names whatever is not understood. */
export function parseTimeUnits(units: string, calendar = 'standard'): TimeUnits {
  const cal = CALENDAR_ALIASES[calendar.trim().toLowerCase()];
  if (!cal) throw new UnitError(`unknown CF calendar '${calendar}'`, `use one of: ${Object.keys(CALENDAR_ALIASES).join(', ')} (CF §4.4.1)`);
  const match = /^\s*(\S+)\s+since\s+(.+?)\s*$/i.exec(units);
  const unitSeconds = match ? secondsPerUnit(match[1]) : undefined;
  const ref = match ? REFERENCE.exec(match[2]) : null;
  if (!match || unitSeconds === undefined || !ref) {
    throw new UnitError(
      `time units '${units}' are not '<days|hours|minutes|seconds> since <YYYY-MM-DD[ hh:mm:ss]>'`,
      "fix the time variable's units attribute (CF §4.4); months and years are not fixed-length units",
    );
  }
  const [y, mo, d] = [Number(ref[1]), Number(ref[2]), Number(ref[3])];
  if (mo < 1 || mo > 12 || d < 1 || d > 31)
    throw new UnitError(`time units '${units}' have an invalid reference date`, "fix the time variable's units attribute (CF §4.4)");
  let tzSeconds = 0;
  const tz = ref[7];
  if (tz && /^[+-]/.test(tz)) {
    const digits = tz.slice(1).replace(':', '');
    const hours = Number(digits.length <= 2 ? digits : digits.slice(0, -2));
    const minutes = digits.length <= 2 ? 0 : Number(digits.slice(-2));
    tzSeconds = (tz[0] === '-' ? -1 : 1) * (hours * 3600 + minutes * 60);
  }
  const refSecond = Number(ref[4] ?? 0) * 3600 + Number(ref[5] ?? 0) * 60 + Number(ref[6] ?? 0) - tzSeconds;
  return { secondsPerUnit: unitSeconds, calendar: cal, refDay: toDayNumber(cal, y, mo, d), refSecond };
}

/** Decodes CF time values (`values` in `units`, e.g. "hours since 2026-11-23 00:00:00") into calendar dates. */
export function decodeTimes(values: ArrayLike<number>, units: string, calendar?: string): CfDateTime[] {
  const u = parseTimeUnits(units, calendar);
  const out: CfDateTime[] = new Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v))
      throw new UnitError(`time value ${v} at index ${i} cannot be decoded with units '${units}'`, 'mask missing times before decoding');
    // Round to the microsecond, as cftime does, then split into whole days and seconds of day.
    const micros = Math.round((u.refSecond + v * u.secondsPerUnit) * 1e6);
    const dayOffset = Math.floor(micros / 86_400_000_000);
    const secondOfDay = (micros - dayOffset * 86_400_000_000) / 1e6;
    const [y, m, d] = fromDayNumber(u.calendar, u.refDay + dayOffset);
    const hour = Math.floor(secondOfDay / 3600);
    const minute = Math.floor((secondOfDay - hour * 3600) / 60);
    out[i] = new CfDateTime(u.calendar, y, m, d, hour, minute, Math.round((secondOfDay - hour * 3600 - minute * 60) * 1e6) / 1e6);
  }
  return out;
}

/**
 * Seconds of each value on the calendar's own continuous day line (day number × 86400 + seconds of day), so that
 * differences are elapsed time in that calendar (every CF calendar's day has 86400 s, CF §4.4.1).
 */
export function calendarSeconds(
  values: ArrayLike<number>,
  units: string,
  calendar?: string,
): { calendar: CfCalendar; seconds: Float64Array } {
  const u = parseTimeUnits(units, calendar);
  const seconds = Float64Array.from(values, (v) => Math.round((u.refDay * 86400 + u.refSecond + v * u.secondsPerUnit) * 1e6) / 1e6);
  return { calendar: u.calendar, seconds };
}
