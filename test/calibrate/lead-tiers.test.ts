/** Lead windows and aggregation (Forelight's own rules, stated in src/calibrate/lead-tiers.ts; calendar from ISO 8601). */
import { describe, expect, it } from 'vitest';
import { aggregateToLeads, buildLeadSpans, combineSources, COMBINE_RULE, leadLabel } from '../../src/calibrate/lead-tiers.ts';
import type { IndicatorSeries, LeadWindow } from '../../src/types.ts';

function daysFrom(start: string, n: number): string[] {
  const t0 = Date.parse(`${start}T00:00:00Z`);
  return Array.from({ length: n }, (_, i) => new Date(t0 + i * 86_400_000).toISOString().slice(0, 10));
}

function series(days: string[], rows: number[][]): IndicatorSeries {
  return {
    region: 'kessan-lowlands',
    indicator: 'tmax-mean',
    units: 'degC',
    days,
    members: rows.length,
    data: Float64Array.from(rows.flat()),
    outOfRange: 0,
    missing: 0,
  };
}

describe('buildLeadSpans', () => {
  const days = daysFrom('2026-11-27', 70); // issued 2026-11-26, lead day 1 = 27 Nov
  it('days: one lead per day, capped by maxLeads', () => {
    const s = buildLeadSpans(days, 'days', 10);
    expect(s).toHaveLength(10);
    expect(s[2].lead).toEqual({ tier: 'days', index: 3, start: '2026-11-29', end: '2026-11-29' });
  });
  it('weeks: week k = lead days 7(k-1)+1..7k, at most 6', () => {
    const s = buildLeadSpans(days, 'weeks');
    expect(s).toHaveLength(6);
    expect(s[1].lead).toEqual({ tier: 'weeks', index: 2, start: '2026-12-04', end: '2026-12-10' });
    expect(s[1].from).toBe(7);
  });
  it('months: first calendar month starting on or after lead day 1 (December 2026 for a 26 Nov issue); a month the series ends inside is dropped', () => {
    const s = buildLeadSpans(days, 'months'); // 27 Nov .. 4 Feb
    expect(s.map((x) => x.lead)).toEqual([
      { tier: 'months', index: 1, start: '2026-12-01', end: '2026-12-31' },
      { tier: 'months', index: 2, start: '2027-01-01', end: '2027-01-31' },
    ]);
    expect(buildLeadSpans(daysFrom('2026-12-01', 31), 'months')[0].lead.end).toBe('2026-12-31');
    expect(buildLeadSpans(daysFrom('2028-02-01', 29), 'months')[0].lead.end).toBe('2028-02-29'); // leap year
  });
  it('months: a series ending exactly on a month end gives no extra, empty month (malaria target months do)', () => {
    const s = buildLeadSpans(daysFrom('2027-01-01', 31 + 28), 'months');
    expect(s.map((x) => [x.lead.start, x.lead.end])).toEqual([
      ['2027-01-01', '2027-01-31'],
      ['2027-02-01', '2027-02-28'],
    ]);
  });
  it('a gap in the local days throws a one-line error naming the days', () => {
    expect(() => buildLeadSpans(['2026-11-27', '2026-11-29'], 'days')).toThrow(/2026-11-27 to 2026-11-29/);
  });
  it('labels', () => {
    expect(leadLabel({ tier: 'weeks', index: 2, start: '', end: '' })).toBe('lead week 2');
  });
});

describe('aggregateToLeads', () => {
  const days = daysFrom('2026-11-24', 14);
  const m0 = [1, 2, 3, 4, 5, 6, 7, 10, 10, 10, 10, 10, 10, 10];
  const m1 = [1, NaN, 3, 4, 5, 6, 7, NaN, NaN, 10, 10, 10, 10, 10];
  it('mean and max per member and week; a week with < 75 % valid days is NaN', () => {
    const mean = aggregateToLeads(series(days, [m0, m1]), 'weeks', 'mean');
    expect(mean.leads).toHaveLength(2);
    expect(Array.from(mean.values)).toEqual([4, 10, 26 / 6, NaN]); // m1 week 2 has 5/7 valid
    const max = aggregateToLeads(series(days, [m0, m1]), 'weeks', 'max');
    expect(Array.from(max.values)).toEqual([7, 10, 7, NaN]);
  });
  it('sum (count of days) is NaN when any day of the window is missing', () => {
    const ones = days.map(() => 1);
    const withGap = ones.map((x, i) => (i === 3 ? NaN : x));
    expect(Array.from(aggregateToLeads(series(days, [ones, withGap]), 'weeks', 'sum').values)).toEqual([7, 7, NaN, 7]);
  });
});

describe('combineSources', () => {
  const w = (index: number, start: string, end: string): { lead: LeadWindow } => ({ lead: { tier: 'weeks', index, start, end } });
  it('the higher-priority source wins an overlap, newer issue breaks ties, tiers never compete, and the rule is returned', () => {
    const r = combineSources([
      {
        source: 'seasonal',
        priority: 3,
        issued: '2026-11-01T00:00:00Z',
        leads: [w(4, '2026-11-22', '2026-11-28'), w(5, '2026-11-29', '2026-12-05'), w(6, '2026-12-13', '2026-12-19')],
      },
      {
        source: 'subseasonal',
        priority: 2,
        issued: '2026-11-26T00:00:00Z',
        leads: [w(1, '2026-11-27', '2026-12-03'), w(2, '2026-12-04', '2026-12-10')],
      },
      { source: 'subseasonal-old', priority: 2, issued: '2026-11-23T00:00:00Z', leads: [w(1, '2026-11-24', '2026-11-30')] },
      {
        source: 'short',
        priority: 1,
        issued: '2026-11-26T00:00:00Z',
        leads: [{ lead: { tier: 'days', index: 1, start: '2026-11-27', end: '2026-11-27' } }],
      },
    ]);
    expect(r.kept.map((k) => `${k.source}:${k.item.lead.tier}${k.item.lead.index}`)).toEqual([
      'short:days1',
      'subseasonal:weeks1',
      'subseasonal:weeks2',
      'seasonal:weeks6',
    ]);
    expect(r.dropped.map((d) => `${d.source}:${d.item.lead.index}<${d.coveredBy}`)).toEqual([
      'subseasonal-old:1<subseasonal',
      'seasonal:4<subseasonal',
      'seasonal:5<subseasonal',
    ]);
    expect(r.rule).toBe(COMBINE_RULE);
  });
});
