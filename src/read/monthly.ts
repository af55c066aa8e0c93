/**
 * Files with one value per month (seasonal monthly means): which model month each step is, and its spread onto
 * the real days of the month of the same name, so that month-tier indicators read it directly.
 *
 * A step is a month when (CF 1.11 §7.1, §4.4.1):
 *  - its bounds run from day 1 00:00 of a month to day 1 00:00 of the next, in the file's calendar; or
 *  - without bounds, 2 or more stamps 27 to 32 days apart, each in the month after the previous one. The month is
 *    the one holding the stamp (mid-month or month-start stamps), except when every stamp is at 00:00 of day 1 and
 *    the first lies after the reference time: then each closes the month before it (the GRIB "over the
 *    preceding period" convention).
 * Model month (year, month) is shown as the real month (year, month). On its real days a mean (temperature,
 * humidity) keeps its value; a rate keeps the model month's total (value × model days / real days); a total
 * (mm in the month) is shared equally among the real days. So a monthly rain total is the mean rate times the
 * MODEL month length (30 days in every 360_day month).
 */
import { InputError } from '../core/errors.ts';
import { daysInMonth, datesOfMonth } from '../core/iso-dates.ts';
import type { CfDateTime } from './cf-time.ts';
import { daysInCalendarMonth } from '../core/calendar-days.ts';
import type { Tier } from '../types.ts';
import type { TemporalKind } from './units.ts';

export interface MonthSteps {
  /** `YYYY-MM` of each step in the file's calendar (= the real month of that name). */
  readonly months: readonly string[];
  /** Length of each step's month in the file's calendar, days. */
  readonly modelDays: readonly number[];
}

const DAY_MS = 86_400_000;
/** Spacing of monthly stamps without bounds: 28 to 31 days, with a day's slack for mid-month stamps. */
const MIN_MONTH_MS = 27 * DAY_MS;
const MAX_MONTH_MS = 32 * DAY_MS;

const label = (y: number, m: number): string => `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}`;
const monthIndex = (d: { year: number; month: number }): number => d.year * 12 + d.month - 1;
const atMonthStart = (d: CfDateTime): boolean => d.day === 1 && d.hour === 0 && d.minute === 0 && d.second === 0;

function fromIndex(i: number): { year: number; month: number } {
  return { year: Math.floor(i / 12), month: (i % 12) + 1 };
}

/** The model months of the steps, or null when the steps are not months (rules in the module comment). */
export function detectMonths(
  stamps: readonly CfDateTime[],
  bounds: readonly CfDateTime[] | null,
  referenceMs: number | null,
  stampsMs: Float64Array,
): MonthSteps | null {
  if (stamps.length === 0) return null;
  let indices: number[];
  if (bounds) {
    indices = stamps.map((_s, i) => monthIndex(bounds[2 * i]));
    const whole = stamps.every(
      (_s, i) => atMonthStart(bounds[2 * i]) && atMonthStart(bounds[2 * i + 1]) && monthIndex(bounds[2 * i + 1]) === indices[i] + 1,
    );
    if (!whole) return null;
  } else {
    if (
      stamps.length < 2 ||
      stampsMs.some((ms, i) => i > 0 && (ms - stampsMs[i - 1] < MIN_MONTH_MS || ms - stampsMs[i - 1] > MAX_MONTH_MS))
    )
      return null;
    const endStamped = stamps.every(atMonthStart) && referenceMs !== null && stampsMs[0] > referenceMs;
    indices = stamps.map((s) => monthIndex(s) - (endStamped ? 1 : 0));
    if (indices.some((m, i) => i > 0 && m !== indices[i - 1] + 1)) return null;
  }
  const calendar = stamps[0].calendar;
  return {
    months: indices.map((i) => label(fromIndex(i).year, fromIndex(i).month)),
    modelDays: indices.map((i) => daysInCalendarMonth(calendar, fromIndex(i).year, fromIndex(i).month)),
  };
}

/** Factor from a month's value to each of its real days' values, by how the quantity is stored. */
function dayFactor(kind: TemporalKind, modelDays: number, realDays: number): number {
  if (kind === 'rate') return modelDays / realDays;
  if (kind === 'amount' || kind === 'accumulation') return 1 / realDays;
  return 1;
}

/**
 * Spreads member-major `[member][month]` values onto the real days of consecutive months.
 * @throws InputError when the months are not consecutive (a gap would make lead months wrong).
 */
export function spreadMonthsToDays(
  file: string,
  variable: string,
  months: MonthSteps,
  kind: TemporalKind,
  data: Float64Array,
): { days: string[]; data: Float64Array } {
  const n = months.months.length;
  for (let i = 1; i < n; i++) {
    const [y0, m0] = months.months[i - 1].split('-').map(Number);
    const [y1, m1] = months.months[i].split('-').map(Number);
    if (y1 * 12 + m1 !== y0 * 12 + m0 + 1) {
      throw new InputError(
        'months-gap',
        file,
        `variable '${variable}' jumps from ${months.months[i - 1]} to ${months.months[i]}`,
        'provide consecutive monthly values (one per month)',
      );
    }
  }
  const days = months.months.flatMap(datesOfMonth);
  const members = data.length / n;
  const out = new Float64Array(members * days.length);
  for (let m = 0; m < members; m++) {
    let d = m * days.length;
    for (let i = 0; i < n; i++) {
      const [y, mo] = months.months[i].split('-').map(Number);
      const real = daysInMonth(y, mo);
      const v = data[m * n + i] * dayFactor(kind, months.modelDays[i], real);
      out.fill(v, d, d + real);
      d += real;
    }
  }
  return { days, data: out };
}

/** A file of monthly values feeds month-tier indicators only (its days would all repeat the month's value). */
export function requireMonthTier(file: string, variable: string, tier: Tier | undefined): void {
  if (tier === undefined || tier === 'months') return;
  throw new InputError(
    'monthly-values',
    file,
    `variable '${variable}' holds one value per month, which cannot feed the '${tier}' tier`,
    "set 'tier: months' for this source in sources[] (month-tier indicators read it directly)",
  );
}

/** `spreadMonthsToDays` for the region means of one variable (labels become the real days). */
export function spreadMeansToDays(
  file: string,
  variable: string,
  months: MonthSteps,
  kind: TemporalKind,
  means: readonly { labels: readonly string[]; data: Float64Array }[],
): { labels: string[]; data: Float64Array }[] {
  return means.map((mean) => {
    const spread = spreadMonthsToDays(file, variable, months, kind, mean.data);
    return { labels: spread.days, data: spread.data };
  });
}

/** The run.json note for a monthly variable. */
export function monthlyNote(variable: string, months: MonthSteps, kind: TemporalKind): string {
  const how =
    kind === 'rate'
      ? 'its monthly total is the mean rate times the model month length'
      : kind === 'state'
        ? 'the monthly value holds for each day'
        : 'the monthly total is shared among the real days';
  return `'${variable}' holds one value per month (${months.months[0]} to ${months.months[months.months.length - 1]}); each model month is the real month of that name and ${how}`;
}
