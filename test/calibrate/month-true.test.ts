/**
 * Month-true pooling of the months tier (src/calibrate/month-true.ts): starts whose month 1 is another calendar
 * month are not pooled by lead position; when too few years would remain, the mixing is said (climate-mixed-months).
 * Lead months from aggregateToLeads on invented daily series (Veloria sample world, no real data).
 */
import { describe, expect, it } from 'vitest';
import { aggregateToLeads } from '../../src/calibrate/lead-tiers.ts';
import { sameLeadMonths } from '../../src/calibrate/month-true.ts';
import type { IndicatorSeries } from '../../src/types.ts';

/** Month leads of a 120-day, 2-member series starting the day after `start` (YYYY-MM-DD) in `year`. */
function entry(year: number, start: string) {
  const first = Date.UTC(year, Number(start.slice(5, 7)) - 1, Number(start.slice(8, 10)) + 1);
  const days = Array.from({ length: 120 }, (_, i) => new Date(first + i * 86_400_000).toISOString().slice(0, 10));
  const series: IndicatorSeries = {
    region: 'kessan-lowlands',
    indicator: 'tmax-3day',
    units: 'degC',
    days,
    members: 2,
    data: new Float64Array(240).fill(30),
    outOfRange: 0,
    missing: 0,
  };
  return { year, start, leads: aggregateToLeads(series, 'months', 'mean') };
}

const years = Array.from({ length: 20 }, (_, i) => 2006 + i);

/**
 * Month leads of a 120-day series in the 360_day calendar (CF 1.11 §4.4.1: twelve 30-day months) starting at model
 * date `year-mm-dd`, placed on real dates by elapsed days from the same real date (src/read/DECISIONS.md §3).
 */
function entry360(year: number, mmdd: string) {
  const [m0, d0] = mmdd.split('-').map(Number);
  const base = (m0 - 1) * 30 + d0 - 1;
  const pad = (n: number) => String(n).padStart(2, '0');
  const model = Array.from({ length: 120 }, (_, k) => {
    const n = base + k;
    return `${year + Math.floor(n / 360)}-${pad(Math.floor((n % 360) / 30) + 1)}-${pad((n % 30) + 1)}`;
  });
  const first = Date.UTC(year, m0 - 1, d0);
  const days = model.map((_, k) => new Date(first + k * 86_400_000).toISOString().slice(0, 10));
  const series: IndicatorSeries = {
    region: 'kessan-lowlands',
    indicator: 'tmax-3day',
    units: 'degC',
    days,
    members: 2,
    data: new Float64Array(240).fill(30),
    outOfRange: 0,
    missing: 0,
    modelCalendar: { calendar: '360_day', days: model },
  };
  return { year, start: mmdd, leads: aggregateToLeads(series, 'months', 'mean') };
}

describe('month-true pooling (months tier)', () => {
  it('a forecast issued 20 Nov (month 1 = December) pools the starts of 12 and 26 Nov, not the one of 9 Dec', () => {
    const entries = years.flatMap((y) => [entry(y, '2000-11-12'), entry(y, '2000-11-26'), entry(y, '2000-12-09')]);
    expect(entries[0].leads.leads[0].start.slice(5, 7)).toBe('12');
    expect(entries[2].leads.leads[0].start.slice(5, 7)).toBe('01');
    const { kept, problems } = sameLeadMonths('seasonal hindcasts', entries, '12', 15);
    expect(kept).toHaveLength(40);
    expect(kept.every((e) => e.start !== '2000-12-09')).toBe(true);
    expect(problems).toEqual([]);
  });
  it("the forecast's own month decides even when most pooled starts begin in another month", () => {
    // 40 starts (2 Dec, 9 Dec) have month 1 = January, 20 (26 Nov) have December: a forecast issued 28 Nov speaks of
    // December, one issued 5 Dec of January.
    const entries = years.flatMap((y) => [entry(y, '2000-11-26'), entry(y, '2000-12-02'), entry(y, '2000-12-09')]);
    const december = sameLeadMonths('seasonal hindcasts', entries, '12', 15);
    expect(december.kept.map((e) => e.start)).toEqual(years.map(() => '2000-11-26'));
    expect(december.problems).toEqual([]);
    const january = sameLeadMonths('seasonal hindcasts', entries, '01', 15);
    expect(january.kept).toHaveLength(40);
    expect(january.kept.every((e) => e.start !== '2000-11-26')).toBe(true);
  });
  it("when the forecast's month has fewer years than min-hindcast-years, every start is pooled and the mixing is named", () => {
    const entries = [...years.slice(0, 12).map((y) => entry(y, '2000-12-09')), ...years.slice(12).map((y) => entry(y, '2000-11-26'))];
    const { kept, problems } = sameLeadMonths('seasonal hindcasts for kessan-lowlands (tmax-3day)', entries, '12', 15, {
      region: 'kessan-lowlands',
    });
    expect(kept).toHaveLength(20);
    expect(problems).toHaveLength(1);
    expect(problems[0].code).toBe('climate-mixed-months');
    expect(problems[0].message).toBe(
      "seasonal hindcasts for kessan-lowlands (tmax-3day): the forecast's month 1 is December but the hindcast starts begin " +
        'their month leads in other calendar months too (12 with month 1 = January, 8 with month 1 = December); 8 years share ' +
        "the forecast's month 1, fewer than min-hindcast-years 15, so every start is pooled and each month lead mixes calendar months",
    );
  });
  it("when no start shares the forecast's month, the pooling is named as mixed, not passed off as the forecast's month", () => {
    const entries = years.map((y) => entry(y, '2000-12-09'));
    const { kept, problems } = sameLeadMonths('seasonal hindcasts', entries, '12', 15);
    expect(kept).toHaveLength(20);
    expect(problems.map((p) => p.code)).toEqual(['climate-mixed-months']);
    expect(problems[0].message).toContain('(20 with month 1 = January)');
  });
  it('a forecast without a month lead is said, not matched to any month', () => {
    const entries = [...years.slice(0, 10).map((y) => entry(y, '2000-12-09')), ...years.slice(10).map((y) => entry(y, '2000-11-26'))];
    const { kept, problems } = sameLeadMonths('seasonal hindcasts', entries, '', 15);
    expect(kept).toHaveLength(20);
    expect(problems[0].message).toContain('the forecast has no month lead but the hindcast starts');
  });
  it("starts that all share the forecast's month 1 are kept as they are", () => {
    const entries = years.map((y) => entry(y, '2000-11-26'));
    expect(sameLeadMonths('x', entries, '12', 15)).toEqual({ kept: entries, problems: [] });
  });
  it('360_day starts are pooled by their MODEL month 1 (model April begins on real 31 March after a 2 March start)', () => {
    const entries = years.flatMap((y) => [entry360(y, '03-02'), entry360(y, '03-28')]);
    expect(entries[0].leads.leads[0]).toMatchObject({ start: `${years[0]}-03-31`, modelMonth: `${years[0]}-04` });
    const april = sameLeadMonths('seasonal hindcasts', entries, '04', 15);
    expect(april).toEqual({ kept: entries, problems: [] });
  });
});
