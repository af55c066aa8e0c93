/** Calendar arithmetic on `YYYY-MM-DD` strings (proleptic Gregorian, no time zone, no clock). */
import type { IsoDate } from '../types.ts';

const DAY_MS = 86_400_000;

function toUtcMs(date: IsoDate): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
  if (!m) throw new RangeError(`not a YYYY-MM-DD date: "${date}"`);
  return Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
}

export function addDays(date: IsoDate, days: number): IsoDate {
  return new Date(toUtcMs(date) + days * DAY_MS).toISOString().slice(0, 10);
}

export function daysInMonth(year: number, month1: number): number {
  return new Date(Date.UTC(year, month1, 0)).getUTCDate();
}

/** `YYYY-MM` of a date. */
export function monthOf(date: IsoDate): string {
  return date.slice(0, 7);
}

/** `YYYY-MM` shifted by `months` (may be negative). */
export function addMonths(yearMonth: string, months: number): string {
  const y = Number(yearMonth.slice(0, 4));
  const m = Number(yearMonth.slice(5, 7)) - 1 + months;
  const yy = y + Math.floor(m / 12);
  const mm = ((m % 12) + 12) % 12;
  return `${String(yy).padStart(4, '0')}-${String(mm + 1).padStart(2, '0')}`;
}

/** All dates of a `YYYY-MM` month. */
export function datesOfMonth(yearMonth: string): IsoDate[] {
  const n = daysInMonth(Number(yearMonth.slice(0, 4)), Number(yearMonth.slice(5, 7)));
  return Array.from({ length: n }, (_, i) => `${yearMonth}-${String(i + 1).padStart(2, '0')}`);
}

/**
 * Slot 0..365 of a date in a 366-day calendar where 29 February is slot 59 and 1 March is always slot 60,
 * so the same month-day shares a slot in leap and common years.
 */
export function dayOfYearSlot(date: IsoDate): number {
  const ms = toUtcMs(date);
  const y = new Date(ms).getUTCFullYear();
  const slot = Math.round((ms - Date.UTC(y, 0, 1)) / DAY_MS);
  const leap = daysInMonth(y, 2) === 29;
  return !leap && slot >= 59 ? slot + 1 : slot;
}
