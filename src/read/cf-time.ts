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
import type { ModelCalendarName } from '../types.ts';

export type CfCalendar = 'standard' | 'proleptic_gregorian' | ModelCalendarName;

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

const CUMULATIVE_DAYS = [0, 31, 59, 90, 120, 151, 181, 212, 243, 273, 304, 334, 365];
const JDN_GREGORIAN_START = 2299161; // 1582-10-15 (Gregorian) = 1582-10-05 (Julian) + 10 days

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

function isGregorianLeap(y: number): boolean {
  return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
}

function gregorianToJdn(y: number, m: number, d: number): number {
  const a = Math.floor((14 - m) / 12);
  const yy = y + 4800 - a;
  const mm = m + 12 * a - 3;
  return d + Math.floor((153 * mm + 2) / 5) + 365 * yy + Math.floor(yy / 4) - Math.floor(yy / 100) + Math.floor(yy / 400) - 32045;
}

function julianToJdn(y: number, m: number, d: number): number {
  const a = Math.floor((14 - m) / 12);
  const yy = y + 4800 - a;
  const mm = m + 12 * a - 3;
  return d + Math.floor((153 * mm + 2) / 5) + 365 * yy + Math.floor(yy / 4) - 32083;
}

function jdnToDate(jdn: number, gregorian: boolean): [number, number, number] {
  let c: number;
  let b: number;
  if (gregorian) {
    const a = jdn + 32044;
    b = Math.floor((4 * a + 3) / 146097);
    c = a - Math.floor((146097 * b) / 4);
  } else {
    b = 0;
    c = jdn + 32082;
  }
  const d = Math.floor((4 * c + 3) / 1461);
  const e = c - Math.floor((1461 * d) / 4);
  const m = Math.floor((5 * e + 2) / 153);
  return [100 * b + d - 4800 + Math.floor(m / 10), m + 3 - 12 * Math.floor(m / 10), e - Math.floor((153 * m + 2) / 5) + 1];
}

/** Day number of a date in `calendar` (any fixed origin per calendar): differences are elapsed days. */
export function toDayNumber(calendar: CfCalendar, y: number, m: number, d: number): number {
  switch (calendar) {
    case 'proleptic_gregorian':
      return gregorianToJdn(y, m, d);
    case 'julian':
      return julianToJdn(y, m, d);
    case 'standard': {
      const g = gregorianToJdn(y, m, d);
      return g >= JDN_GREGORIAN_START ? g : julianToJdn(y, m, d);
    }
    case 'noleap':
      return y * 365 + CUMULATIVE_DAYS[m - 1] + d - 1;
    case 'all_leap':
      return y * 366 + CUMULATIVE_DAYS[m - 1] + (m > 2 ? 1 : 0) + d - 1;
    case '360_day':
      return y * 360 + (m - 1) * 30 + d - 1;
  }
}

/** The date (year, month, day) of a day number of `toDayNumber`. */
export function fromDayNumber(calendar: CfCalendar, n: number): [number, number, number] {
  switch (calendar) {
    case 'proleptic_gregorian':
      return jdnToDate(n, true);
    case 'julian':
      return jdnToDate(n, false);
    case 'standard':
      return jdnToDate(n, n >= JDN_GREGORIAN_START);
    case '360_day': {
      const y = Math.floor(n / 360);
      const r = n - y * 360;
      return [y, Math.floor(r / 30) + 1, (r % 30) + 1];
    }
    case 'noleap':
    case 'all_leap': {
      const len = calendar === 'noleap' ? 365 : 366;
      const y = Math.floor(n / len);
      const r = n - y * len;
      let m = 1;
      const start = (k: number): number => CUMULATIVE_DAYS[k] + (len === 366 && k >= 2 ? 1 : 0);
      while (m < 12 && r >= start(m)) m++;
      return [y, m, r - start(m - 1) + 1];
    }
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

/** Days in month `month` (1-12) of `year` in `calendar` (CF §4.4.1). */
export function daysInCalendarMonth(calendar: CfCalendar, year: number, month: number): number {
  if (calendar === '360_day') return 30;
  const leap =
    calendar === 'all_leap'
      ? true
      : calendar === 'noleap'
        ? false
        : calendar === 'julian' || (calendar === 'standard' && year < 1583)
          ? year % 4 === 0
          : isGregorianLeap(year);
  return month === 2 ? (leap ? 29 : 28) : CUMULATIVE_DAYS[month] - CUMULATIVE_DAYS[month - 1];
}
