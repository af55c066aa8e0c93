/**
 * Time coordinates → milliseconds since 1970-01-01T00:00Z (the real, Gregorian timeline).
 * `standard`/`gregorian` and `proleptic_gregorian` dates keep their date components. Model calendars
 * (`julian`, `noleap`/`365_day`, `all_leap`/`366_day`, `360_day`, CF 1.11 §4.4.1) are placed by ELAPSED TIME
 * from one anchor per file: the anchor (the forecast reference time, else the first time read) keeps its date
 * components (a 360_day 2026-11-01 is 1 November 2026), every other time is the anchor plus the model time
 * elapsed since it, so lead day k of the model is lead day k in the bulletin. An anchor that does not exist in the
 * Gregorian calendar (29 February of a common year, 30 February) is moved back to the last day of that month.
 * Lead times (CF §4.4 forecast_period) are plain durations.
 */
import { InputError, UnitError } from '../core/errors.ts';
import type { ModelCalendarName } from '../types.ts';
import { fromDayNumber, toDayNumber } from '../core/calendar-days.ts';
import { calendarSeconds, decodeTimes, secondsPerUnit, type CfCalendar, type CfDateTime } from './cf-time.ts';

/** Length in ms of a duration unit ("hours", "days", …) of a lead-time coordinate (the units of cf-time.ts). */
export function durationUnitMs(units: string, file: string, variable: string): number {
  const seconds = secondsPerUnit(units.trim());
  if (seconds === undefined) {
    throw new InputError(
      'time-units',
      file,
      `lead-time variable '${variable}' has units '${units}', expected days, hours, minutes, seconds, milliseconds or microseconds`,
      'fix the units attribute of the lead-time coordinate',
    );
  }
  return seconds * 1000;
}

/** A model calendar of a file and the model date of a real (local) day `YYYY-MM-DD`. */
export interface FileModelCalendar {
  readonly calendar: ModelCalendarName;
  dayOf(realDay: string): string;
}

const GREGORIAN: readonly CfCalendar[] = ['standard', 'proleptic_gregorian'];

function realMsOf(date: CfDateTime): number {
  const ms = date.gregorianMs();
  if (ms !== undefined) return ms;
  const d = new Date(0);
  d.setUTCFullYear(date.year, date.month, 0); // last day of the month
  d.setUTCFullYear(date.year, date.month - 1, Math.min(date.day, d.getUTCDate()));
  return d.getTime() + ((date.hour * 60 + date.minute) * 60 + date.second) * 1000;
}

/** One file's placement of times on the real timeline (one anchor shared by all its time variables). */
export class TimeMapper {
  private anchor: { seconds: number; ms: number; date: CfDateTime } | null = null;
  /** Calendar of the first time variable decoded. */
  calendar: CfCalendar | null = null;

  /**
   * Decodes `values` of a time variable with CF `units`/`calendar` into ms (rules in the module comment).
   * @throws InputError naming file and variable when the units or calendar are not understood.
   */
  toMs(values: Float64Array, units: string, calendar: string | undefined, file: string, variable: string): Float64Array {
    let dates: CfDateTime[];
    let line: { calendar: CfCalendar; seconds: Float64Array };
    try {
      dates = decodeTimes(values, units, calendar);
      line = calendarSeconds(values, units, calendar);
    } catch (err) {
      if (!(err instanceof UnitError)) throw err;
      throw new InputError('time-units', file, `time variable '${variable}': ${err.diagnostic.message}`, err.hint, { cause: err });
    }
    this.calendar ??= line.calendar;
    if (GREGORIAN.includes(line.calendar)) return Float64Array.from(dates, (d) => Math.round(d.gregorianMs() as number));
    if (dates.length > 0) this.anchor ??= { seconds: line.seconds[0], ms: realMsOf(dates[0]), date: dates[0] };
    const anchor = this.anchor;
    return line.seconds.map((s) => Math.round(anchor!.ms + (s - anchor!.seconds) * 1000));
  }

  /**
   * The file's model calendar and the model date (`YYYY-MM-DD`) of a real (local) day, or null for Gregorian
   * files. Every CF day has 86 400 s and the anchor keeps its time of day, so the model and real dates of one
   * instant differ by a fixed number of days, in UTC and in any local clock alike.
   */
  modelCalendar(): FileModelCalendar | null {
    const [anchor, calendar] = [this.anchor, this.calendar];
    if (!anchor || calendar === null || calendar === 'standard' || calendar === 'proleptic_gregorian') return null;
    const real = new Date(anchor.ms);
    const gregorianDay = (y: number, m: number, d: number) => toDayNumber('proleptic_gregorian', y, m, d);
    const shift =
      toDayNumber(calendar, anchor.date.year, anchor.date.month, anchor.date.day) -
      gregorianDay(real.getUTCFullYear(), real.getUTCMonth() + 1, real.getUTCDate());
    const pad = (n: number, w = 2) => String(n).padStart(w, '0');
    const dayOf = (realDay: string): string => {
      const [y, m, d] = realDay.split('-').map(Number);
      const [my, mm, md] = fromDayNumber(calendar, gregorianDay(y, m, d) + shift);
      return `${pad(my, 4)}-${pad(mm)}-${pad(md)}`;
    };
    return { calendar, dayOf };
  }

  /** How model-calendar times were placed (for run.json notes), or null for Gregorian files. */
  note(): string | null {
    if (!this.anchor || this.calendar === null || GREGORIAN.includes(this.calendar)) return null;
    const real = new Date(this.anchor.ms).toISOString().slice(0, 10);
    return `times in the ${this.calendar} calendar are placed on real dates by elapsed time from ${this.anchor.date.toIsoDate()} (model) = ${real} (real), so lead days, weeks and months are the model's (a month lead is a month of the ${this.calendar} calendar, shown by its real dates)`;
  }
}

/**
 * Steps must follow each other (CF 1.11 §5: a coordinate variable is strictly monotonic); a step that goes back or
 * repeats would put values on the wrong days or difference an accumulation against a later one.
 * @throws InputError `time-order` naming the file, the axis and the two steps.
 */
export function requireIncreasingSteps(file: string, axis: { variable: string; stampsMs: Float64Array }, absolute: boolean): void {
  const s = axis.stampsMs;
  const k = s.findIndex((t, i) => i > 0 && !(t > s[i - 1]));
  if (k < 0) return;
  const iso = (ms: number) => new Date(ms).toISOString().replace('.000Z', 'Z');
  const what = s[k] === s[k - 1] ? 'repeats' : 'goes back to';
  throw new InputError(
    'time-order',
    file,
    `'${axis.variable}' is not increasing: step ${k} ${what} ${iso(s[k])} after step ${k - 1} at ${iso(s[k - 1])}`,
    absolute && s[k] !== s[k - 1]
      ? `sort the steps (cdo sorttimestamp ${file} sorted.nc) and point the source at the sorted file`
      : 'ask the provider for the file again (each step must come once, in order)',
  );
}
