/**
 * Model calendars read natively (CF 1.11 §4.4.1: 360_day, noleap/365_day, all_leap, julian) on files written by
 * netCDF-C's `ncgen`: real dates by the elapsed-time rule of src/read/coordinates-time.ts, checked against an
 * independent cftime computation (test/read/calendar_dates.py, python3-netCDF4), daily box means against CDO
 * (which reads these calendars) within 1e-4; monthly files (src/read/monthly.ts) against `cdo muldpm`, which
 * multiplies by the days of each month in the file's calendar.
 */
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { aggregateToLeads, buildLeadSpans } from '../../src/calibrate/lead-tiers.ts';
import type { IndicatorConfig, RegionConfig } from '../../src/config/types.ts';
import { parseMalariaParams, monthlySuitability } from '../../src/indicators/malaria-monthly.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import type { RegionSeries } from '../../src/types.ts';
import { BOX, CDO_BOX, cdoTable, ncgenFixture, type CdlSpec } from './cdl-fixture.ts';

const TOL = 1e-4;
const KELVIN = 273.15;
const region: RegionConfig = { id: 'box', name: 'box', shape: { kind: 'box', ...BOX }, utcOffsetHours: 0, teams: [] };
const temperature = (m: number, t: number, y: number, x: number): number => 290 + 4 * Math.sin(0.9 * t + y) + 0.2 * x + 0.4 * m;

function realDates(file: string): { calendar: string; model: string[]; real: string[] } {
  return JSON.parse(
    execFileSync('/usr/bin/python3', [new URL('./calendar_dates.py', import.meta.url).pathname, file], { encoding: 'utf8' }),
  );
}

async function read(
  file: string,
  quantities: Record<string, string>,
  referenceTime: string,
  tier?: 'days' | 'months',
): Promise<{ series: RegionSeries[]; notes: string[]; problems: string[] }> {
  const r = await extractRegionSeries(file, { quantities, regions: [region], referenceTime, tier });
  return { series: r.series, notes: r.notes, problems: r.problems.map((p) => p.message) };
}

const sixHourly = (calendar: string, start: string, days: number): CdlSpec => ({
  timeUnits: `hours since ${start} 00:00:00`,
  calendar,
  reference: 0,
  times: Array.from({ length: 4 * days }, (_, i) => 6 * i),
  variables: { t2m: { attributes: { units: 'K', standard_name: 'air_temperature' }, value: temperature } },
});

describe('daily means in model calendars = cdo daymean, dated by the elapsed-time rule (cftime)', () => {
  const cases = [
    { calendar: '360_day', start: '2027-02-27', what: 'across 29 and 30 February' },
    { calendar: 'noleap', start: '2028-02-27', what: 'a leap year without 29 February' },
    { calendar: '365_day', start: '2028-02-27', what: 'alias of noleap' },
    { calendar: 'all_leap', start: '2027-02-27', what: 'a common year with 29 February' },
    { calendar: 'julian', start: '2026-11-23', what: 'Julian calendar' },
  ];
  for (const c of cases) {
    it(`${c.calendar}: ${c.what}`, async () => {
      const file = ncgenFixture(`cal-${c.calendar}`, sixHourly(c.calendar, c.start, 5));
      const { series, notes, problems } = await read(file, { tmean: 't2m' }, c.start);
      expect(problems).toEqual([]);
      const [s] = series;
      const expected = realDates(file);
      expect(s.days).toEqual(expected.real.filter((_d, i) => i % 4 === 0));
      const cdo = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymean'], file);
      expect(cdo.dates.map((d) => d.slice(0, 10))).toEqual(expected.model.filter((_d, i) => i % 4 === 0).map((d) => d.slice(0, 10)));
      for (let m = 0; m < 2; m++)
        for (let d = 0; d < 5; d++) expect(Math.abs(s.data[m * 5 + d] - (cdo.members[m][d] - KELVIN))).toBeLessThanOrEqual(TOL);
      expect(notes.join(' ')).toMatch(
        new RegExp(
          `${c.calendar === '365_day' ? 'noleap' : c.calendar} calendar are placed on real dates by elapsed time from ${c.start} \\(model\\) = ${c.start} \\(real\\)`,
        ),
      );
    });
  }
});

describe('a 360-day seasonal forecast and its hindcast compare at the same lead', () => {
  const daily360 = (start: string): CdlSpec => ({
    timeUnits: `days since ${start} 00:00:00`,
    calendar: '360_day',
    reference: 0,
    times: Array.from({ length: 75 }, (_, i) => i + 1),
    variables: { tas: { attributes: { units: 'K', cell_methods: 'time: mean' }, value: temperature } },
  });

  it('day, week and month leads cover the same lead days in the forecast (2026-11-01) and the hindcast (1996-11-01)', async () => {
    const fc = (await read(ncgenFixture('fc360', daily360('2026-11-01')), { tmean: 'tas' }, '2026-11-01')).series[0];
    const hc = (await read(ncgenFixture('hc360', daily360('1996-11-01')), { tmean: 'tas' }, '1996-11-01')).series[0];
    expect(fc.days[0]).toBe('2026-11-01');
    expect(hc.days[0]).toBe('1996-11-01');
    expect(fc.days).toHaveLength(75);
    for (const tier of ['days', 'weeks', 'months'] as const) {
      const spans = (s: RegionSeries) =>
        buildLeadSpans(s.days, tier, undefined, { modelCalendar: s.modelCalendar }).map((l) => [l.lead.index, l.from, l.to]);
      expect(spans(hc)).toEqual(spans(fc));
    }
    expect(buildLeadSpans(fc.days, 'months', undefined, { modelCalendar: fc.modelCalendar }).map((l) => l.lead.start)).toEqual([
      '2026-11-01',
      '2026-12-01',
    ]);
  });
});

describe('monthly-mean seasonal files feed month-tier indicators directly', () => {
  const monthly = (calendar: string, start: string, bounds: boolean): CdlSpec => {
    const ends = calendar === '360_day' ? [30, 60, 90] : [31, 62, 90]; // Dec, Jan, Feb of a common year
    const starts = [0, ends[0], ends[1]];
    return {
      timeUnits: `days since ${start} 00:00:00`,
      calendar,
      reference: 0,
      times: bounds ? starts.map((s, i) => (s + ends[i]) / 2) : [15.5, 46.5, 76],
      bounds: bounds ? starts.map((s, i) => [s, ends[i]] as [number, number]) : undefined,
      variables: {
        t2m: { attributes: { units: 'K', cell_methods: 'time: mean' }, value: temperature },
        tprate: {
          attributes: { units: 'kg m-2 s-1', cell_methods: 'time: mean' },
          value: (m, t, y, x) => (1 + ((5 * t + 3 * y + x + m) % 7)) * 1e-5,
        },
      },
    };
  };
  const malaria = (): IndicatorConfig =>
    ({
      id: 'malaria',
      name: 'malaria',
      kind: 'malaria-suitability',
      tiers: ['months'],
      aggregate: 'mean',
      params: { species: 'falciparum', lagMonths: 1 },
    }) as unknown as IndicatorConfig;

  for (const c of [
    { calendar: '360_day', bounds: true, what: '360_day with month bounds (every model month 30 days)' },
    { calendar: 'standard', bounds: false, what: 'standard calendar, mid-month stamps without bounds' },
  ]) {
    it(`${c.what}: monthly mean = cdo fldmean, monthly rain = cdo muldpm (model month length), malaria computed`, async () => {
      const file = ncgenFixture(`monthly-${c.calendar}`, monthly(c.calendar, '2026-12-01', c.bounds));
      const { series, notes, problems } = await read(file, { tmean: 't2m', precip: 'tprate' }, '2026-12-01', 'months');
      expect(problems).toEqual([]);
      const t = series.find((s) => s.quantity === 'tmean')!;
      const pr = series.find((s) => s.quantity === 'precip')!;
      expect(t.days[0]).toBe('2026-12-01');
      expect(t.days).toHaveLength(31 + 31 + 28);
      expect(notes.join(' ')).toMatch(/one value per month \(2026-12 to 2027-02\)/);
      const cdoT = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-selname,t2m'], file).members;
      const tMonths = aggregateToLeads({ ...t, indicator: 't', outOfRange: 0, missing: 0 }, 'months', 'mean');
      expect(tMonths.leads.map((l) => l.start)).toEqual(['2026-12-01', '2027-01-01', '2027-02-01']);
      const total = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-mulc,86400', '-muldpm', '-selname,tprate'], file).members;
      const suit = monthlySuitability(t.days, t.members, t.data, pr.data, parseMalariaParams(malaria()));
      expect(suit.map((s) => s.dataMonth)).toEqual(['2026-12', '2027-01', '2027-02']);
      for (let m = 0; m < 2; m++) {
        for (let k = 0; k < 3; k++) {
          expect(Math.abs(tMonths.values[m * 3 + k] - (cdoT[m][k] - KELVIN))).toBeLessThanOrEqual(TOL);
          expect(Math.abs(suit[k].tempMeanC[m] - (cdoT[m][k] - KELVIN))).toBeLessThanOrEqual(TOL);
          expect(Math.abs(suit[k].rainTotalMm[m] - total[m][k])).toBeLessThanOrEqual(TOL * total[m][k]);
          expect(suit[k].index[m]).not.toBeNaN();
        }
      }
    });
  }

  // CF 1.11 §4.4 forecast_period: the same months given as leads from forecast_reference_time (time renamed and
  // made a duration by NCO), in days with month bounds (360_day) and in hours at mid-month (standard calendar).
  for (const c of [
    { calendar: '360_day', bounds: true, hours: false },
    { calendar: 'standard', bounds: false, hours: true },
  ]) {
    it(`a forecast_period lead axis in ${c.hours ? 'hours' : 'days'} (${c.calendar}) is read as months too, = cdo on the absolute-time file`, async () => {
      const file = ncgenFixture(`monthly-lead-${c.calendar}`, monthly(c.calendar, '2026-12-01', c.bounds));
      const lead = file.replace('.nc', '-lead.nc');
      const nco = (...args: string[]) => execFileSync(args[0], args.slice(1));
      nco('ncrename', '-O', '-d', 'time,forecast_period', '-v', 'time,forecast_period', file, lead);
      if (c.hours) nco('ncap2', '-O', '-s', 'forecast_period=forecast_period*24', lead, lead);
      const units = c.hours ? 'hours' : 'days';
      nco(
        'ncatted',
        '-O',
        '-a',
        `units,forecast_period,o,c,${units}`,
        '-a',
        'standard_name,forecast_period,o,c,forecast_period',
        '-a',
        'axis,forecast_period,d,,',
        '-a',
        'calendar,forecast_period,d,,',
        lead,
      );
      if (c.bounds) nco('ncatted', '-O', '-a', `units,time_bnds,o,c,${units}`, lead);
      expect(execFileSync('ncdump', ['-h', lead], { encoding: 'utf8' })).toMatch(new RegExp(`forecast_period:units = "${units}"`));
      const { series, notes, problems } = await read(lead, { tmean: 't2m' }, '2026-12-01', 'months');
      expect(problems).toEqual([]);
      expect(notes.join(' ')).toMatch(/one value per month \(2026-12 to 2027-02\)/);
      const t = series[0];
      expect(t.days).toHaveLength(31 + 31 + 28);
      const months = aggregateToLeads({ ...t, indicator: 't', outOfRange: 0, missing: 0 }, 'months', 'mean');
      const cdoT = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-selname,t2m'], file).members;
      for (let m = 0; m < 2; m++)
        for (let k = 0; k < 3; k++) expect(Math.abs(months.values[m * 3 + k] - (cdoT[m][k] - KELVIN))).toBeLessThanOrEqual(TOL);
    });
  }

  it('a monthly file that skips a month (January, then March) is refused for that variable, naming both months', async () => {
    const spec: CdlSpec = {
      timeUnits: 'days since 2027-01-01 00:00:00',
      calendar: '360_day',
      reference: 0,
      times: [15, 75],
      bounds: [
        [0, 30],
        [60, 90],
      ],
      variables: { t2m: { attributes: { units: 'K', cell_methods: 'time: mean' }, value: temperature } },
    };
    const file = ncgenFixture('monthly-gap', spec);
    const { series, problems } = await read(file, { tmean: 't2m' }, '2027-01-01', 'months');
    expect(series).toHaveLength(0);
    expect(problems).toEqual([
      `${file}: variable 't2m' jumps from 2027-01 to 2027-03 — provide consecutive monthly values (one per month)`,
    ]);
  });

  it('a monthly file under a day-tier source is refused with the YAML fix (one line, names file and variable)', async () => {
    const file = ncgenFixture('monthly-days', monthly('360_day', '2026-12-01', true));
    const { series, problems } = await read(file, { tmean: 't2m' }, '2026-12-01', 'days');
    expect(series).toHaveLength(0);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toContain(file);
    expect(problems[0]).toMatch(/variable 't2m' holds one value per month, which cannot feed the 'days' tier — set 'tier: months'/);
  });
});
