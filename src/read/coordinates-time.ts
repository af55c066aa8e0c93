/**
 * Time coordinates → milliseconds since 1970-01-01T00:00Z. Absolute times (`<unit> since <date>`, any CF
 * calendar) are decoded by cf-time.ts and placed on the proleptic Gregorian timeline by their calendar
 * components (so a 360_day or noleap date keeps its printed day); lead times (CF §4.4 forecast_period) are
 * plain durations.
 */
import { InputError, UnitError } from '../core/errors.ts';
import { decodeTimes } from './cf-time.ts';

const UNIT_MS: Readonly<Record<string, number>> = {
  second: 1000, seconds: 1000, sec: 1000, secs: 1000, s: 1000,
  minute: 60_000, minutes: 60_000, min: 60_000, mins: 60_000,
  hour: 3_600_000, hours: 3_600_000, hr: 3_600_000, hrs: 3_600_000, h: 3_600_000,
  day: 86_400_000, days: 86_400_000, d: 86_400_000,
};

/** Length in ms of a duration unit ("hours", "days", …) of a lead-time coordinate. */
export function durationUnitMs(units: string, file: string, variable: string): number {
  const ms = UNIT_MS[units.trim().toLowerCase()];
  if (ms === undefined) {
    throw new InputError('time-units', file, `lead-time variable '${variable}' has units '${units}', expected seconds, minutes, hours or days`,
      'fix the units attribute of the lead-time coordinate');
  }
  return ms;
}

/**
 * Decodes `values` of a time variable with CF `units`/`calendar` into ms.
 * @throws InputError naming file and variable when the units or calendar are not understood, or a date does
 * not exist in the Gregorian calendar (e.g. 30 February of a 360_day calendar).
 */
export function decodeTimesToMs(values: Float64Array, units: string, calendar: string | undefined, file: string, variable: string): Float64Array {
  let dates;
  try {
    dates = decodeTimes(values, units, calendar);
  } catch (err) {
    if (!(err instanceof UnitError)) throw err;
    throw new InputError('time-units', file, `time variable '${variable}': ${err.message}`, '', { cause: err });
  }
  const out = new Float64Array(dates.length);
  dates.forEach((d, i) => {
    const ms = d.gregorianMs();
    if (ms === undefined) {
      throw new InputError('time-calendar', file, `time variable '${variable}' holds ${d.toIsoDate()} (${d.calendar} calendar), which is not a Gregorian date`,
        'convert the file to the standard calendar first (e.g. cdo setcalendar,standard)');
    }
    out[i] = Math.round(ms);
  });
  return out;
}
