/**
 * Lead axes counted in months, as seasonal archives write monthly means: a lead coordinate
 * (`leadtime`, `forecast_period`, …) in units of `months`, and the C3S-style index `forecastMonth` (1..6, month 1 =
 * the month of the reference time, as the Copernicus C3S seasonal monthly products number it; no units). CF 1.11
 * §4.4 advises against `months` as a time unit because UDUNITS' month is a fixed 1/12 year; seasonal files use it
 * for calendar months, and so does Forelight: a lead of x months lies x calendar months after the reference time,
 * counted in the reference's own calendar (its `calendar`, Gregorian for an ISO 8601 reference attribute). So
 * `forecastMonth` k is the months lead with bounds [k−1, k]. The months are then judged as for an absolute axis
 * (monthly.ts: bounds spanning whole months; without bounds, the month holding each stamp, or, when every lead is
 * a whole number of months and the first is after the reference time, the month each closes). Common practice of
 * seasonal archives, no source beyond CF's warning.
 */
import { InputError } from '../core/errors.ts';
import { daysInCalendarMonth, toDayNumber } from '../core/calendar-days.ts';
import { CfDateTime } from './cf-time.ts';
import type { TimeAxis } from './time-axis-shape.ts';
import type { VariableInfo } from './dataset.ts';
import { detectMonths } from './monthly.ts';

const MONTH_UNITS = ['months', 'month', 'mon', 'mons'];
const INDEX_NAMES = ['forecastmonth', 'forecast_month'];
const DAY_S = 86_400;

const unitsOf = (v: VariableInfo): string => {
  const u = v.attributes.units;
  return typeof u === 'string' ? u.trim().toLowerCase() : '';
};

/** The C3S-style month index `forecastMonth` (1-D, no time units). */
export function isMonthIndex(v: VariableInfo): boolean {
  return v.dimensions.length === 1 && INDEX_NAMES.includes(v.name.toLowerCase()) && !/ since /.test(unitsOf(v));
}

/** Whether a lead coordinate counts months (units `months`). */
export function countsMonths(v: VariableInfo): boolean {
  return MONTH_UNITS.includes(unitsOf(v));
}

/** The date `offset` calendar months (fractional = that share of the month's days) after the start of `origin`'s month. */
function monthsAfter(origin: CfDateTime, offset: number): CfDateTime {
  const whole = Math.floor(offset);
  const index = origin.year * 12 + origin.month - 1 + whole;
  const [year, month] = [Math.floor(index / 12), (index % 12) + 1];
  const days = (offset - whole) * daysInCalendarMonth(origin.calendar, year, month);
  const seconds = Math.round((days - Math.floor(days)) * DAY_S);
  return new CfDateTime(
    origin.calendar,
    year,
    month,
    1 + Math.floor(days),
    Math.floor(seconds / 3600),
    Math.floor(seconds / 60) % 60,
    seconds % 60,
  );
}

/** Real ms of a date of the reference's calendar: the reference instant plus the model time elapsed since it. */
function realMs(date: CfDateTime, origin: CfDateTime, referenceMs: number): number {
  const secondsOf = (d: CfDateTime) => toDayNumber(d.calendar, d.year, d.month, d.day) * DAY_S + (d.hour * 60 + d.minute) * 60 + d.second;
  return referenceMs + (secondsOf(date) - secondsOf(origin)) * 1000;
}

/**
 * The time axis of a lead coordinate in months (or a `forecastMonth` index) from its values and bounds.
 * @throws InputError naming file and variable when the reference time is not at the start of a month, or the
 *   leads are not one value per consecutive month.
 */
export function monthLeadAxis(
  file: string,
  lead: VariableInfo,
  values: Float64Array,
  bounds: Float64Array | null,
  origin: CfDateTime,
  referenceMs: number,
): TimeAxis {
  if (origin.day !== 1 || origin.hour !== 0 || origin.minute !== 0 || origin.second !== 0) {
    throw new InputError(
      'time-units',
      file,
      `lead '${lead.name}' counts months from the reference time ${origin.toIsoString()}, which is not the start of a month`,
      'give the lead in days or hours (CF 1.11 §4.4), or a reference time at 00:00 of day 1',
    );
  }
  const index = isMonthIndex(lead);
  const offsets = index ? values.map((k) => k - 0.5) : values;
  const edges = index ? Float64Array.from(Array.from(values).flatMap((k) => [k - 1, k])) : bounds;
  const stamps = Array.from(offsets, (x) => monthsAfter(origin, x));
  const edgeDates = edges && Array.from(edges, (x) => monthsAfter(origin, x));
  const stampsMs = Float64Array.from(stamps, (d) => realMs(d, origin, referenceMs));
  const months = detectMonths(stamps, edgeDates, referenceMs, stampsMs);
  if (!months) {
    throw new InputError(
      'time-units',
      file,
      `lead '${lead.name}' in months (${Array.from(values).join(', ')}) is not one value per consecutive month`,
      'provide one lead per month, consecutive (e.g. 1 to 6), or bounds spanning whole months',
    );
  }
  return {
    dimension: lead.dimensions[0],
    variable: lead.name,
    stampsMs,
    boundsMs: edgeDates && Float64Array.from(edgeDates, (d) => realMs(d, origin, referenceMs)),
    months,
  };
}
