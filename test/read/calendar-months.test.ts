/**
 * Month leads of DAILY data in model calendars (CF 1.11 §4.4.1: 360_day, noleap/365_day, all_leap, julian) are
 * months of the file's own calendar (src/read/DECISIONS.md §3): files written by netCDF-C's `ncgen`, month means
 * against `cdo monmean` (CDO groups by the file's calendar; julian, which CDO lacks, against cftime + numpy) within 1e-4, model dates of the local days against
 * cftime (test/read/calendar_dates.py, python3-netCDF4). Daily means end-stamped at 00:00 of the next day
 * (`cell_methods: time: mean`), which CDO sees after `-shifttime,-1sec` (DECISIONS §1).
 */
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { aggregateToLeads, buildLeadSpans } from '../../src/calibrate/lead-tiers.ts';
import type { IndicatorConfig, RegionConfig } from '../../src/config/types.ts';
import { computeIndicator } from '../../src/indicators/compute.ts';
import { monthlySuitability, parseMalariaParams } from '../../src/indicators/malaria-monthly.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import type { RegionSeries } from '../../src/types.ts';
import { BOX, CDO_BOX, cdoTable, ncgenFixture, type CdlSpec } from './cdl-fixture.ts';

const KELVIN = 273.15;
const region: RegionConfig = { id: 'box', name: 'box', shape: { kind: 'box', ...BOX }, utcOffsetHours: 0, teams: [] };
const temperature = (m: number, t: number, y: number, x: number): number => 288 + 6 * Math.sin(0.21 * t + y) + 0.3 * x + 0.5 * m;

const dailyMeans = (calendar: string, start: string, days: number): CdlSpec => ({
  timeUnits: `days since ${start} 00:00:00`,
  calendar,
  reference: 0,
  times: Array.from({ length: days }, (_, i) => i + 1),
  variables: { tas: { attributes: { units: 'K', cell_methods: 'time: mean' }, value: temperature } },
});

async function readDaily(file: string, start: string): Promise<RegionSeries> {
  const r = await extractRegionSeries(file, { quantities: { tmean: 'tas' }, regions: [region], referenceTime: start });
  expect(r.problems).toEqual([]);
  return r.series[0];
}

function cftimeDates(file: string): { model: string[]; real: string[] } {
  return JSON.parse(
    execFileSync('/usr/bin/python3', [new URL('./calendar_dates.py', import.meta.url).pathname, file], { encoding: 'utf8' }),
  );
}

/**
 * Month means in the file's calendar: `cdo monmean`, except for `julian`, which CDO reads as the standard calendar
 * ("calendar >julian< unsupported!"): there cftime and numpy (test/read/month_means.py).
 */
function monthMeans(calendar: string, file: string): { months: string[]; means: number[][] } {
  if (calendar === 'julian')
    return JSON.parse(
      execFileSync('/usr/bin/python3', [new URL('./month_means.py', import.meta.url).pathname, file, 'tas'], { encoding: 'utf8' }),
    );
  const cdo = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-monmean', '-shifttime,-1sec'], file);
  return { months: cdo.dates.map((d) => d.slice(0, 7)), means: cdo.members };
}

describe('month leads of daily model-calendar data are model months, = cdo monmean', () => {
  const cases = [
    { calendar: '360_day', start: '2026-11-01', days: 120, months: 4, what: 'four 30-day months, through 30 February' },
    { calendar: 'noleap', start: '2028-01-01', days: 90, months: 3, what: 'February of 28 days in a leap year' },
    { calendar: '365_day', start: '2028-01-01', days: 90, months: 3, what: 'alias of noleap' },
    { calendar: 'all_leap', start: '2027-01-01', days: 91, months: 3, what: 'February of 29 days in a common year' },
    { calendar: 'julian', start: '2100-01-01', days: 91, months: 3, what: 'Julian 29 February 2100' },
  ];
  for (const c of cases) {
    it(`${c.calendar}: ${c.what}`, async () => {
      const file = ncgenFixture(`months-${c.calendar}`, dailyMeans(c.calendar, c.start, c.days));
      const s = await readDaily(file, c.start);
      expect(s.days).toHaveLength(c.days);
      // Day i ends at stamp i (00:00): its model date is that of stamp i-1, its real date that stamp's real date.
      const cf = cftimeDates(file);
      expect(s.modelCalendar?.days.slice(1)).toEqual(cf.model.slice(0, -1).map((d) => d.slice(0, 10)));
      expect(s.days.slice(1)).toEqual(cf.real.slice(0, -1));
      const leads = aggregateToLeads({ ...s, indicator: 't', outOfRange: 0, missing: 0 }, 'months', 'mean');
      const want = monthMeans(c.calendar, file);
      expect(leads.leads.map((l) => l.modelMonth)).toEqual(want.months.slice(0, c.months));
      for (let m = 0; m < 2; m++)
        for (let k = 0; k < c.months; k++)
          expect(Math.abs(leads.values[m * c.months + k] - (want.means[m][k] - KELVIN))).toBeLessThanOrEqual(1e-4);
      // Each lead is shown by the real dates of its first and last model day.
      leads.leads.forEach((l) => {
        const from = s.modelCalendar!.days.indexOf(`${l.modelMonth}-01`);
        expect(l.start).toBe(s.days[from]);
      });
    });
  }

  it('a 360_day forecast (2026-11-01) and its hindcasts (1996-11-01, 2005-11-12) have month leads of the same model months and lengths', async () => {
    const fc = await readDaily(ncgenFixture('fc360m', dailyMeans('360_day', '2026-11-01', 120)), '2026-11-01');
    const hcs = await Promise.all(
      ['1996-11-01', '2005-11-12'].map(async (start) =>
        readDaily(ncgenFixture(`hc360m-${start}`, dailyMeans('360_day', start, 120)), start),
      ),
    );
    const months = (s: RegionSeries) =>
      buildLeadSpans(s.days, 'months', Infinity, { modelCalendar: s.modelCalendar }).map((l) => [
        l.lead.modelMonth?.slice(5),
        l.to - l.from,
      ]);
    expect(months(fc)).toEqual([
      ['11', 30],
      ['12', 30],
      ['01', 30],
      ['02', 30],
    ]);
    expect(months(hcs[0])).toEqual(months(fc));
    // A start 11 days later begins its month leads one model month later, with the same 30-day length.
    expect(months(hcs[1])).toEqual(months(fc).slice(1, 4));
  });

  it('malaria suitability of a 360_day daily file: model-month means and rain totals = cdo monmean / monsum; its index lies on the lagged model month', async () => {
    const spec = dailyMeans('360_day', '2026-11-01', 120);
    const file = ncgenFixture('malaria360', {
      ...spec,
      variables: {
        ...spec.variables,
        pr: {
          attributes: { units: 'kg m-2 s-1', cell_methods: 'time: mean' },
          value: (m, t, y, x) => (1 + ((3 * t + y + 2 * x + m) % 9)) * 2e-5,
        },
      },
    });
    const r = await extractRegionSeries(file, {
      quantities: { tmean: 'tas', precip: 'pr' },
      regions: [region],
      referenceTime: '2026-11-01',
    });
    const inputs = new Map(r.series.map((s) => [s.quantity, s]));
    const [t, pr] = [inputs.get('tmean')!, inputs.get('precip')!];
    const malaria = {
      id: 'malaria',
      name: 'malaria',
      kind: 'malaria-suitability',
      tiers: ['months'],
      aggregate: 'mean',
      params: { species: 'falciparum', lagMonths: 1 },
    } as unknown as IndicatorConfig;
    const suit = monthlySuitability(t.days, t.members, t.data, pr.data, parseMalariaParams(malaria), { modelCalendar: t.modelCalendar });
    const cdoT = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-monmean', '-shifttime,-1sec', '-selname,tas'], file);
    const cdoR = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-monsum', '-mulc,86400', '-shifttime,-1sec', '-selname,pr'], file);
    expect(suit.map((s) => s.dataMonth)).toEqual(cdoT.dates.map((d) => d.slice(0, 7)));
    expect(suit.map((s) => s.daysInMonth)).toEqual([30, 30, 30, 30]);
    for (let m = 0; m < 2; m++)
      suit.forEach((s, k) => {
        expect(Math.abs(s.tempMeanC[m] - (cdoT.members[m][k] - KELVIN))).toBeLessThanOrEqual(1e-4);
        expect(Math.abs(s.rainTotalMm[m] - cdoR.members[m][k])).toBeLessThanOrEqual(1e-4 * cdoR.members[m][k]);
      });
    const index = computeIndicator(malaria, inputs);
    const leads = aggregateToLeads(index, 'months', 'mean');
    expect(leads.leads.map((l) => l.modelMonth)).toEqual(['2026-12', '2027-01', '2027-02', '2027-03']);
    expect(index.days).toHaveLength(120);
    leads.leads.forEach((l, k) => {
      expect(l.start).toBe(index.days[30 * k]);
      for (let m = 0; m < 2; m++) expect(leads.values[m * 4 + k]).toBeCloseTo(suit[k].index[m], 12);
    });
  });
});
