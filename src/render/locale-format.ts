/**
 * Locale-aware formatting of dates and percentages for bulletins. Dates are local calendar days (`YYYY-MM-DD`)
 * and are formatted as UTC midnights so that the machine's own time zone never shifts them.
 */
import type { IsoDate } from '../types.ts';

/** BCP 47 tag used for Intl: English bulletins use day-month-year order (en-GB); other locales as given. */
export function toIntlLocale(locale: string): string {
  return locale === 'en' ? 'en-GB' : locale;
}

function utcDay(day: IsoDate): Date {
  const d = new Date(`${day}T00:00:00Z`);
  if (Number.isNaN(d.getTime())) throw new RangeError(`not a calendar date: ${JSON.stringify(day)}`);
  return d;
}

/** "30 Nov 2026" / "30 nov. 2026". */
export function formatDay(locale: string, day: IsoDate): string {
  return new Intl.DateTimeFormat(toIntlLocale(locale), { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' }).format(
    utcDay(day),
  );
}

/** "Tue 1 Dec" for one day, "1–7 Dec" or "28 Dec – 3 Jan" for a range (year omitted). */
export function formatDayRange(locale: string, start: IsoDate, end: IsoDate): string {
  const tag = toIntlLocale(locale);
  if (start === end) {
    return new Intl.DateTimeFormat(tag, { weekday: 'short', day: 'numeric', month: 'short', timeZone: 'UTC' }).format(utcDay(start));
  }
  return new Intl.DateTimeFormat(tag, { day: 'numeric', month: 'short', timeZone: 'UTC' }).formatRange(utcDay(start), utcDay(end));
}

/** Whole percent of a 0..1 fraction, with the locale's spacing: "60%" (en), "60 %" (fr). NaN → "–". */
export function formatPercent(locale: string, fraction: number): string {
  if (!Number.isFinite(fraction)) return '–';
  return new Intl.NumberFormat(toIntlLocale(locale), { style: 'percent', maximumFractionDigits: 0 }).format(fraction);
}

/** A number with `minDigits`..`digits` decimals in the locale ("0.74" / "0,74"). */
export function formatNumber(locale: string, value: number, digits: number, minDigits = 0): string {
  if (!Number.isFinite(value)) return '–';
  return new Intl.NumberFormat(toIntlLocale(locale), { minimumFractionDigits: minDigits, maximumFractionDigits: digits }).format(value);
}

export const UNIT_SYMBOLS: Readonly<Record<string, string>> = {
  degC: '°C',
  degC2: '°C²',
  'degC^2': '°C²',
  'mm/day': 'mm/day',
  '%': '%',
  '1': '',
};

/** Threshold as printed: "35 °C" from `{value: 35, units: 'degC'}`. */
export function formatThreshold(locale: string, value: number, units: string): string {
  const symbol = UNIT_SYMBOLS[units] ?? units;
  return `${formatNumber(locale, value, 1)}${symbol ? `\u00a0${symbol}` : ''}`;
}
