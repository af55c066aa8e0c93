/**
 * Cron slots across daylight-saving changes. Transition instants come from the IANA tz database as shipped
 * in Node's ICU: EU zones change on the last Sunday of March and October at 01:00 UTC (Directive 2000/84/EC);
 * Chile (America/Santiago) springs forward at local midnight on the first Saturday→Sunday of September 2026
 * and falls back on the first Saturday→Sunday of April 2027 (tzdata, "Chile" rules).
 */
import { execFileSync } from 'node:child_process';
import cron from 'node-cron';
import { describe, expect, it } from 'vitest';
import { checkValues } from '../../src/config/check-values.ts';
import { computeNextRuns, wallTimeToInstant } from '../../src/core/next-runs.ts';

const local = (d: Date, tz: string) => d.toLocaleString('sv-SE', { timeZone: tz });
const localDay = (d: Date, tz: string) => local(d, tz).slice(0, 10);

function oncePerDay(runs: Date[], tz: string) {
  const days = runs.map((d) => localDay(d, tz));
  expect(new Set(days).size).toBe(days.length);
  for (let i = 1; i < runs.length; i++) expect(runs[i].getTime()).toBeGreaterThan(runs[i - 1].getTime());
}

describe('computeNextRuns across DST (IANA tzdata via Node ICU)', () => {
  it('Europe/Berlin 02:30 daily: spring-forward day runs once at 03:30 CEST, fall-back day once at the first 02:30', () => {
    const spring = computeNextRuns('30 2 * * *', 'Europe/Berlin', new Date('2026-03-27T12:00:00Z'), 4);
    expect(spring.map((d) => d.toISOString())).toEqual([
      '2026-03-28T01:30:00.000Z', // 02:30 CET (+1)
      '2026-03-29T01:30:00.000Z', // 02:30 does not exist; 03:30 CEST (+2)
      '2026-03-30T00:30:00.000Z', // 02:30 CEST
      '2026-03-31T00:30:00.000Z',
    ]);
    oncePerDay(spring, 'Europe/Berlin');
    const autumn = computeNextRuns('30 2 * * *', 'Europe/Berlin', new Date('2026-10-24T12:00:00Z'), 3);
    expect(autumn.map((d) => d.toISOString())).toEqual([
      '2026-10-25T00:30:00.000Z', // first 02:30 (CEST); the repeated 02:30 CET at 01:30Z is not used
      '2026-10-26T01:30:00.000Z',
      '2026-10-27T01:30:00.000Z',
    ]);
    oncePerDay(autumn, 'Europe/Berlin');
  });

  it('Europe/Lisbon 01:30 (inside the 01:00–02:00 local gap/overlap) runs once each day', () => {
    const spring = computeNextRuns('30 1 * * *', 'Europe/Lisbon', new Date('2026-03-28T12:00:00Z'), 2);
    expect(spring.map((d) => local(d, 'Europe/Lisbon'))).toEqual(['2026-03-29 02:30:00', '2026-03-30 01:30:00']);
    const autumn = computeNextRuns('30 1 * * *', 'Europe/Lisbon', new Date('2026-10-24T12:00:00Z'), 2);
    expect(autumn.map((d) => d.toISOString())).toEqual(['2026-10-25T00:30:00.000Z', '2026-10-26T01:30:00.000Z']);
  });

  it('America/Santiago 00:30 daily: one run on the spring-forward day (Sep 2026) and the fall-back day (Apr 2027)', () => {
    const spring = computeNextRuns('30 0 * * *', 'America/Santiago', new Date('2026-09-04T12:00:00Z'), 3);
    expect(spring.map((d) => local(d, 'America/Santiago'))).toEqual(['2026-09-05 00:30:00', '2026-09-06 01:30:00', '2026-09-07 00:30:00']);
    const autumn = computeNextRuns('30 23 * * *', 'America/Santiago', new Date('2027-04-02T12:00:00Z'), 3);
    oncePerDay(autumn, 'America/Santiago');
    expect(autumn.map((d) => local(d, 'America/Santiago'))).toEqual(['2027-04-02 23:30:00', '2027-04-03 23:30:00', '2027-04-04 23:30:00']);
  });

  it('twice-weekly Mon/Thu 06:00 in Berlin keeps 06:00 local across the October change', () => {
    const runs = computeNextRuns('0 6 * * 1,4', 'Europe/Berlin', new Date('2026-10-19T00:00:00Z'), 4);
    expect(runs.map((d) => local(d, 'Europe/Berlin'))).toEqual([
      '2026-10-19 06:00:00',
      '2026-10-22 06:00:00',
      '2026-10-26 06:00:00',
      '2026-10-29 06:00:00',
    ]);
    expect(runs[2].toISOString()).toBe('2026-10-26T05:00:00.000Z');
  });

  it('agrees with node-cron getNextRuns where there is no DST (Africa/Lagos, sample issue days Mon/Thu)', () => {
    // node-cron computes from the wall clock; compare its next 6 against ours from the same instant.
    const task = cron.createTask('0 6 * * 1,4', () => {}, { timezone: 'Africa/Lagos' });
    const from = new Date();
    const theirs = task.getNextRuns(6).map((d) => d.toISOString());
    expect(computeNextRuns('0 6 * * 1,4', 'Africa/Lagos', from, 6).map((d) => d.toISOString())).toEqual(theirs);
    task.destroy();
  });

  it('resolves ambiguous and skipped wall times like Temporal "compatible"', () => {
    expect(new Date(wallTimeToInstant('Europe/Berlin', Date.UTC(2026, 2, 29, 2, 30))).toISOString()).toBe('2026-03-29T01:30:00.000Z');
    expect(new Date(wallTimeToInstant('Europe/Berlin', Date.UTC(2026, 9, 25, 2, 30))).toISOString()).toBe('2026-10-25T00:30:00.000Z');
  });

  it('rejects bad expressions and zones with one line naming the setting', () => {
    expect(() => computeNextRuns('61 2 * * *', 'Europe/Berlin', new Date(), 1)).toThrow(
      /^schedule\.cron: "61 2 \* \* \*" is not a valid cron expression/,
    );
    expect(() => computeNextRuns('0 6 * * *', 'Veloria/Kessan', new Date(), 1)).toThrow(
      /^schedule\.timezone: unknown IANA time zone "Veloria\/Kessan"/,
    );
  });

  it('`forelight check` refuses what the service cannot schedule: node-cron accepts L, the config check does not', () => {
    expect(cron.validate('0 7 L * *')).toBe(true); // node-cron alone would let it through
    const problems = checkValues({ schedule: { cron: '0 7 L * *', timezone: 'Etc/GMT-1' } });
    expect(problems.map((p) => `${p.pointer}: ${p.message} — ${p.fix}`)).toEqual([
      '/schedule/cron: "0 7 L * *" uses L, W or # day tokens, which Forelight does not schedule — list the days instead',
    ]);
    expect(() => computeNextRuns('0 7 L * *', 'Etc/GMT-1', new Date(), 1)).toThrow('schedule.cron: "0 7 L * *" uses L, W or # day tokens');
  });

  it('`forelight check` refuses croner extensions classic cron lacks (? and the + AND modifier), a year field and a day that never comes', () => {
    const check = (expr: string) => checkValues({ schedule: { cron: expr, timezone: 'Etc/GMT-1' } }).map((p) => p.message);
    expect(check('0 7 1 * +1')).toEqual(['"0 7 1 * +1" uses ? or +, which classic cron does not have']);
    expect(check('0 7 ? * 1')).toEqual(['"0 7 ? * 1" uses ? or +, which classic cron does not have']);
    expect(check('0 0 7 * * * 2027')).toEqual(['"0 0 7 * * * 2027" is not a valid cron expression']);
    expect(check('0 7 30 2 *')).toEqual(['"0 7 30 2 *" never fires (no month has that day)']);
    expect(check('0 7 * * WED')).toEqual([]); // the W of a weekday name is not the W token
  });
});

/**
 * Day-of-month × day-of-week. POSIX crontab (IEEE Std 1003.1-2017, crontab, "Input Files"): when both fields are
 * given as elements or lists, a day matching EITHER is matched (Vixie cron does the same); a `*` field restricts
 * nothing. The expected instants come from /usr/bin/python3 applying that rule with zoneinfo (IANA tzdata).
 */
describe('computeNextRuns: classic cron OR rule for day-of-month and day-of-week', () => {
  function pythonSlots(tz: string, doms: number[] | null, dows: number[] | null, n: number): string[] {
    const script = `
import datetime, json, sys, zoneinfo
tz = zoneinfo.ZoneInfo(sys.argv[1]); doms = json.loads(sys.argv[2]); dows = json.loads(sys.argv[3]); n = int(sys.argv[4])
day, out = datetime.date(2026, 12, 1), []
while len(out) < n:
    dom_ok = doms is None or day.day in doms
    dow_ok = dows is None or day.isoweekday() % 7 in dows
    # both restricted: either matches; one restricted: that one decides
    ok = (dom_ok or dow_ok) if (doms is not None and dows is not None) else (dom_ok and dow_ok)
    if ok:
        out.append(datetime.datetime(day.year, day.month, day.day, 6, tzinfo=tz).astimezone(datetime.timezone.utc).strftime('%Y-%m-%dT%H:%M:%S.000Z'))
    day += datetime.timedelta(days=1)
print(json.dumps(out))`;
    return JSON.parse(
      execFileSync('/usr/bin/python3', ['-c', script, tz, JSON.stringify(doms), JSON.stringify(dows), String(n)], { encoding: 'utf8' }),
    ) as string[];
  }
  const from = new Date('2026-11-30T12:00:00Z');
  const iso = (runs: Date[]) => runs.map((d) => d.toISOString());

  it('"0 6 1,15 * 1" runs on the 1st, the 15th AND every Monday (not only on Mondays that are the 1st or 15th)', () => {
    const runs = iso(computeNextRuns('0 6 1,15 * 1', 'Africa/Lagos', from, 8));
    expect(runs).toEqual(pythonSlots('Africa/Lagos', [1, 15], [1], 8));
    // 2026-12-01 is a Tuesday and 2027-01-01 a Friday: they come from day-of-month alone.
    expect(runs).toContain('2026-12-01T05:00:00.000Z');
    expect(runs).toContain('2027-01-01T05:00:00.000Z');
    expect(runs).toContain('2026-12-07T05:00:00.000Z');
  });

  it('a ranged day-of-month with named weekdays is still OR; a * field leaves the other alone (Europe/Berlin, winter)', () => {
    expect(iso(computeNextRuns('0 6 1-3 * SAT,SUN', 'Europe/Berlin', from, 10))).toEqual(
      pythonSlots('Europe/Berlin', [1, 2, 3], [6, 0], 10),
    );
    expect(iso(computeNextRuns('0 6 * * 1', 'Europe/Berlin', from, 5))).toEqual(pythonSlots('Europe/Berlin', null, [1], 5));
    expect(iso(computeNextRuns('0 6 1,15 * *', 'Europe/Berlin', from, 5))).toEqual(pythonSlots('Europe/Berlin', [1, 15], null, 5));
  });
});
