/**
 * Local days in IANA zones with daylight saving vs Python's zoneinfo (tz database, PEP 615), over a whole year:
 * Europe/Lisbon (UTC+0/+1, changes at 01:00 UTC), Africa/Cairo (its spring change skips local midnight) and
 * America/Santiago (southern hemisphere). Hourly period-ending steps and 6-hourly instantaneous samples.
 */
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { regionClock } from '../../src/core/local-clock.ts';
import { planLocalDays, stepIntervals } from '../../src/read/daily.ts';

const SCRIPT = join(import.meta.dirname, 'local_days_zoneinfo.py');
const HOUR = 3_600_000;
const T0 = Date.UTC(2026, 0, 1, 0);

function series(stepHours: number, periodEnding: boolean) {
  const n = (366 * 24) / stepHours;
  const stampsMs = Float64Array.from({ length: n }, (_, i) => T0 + (i + (periodEnding ? 1 : 0)) * stepHours * HOUR);
  return stepIntervals({ stampsMs, boundsMs: null, referenceMs: T0, periodEndingAtStamp: periodEnding, accumulated: false });
}

describe('local days by IANA time zone vs zoneinfo', () => {
  it.each([
    ['Europe/Lisbon', 1, true],
    ['Africa/Cairo', 1, true],
    ['America/Santiago', 1, true],
    ['Europe/Lisbon', 6, false],
    ['Africa/Cairo', 6, false],
    ['America/Santiago', 6, false],
  ] as const)('%s, %i-hourly steps (period-ending %s): same kept days and step → day as zoneinfo', (zone, stepHours, periodEnding) => {
    const iv = series(stepHours, periodEnding);
    const plan = planLocalDays(iv, regionClock({ utcOffsetHours: 0, timeZone: zone }));
    const ref = JSON.parse(
      execFileSync('/usr/bin/python3', [SCRIPT], {
        input: JSON.stringify({ zone, start_ms: [...iv.startMs], end_ms: [...iv.endMs] }),
      }).toString(),
    ) as { days: string[]; day_of_step: number[] };
    expect(plan.days).toEqual(ref.days);
    expect([...plan.dayOfStep]).toEqual(ref.day_of_step);
    expect(plan.days.length).toBeGreaterThan(360);
  });

  it('the Lisbon spring day has 23 hourly steps and the autumn day 25 (DST followed, tz database 2026 rules)', () => {
    const plan = planLocalDays(series(1, true), regionClock({ utcOffsetHours: 0, timeZone: 'Europe/Lisbon' }));
    const steps = (day: string) => [...plan.dayOfStep].filter((d) => d === plan.days.indexOf(day)).length;
    expect([steps('2026-03-29'), steps('2026-10-25'), steps('2026-07-01')]).toEqual([23, 25, 24]);
  });
});
