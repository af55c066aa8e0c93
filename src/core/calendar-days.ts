/**
 * Day arithmetic in the CF calendars (Eaton et al., "NetCDF Climate and Forecast (CF) Metadata Conventions" 1.11,
 * §4.4.1): day numbers, dates of day numbers and month lengths, for the read stage (time decoding) and for the
 * stages that form model-calendar months (indicators, calibrate). Julian Day Numbers after Richards, E.G. (2013),
 * "Calendars", Explanatory Supplement to the Astronomical Almanac, 3rd ed., §15.11.
 */
import type { IsoDate, ModelCalendarName, ModelDays } from '../types.ts';

/** A CF calendar (`gregorian` is read as `standard`, `365_day` as `noleap`, `366_day` as `all_leap`). */
export type CalendarName = 'standard' | 'proleptic_gregorian' | ModelCalendarName;

const CUMULATIVE_DAYS = [0, 31, 59, 90, 120, 151, 181, 212, 243, 273, 304, 334, 365];
const JDN_GREGORIAN_START = 2299161; // 1582-10-15 (Gregorian) = 1582-10-05 (Julian) + 10 days

export function isGregorianLeap(y: number): boolean {
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
export function toDayNumber(calendar: CalendarName, y: number, m: number, d: number): number {
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
export function fromDayNumber(calendar: CalendarName, n: number): [number, number, number] {
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

/** Days in month `month` (1-12) of `year` in `calendar` (CF §4.4.1). */
export function daysInCalendarMonth(calendar: CalendarName, year: number, month: number): number {
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

const ymd = ([y, m, d]: readonly number[]): string =>
  `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`;

/**
 * Every day of model month `yearMonth` (`YYYY-MM`) of a model-calendar series, as real dates and as model dates,
 * from the fixed shift between the series' first real day and its model date (src/read/DECISIONS.md §3).
 */
export function modelMonthDays(model: ModelDays, firstRealDay: IsoDate, yearMonth: string): { real: IsoDate[]; model: string[] } {
  const dayNumber = (calendar: CalendarName, date: string) => {
    const [y, m, d] = date.split('-').map(Number);
    return toDayNumber(calendar, y, m, d);
  };
  const shift = dayNumber(model.calendar, model.days[0]) - dayNumber('proleptic_gregorian', firstRealDay);
  const [y, m] = yearMonth.split('-').map(Number);
  const first = toDayNumber(model.calendar, y, m, 1);
  const numbers = Array.from({ length: daysInCalendarMonth(model.calendar, y, m) }, (_, k) => first + k);
  return {
    real: numbers.map((n) => ymd(fromDayNumber('proleptic_gregorian', n - shift))),
    model: numbers.map((n) => ymd(fromDayNumber(model.calendar, n))),
  };
}
