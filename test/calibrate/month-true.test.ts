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

describe('month-true pooling (months tier)', () => {
  it('starts on 12 Nov and 26 Nov (month 1 = December) are pooled, a start on 9 Dec (month 1 = January) is not', () => {
    const entries = years.flatMap((y) => [entry(y, '2000-11-12'), entry(y, '2000-11-26'), entry(y, '2000-12-09')]);
    expect(entries[0].leads.leads[0].start.slice(5, 7)).toBe('12');
    expect(entries[2].leads.leads[0].start.slice(5, 7)).toBe('01');
    const { kept, problems } = sameLeadMonths('seasonal hindcasts', entries, 15);
    expect(kept).toHaveLength(40);
    expect(kept.every((e) => e.start !== '2000-12-09')).toBe(true);
    expect(problems).toEqual([]);
  });
  it('on a tie the earlier lead of the season (December before January across the year end) is kept', () => {
    const entries = years.flatMap((y) => [entry(y, '2000-12-09'), entry(y, '2000-11-26')]);
    const { kept } = sameLeadMonths('seasonal hindcasts', entries, 15);
    expect(kept.every((e) => e.start === '2000-11-26')).toBe(true);
  });
  it('when the largest group has fewer years than min-hindcast-years, every start is pooled and the mixing is named', () => {
    const entries = [...years.slice(0, 12).map((y) => entry(y, '2000-11-26')), ...years.slice(12).map((y) => entry(y, '2000-12-09'))];
    const { kept, problems } = sameLeadMonths('seasonal hindcasts for kessan-lowlands (tmax-3day)', entries, 15, {
      region: 'kessan-lowlands',
    });
    expect(kept).toHaveLength(20);
    expect(problems).toHaveLength(1);
    expect(problems[0].code).toBe('climate-mixed-months');
    expect(problems[0].message).toBe(
      'seasonal hindcasts for kessan-lowlands (tmax-3day): hindcast starts begin their month leads in different calendar months ' +
        '(12 with month 1 = December, 8 with month 1 = January); the 12 years of the largest group are fewer than ' +
        'min-hindcast-years 15, so every start is pooled and each month lead mixes calendar months',
    );
  });
  it('starts that all share their month 1 are kept as they are', () => {
    const entries = years.map((y) => entry(y, '2000-11-26'));
    expect(sameLeadMonths('x', entries, 15)).toEqual({ kept: entries, problems: [] });
  });
});
