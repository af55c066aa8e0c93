/**
 * decodeTimes against cftime (Unidata) num2date, run at test time:
 * /usr/bin/python3 test/read-low/cftime-reference.py '<cases as JSON>'
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { UnitError } from '../../src/core/errors.ts';
import { decodeTimes } from '../../src/read/cf-time.ts';

const script = fileURLToPath(new URL('./cftime-reference.py', import.meta.url));

const CASES: [number[], string, string][] = [
  [[0, 6, 24, 36.5, 8760, -1], 'hours since 2026-11-23 00:00:00', 'standard'],
  [[20780, 20780.25, -0.5, 0.1], 'days since 1970-1-1T00:00:00Z', 'gregorian'],
  [[1.7e9, 86399.5, -1], 'seconds since 1970-01-01', 'standard'],
  [[0, 60, 1500], 'minutes since 2000-02-28 23:00', 'proleptic_gregorian'],
  [[0.1, 0.25], 'hours since 2000-1-1T00:00:00Z', 'gregorian'],
  [[0, 1.5], 'hours since 2026-11-23 00:00:00 +01:00', 'standard'],
  // Mixed Julian/Gregorian: 1582-10-04 (Julian) is followed by 1582-10-15 (Gregorian).
  [[0, 3, 4, 5, 10, -365, -36500], 'days since 1582-10-01', 'standard'],
  [[0, 3650, 36500, 200000], 'days since 1500-03-01 12:00:00', 'standard'],
  [[0, 3650, 36500, 200000], 'days since 1500-03-01 12:00:00', 'proleptic_gregorian'],
  [[0, 3650, 36500, 200000], 'days since 1500-03-01 12:00:00', 'julian'],
  [[58, 59, 60, 365, 1519, -1, -366], 'days since 2000-01-01', 'noleap'],
  [[58, 59, 60, 365], 'days since 2000-01-01', '365_day'],
  [[58, 59, 60, 366, -1, 1000], 'days since 2001-01-01', 'all_leap'],
  [[59, 366], 'days since 2001-01-01', '366_day'],
  [[29, 30, 59, 60, 359, 360, -1, 1000.5], 'days since 2000-01-01', '360_day'],
  [[1e6, 1.5e6], 'hours since 1850-01-01 00:00:00', 'noleap'],
  [[744, 1416.25], 'hours since 2026-11-01', '360_day'],
];

describe('decodeTimes', () => {
  it('matches cftime (Unidata) num2date for every calendar', () => {
    const expected = JSON.parse(execFileSync('/usr/bin/python3', [script, JSON.stringify(CASES)], { encoding: 'utf8' })) as string[][];
    CASES.forEach(([values, units, calendar], i) => {
      const got = decodeTimes(values, units, calendar).map((d) => d.toIsoString());
      expect(got, `${units} (${calendar})`).toEqual(expected[i]);
    });
  });

  it('returns calendar components that a Date cannot hold (360_day February 30; CF §4.4.1)', () => {
    const [feb30] = decodeTimes([59], 'days since 2000-01-01', '360_day');
    expect([feb30.year, feb30.month, feb30.day, feb30.calendar]).toEqual([2000, 2, 30, '360_day']);
    expect(feb30.toIsoDate()).toBe('2000-02-30');
    expect(feb30.gregorianMs()).toBeUndefined();
    const [leapOnly] = decodeTimes([59], 'days since 2001-01-01', 'all_leap');
    expect(leapOnly.toIsoDate()).toBe('2001-02-29');
    expect(leapOnly.gregorianMs()).toBeUndefined();
    // Same instant as JavaScript's Date.UTC for a standard-calendar time.
    const [t] = decodeTimes([30], 'hours since 2026-11-23 00:00:00', 'standard');
    expect(t.gregorianMs()).toBe(Date.UTC(2026, 10, 24, 6));
  });

  it('defaults to the standard calendar when the calendar attribute is absent (CF §4.4.1)', () => {
    expect(decodeTimes([4], 'days since 1582-10-01').map((d) => d.toIsoDate())).toEqual(['1582-10-15']);
  });

  it('names unknown units, unknown calendars and non-finite values in a UnitError', () => {
    expect(() => decodeTimes([0], 'months since 2000-01-01', 'standard')).toThrow(/time units 'months since 2000-01-01'/);
    expect(() => decodeTimes([0], 'days after 2000-01-01', 'standard')).toThrow(UnitError);
    expect(() => decodeTimes([0], 'days since yesterday', 'standard')).toThrow(UnitError);
    expect(() => decodeTimes([0], 'days since 2000-01-01', 'lunar')).toThrow(/unknown CF calendar 'lunar'/);
    expect(() => decodeTimes([NaN], 'days since 2000-01-01', 'standard')).toThrow(/time value NaN at index 0/);
  });
});
