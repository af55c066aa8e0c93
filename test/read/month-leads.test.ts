/**
 * Seasonal monthly means on a lead axis in MONTHS, files written by python3-xarray
 * (test/read/leads/make_month_leads.py), against numpy within 1e-4: the C3S-style `forecastMonth` index 1..6 beside a
 * size-1 `forecast_reference_time` dimension (Copernicus C3S seasonal monthly layout: month 1 = the start's month),
 * `leadtime` in months 0.5..5.5 after a 360_day reference (the NMME archive's mid-month leads), and whole-month leads
 * 1..6 with only an ISO 8601 reference attribute (each closing its month, the GRIB "over the preceding period"
 * convention). Rules: src/read/DECISIONS.md §4 (CF 1.11 §4.4 on `months`; common practice of seasonal archives).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { aggregateToLeads } from '../../src/calibrate/lead-tiers.ts';
import type { RegionConfig } from '../../src/config/types.ts';
import { daysInMonth } from '../../src/core/iso-dates.ts';
import { extractBoxJson, extractRegionSeries } from '../../src/read/extract.ts';

const tmp = mkdtempSync(join(tmpdir(), 'forelight-month-leads-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
const expected = JSON.parse(
  execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'leads/make_month_leads.py'), tmp], { encoding: 'utf8' }),
) as { t2m: number[][]; rateMmDay: number[][]; months: Record<string, string[]> };

const BOX = { south: -12, north: -9, west: -3.5, east: -0.5 };
const REGION: RegionConfig = {
  id: 'kessan',
  name: 'kessan',
  utcOffsetHours: 0,
  teams: [],
  cellRule: 'centre',
  shape: { kind: 'box', ...BOX },
};
const FILES = ['c3s.nc', 'leadtime-360.nc', 'leadtime-whole.nc'];
/** Days of each model month: 30 in every 360_day month, the Gregorian month length otherwise (CF 1.11 §4.4.1). */
const modelDays = (file: string, month: string): number =>
  file === 'leadtime-360.nc' ? 30 : daysInMonth(Number(month.slice(0, 4)), Number(month.slice(5, 7)));

describe('lead axes in months (xarray-written) vs numpy monthly box means', () => {
  it.each(FILES)('%s: extract prints one value per month, = numpy and = the month tier', async (file) => {
    const got = await extractBoxJson(join(tmp, file), { variable: 't2m', box: BOX });
    expect(got.times).toEqual(expected.months[file]);
    got.members.forEach((row, m) =>
      row.forEach((v, k) => expect(Math.abs((v as number) + 273.15 - expected.t2m[m][k])).toBeLessThanOrEqual(1e-4)),
    );
    const { series } = await extractRegionSeries(join(tmp, file), { quantities: { tmean: 't2m' }, regions: [REGION], tier: 'months' });
    const tier = aggregateToLeads({ ...series[0], indicator: 't', outOfRange: 0, missing: 0 }, 'months', 'mean');
    expect(tier.leads.map((l) => l.start.slice(0, 7))).toEqual(got.times);
    got.members.forEach((row, m) =>
      row.forEach((v, k) => expect(Math.abs((v as number) - tier.values[m * 6 + k])).toBeLessThanOrEqual(1e-9)),
    );
  });

  it.each(FILES)('%s: months-tier series hold the monthly mean on every day and a rain total of rate x model month days', async (file) => {
    const { series, problems } = await extractRegionSeries(join(tmp, file), {
      quantities: { tmean: 't2m', precip: 'tprate' },
      regions: [REGION],
      tier: 'months',
    });
    expect(problems).toEqual([]);
    const [tmean, precip] = ['tmean', 'precip'].map((q) => series.find((s) => s.quantity === q)!);
    const months = expected.months[file];
    const days = months.flatMap((mo) =>
      Array.from({ length: daysInMonth(Number(mo.slice(0, 4)), Number(mo.slice(5))) }, (_, d) => `${mo}-${String(d + 1).padStart(2, '0')}`),
    );
    expect(tmean.days).toEqual(days);
    expect(tmean.members).toBe(3);
    for (let m = 0; m < 3; m++) {
      let d = m * days.length;
      months.forEach((mo, k) => {
        const real = daysInMonth(Number(mo.slice(0, 4)), Number(mo.slice(5)));
        const t = tmean.data.subarray(d, d + real);
        const rain = precip.data.subarray(d, d + real).reduce((a, b) => a + b, 0);
        t.forEach((v) => expect(Math.abs(v + 273.15 - expected.t2m[m][k])).toBeLessThanOrEqual(1e-4));
        expect(Math.abs(rain - expected.rateMmDay[m][k] * modelDays(file, mo))).toBeLessThanOrEqual(1e-4);
        d += real;
      });
    }
  });

  it('a months lead without a reference time is refused in one line naming file and lead', async () => {
    const file = join(tmp, 'noref.nc');
    execFileSync('ncatted', ['-O', '-a', 'forecast_reference_time,global,d,,', join(tmp, 'leadtime-whole.nc'), file]);
    await expect(extractBoxJson(file, { variable: 't2m', box: BOX })).rejects.toThrow(
      /lead 'leadtime' counts months but the file states no forecast reference time/,
    );
  });
});
