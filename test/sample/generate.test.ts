// The Veloria sample generator: CF metadata checked with Debian `ncdump` (netCDF-C), values read back
// independently by Debian python3-netcdf4 + numpy (test/sample/summarize_sample.py), determinism by sha256.
// The plausibility ranges are the scenario's design targets (sample-inputs/README.md), not published values.
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateSample, type SampleSummary } from '../../src/sample/generate.ts';

const YEARS = [2016, 2017, 2018, 2019, 2020, 2021, 2022, 2023, 2024, 2025];
const dirA = mkdtempSync(join(tmpdir(), 'forelight-sample-a-'));
const dirB = mkdtempSync(join(tmpdir(), 'forelight-sample-b-'));
let a: SampleSummary;
let b: SampleSummary;
afterAll(() => [dirA, dirB].forEach((d) => rmSync(d, { recursive: true, force: true })));
beforeAll(async () => {
  a = await generateSample(dirA, { hindcastYears: YEARS });
  b = await generateSample(dirB, { hindcastYears: YEARS });
});

const sha256 = (path: string): string => createHash('sha256').update(readFileSync(path)).digest('hex');
const header = (path: string): string => execFileSync('ncdump', ['-h', path], { encoding: 'utf8' });

describe('generateSample', () => {
  it('writes the documented file layout and a manifest', () => {
    const names = a.files.map((f) => f.path);
    for (const date of ['20261123', '20261126', '20261130']) {
      expect(names).toContain(join('short', `short_${date}.nc`));
      expect(names).toContain(join('subseasonal', `subs_${date}.nc`));
    }
    expect(names).toContain(join('seasonal', 'seas_20261126.nc'));
    expect(names).toContain(join('seasonal', 'hindcast', 'seas_20251126.nc'));
    expect(names).toContain(join('observed', 'observed_daily.nc'));
    expect(names).toHaveLength(7 + 3 * YEARS.length + 1);
    expect(JSON.parse(readFileSync(join(dirA, 'manifest.json'), 'utf8')).files).toEqual(a.files);
  });

  it('is deterministic: same seed → byte-identical files (sha256)', () => {
    expect(b.files).toEqual(a.files);
    for (const f of a.files) expect(sha256(join(dirB, f.path)), f.path).toBe(sha256(join(dirA, f.path)));
  });

  it('has CF-1.8 metadata per ncdump -h', () => {
    const h = header(join(dirA, 'short', 'short_20261126.nc'));
    expect(h).toContain(':Conventions = "CF-1.8" ;');
    expect(h).toContain('short tasmax(time, number, lat, lon) ;');
    expect(h).toContain('tasmax:standard_name = "air_temperature" ;');
    expect(h).toContain('tasmax:cell_methods = "time: maximum" ;');
    expect(h).toContain('tasmin:cell_methods = "time: minimum" ;');
    expect(h).toContain('tdps:standard_name = "dew_point_temperature" ;');
    expect(h).toContain('tasmax:scale_factor = 0.01f ;');
    expect(h).toContain('pr:units = "kg m-2 s-1" ;');
    expect(h).toContain('number:standard_name = "realization" ;');
    expect(h).toContain('time:units = "hours since 2026-11-26 00:00:00" ;');
    expect(h).toContain('time:calendar = "standard" ;');
    expect(h).toContain('forecast_reference_time:standard_name = "forecast_reference_time" ;');
    expect(h).toContain('lat:axis = "Y" ;');
    expect(h).toContain('time:bounds = "time_bnds" ;');
    expect(h).toMatch(/number = 50 ;[\s\S]*time = 15 ;[\s\S]*lat = 25 ;[\s\S]*lon = 25 ;/);
    const seas = header(join(dirA, 'seasonal', 'seas_20261126.nc'));
    expect(seas).toContain('tp:units = "m" ;');
    expect(seas).not.toContain('tp:cell_methods'); // accumulated since the reference: no per-step method
    expect(seas).not.toContain('time_bnds'); // forecast-centre encoding: stamps close each day
    expect(
      execFileSync('ncdump', ['-v', 'time', join(dirA, 'seasonal', 'seas_20261126.nc')], { encoding: 'utf8' }).replace(/\s+/g, ' '),
    ).toContain('time = 24, 48, 72,');
    expect(seas).toMatch(/number = 25 ;[\s\S]*time = 184 ;/);
    expect(header(join(dirA, 'subseasonal', 'hindcast', 'subs_20201126.nc'))).toMatch(/number = 11 ;[\s\S]*time = 46 ;/);
    expect(header(join(dirA, 'observed', 'observed_daily.nc'))).toContain('time = UNLIMITED ; // (3986 currently)');
  });

  it('has a descending latitude axis and -180..180 longitudes (ncdump -v)', () => {
    const cdl = execFileSync('ncdump', ['-v', 'lat,lon', join(dirA, 'subseasonal', 'subs_20261126.nc')], { encoding: 'utf8' }).replace(
      /\s+/g,
      ' ',
    );
    expect(cdl).toContain('lat = -4, -5, -6, -7, -8, -9, -10, -11, -12, -13, -14, -15, -16 ;');
    expect(cdl).toContain('lon = -6, -5, -4, -3, -2, -1, 0, 1, 2, 3, 4, 5, 6 ;');
  });

  it('holds plausible values with skill decaying by lead and the 2026 scenario (python3-netcdf4 + numpy)', () => {
    const out = execFileSync('/usr/bin/python3', ['test/sample/summarize_sample.py', dirA, String(YEARS[0]), String(YEARS.at(-1))], {
      encoding: 'utf8',
    });
    const s = JSON.parse(out);
    expect(s.observed.first).toBe('2016-01-01');
    expect(s.observed.last).toBe('2026-11-29');
    expect(s.observed.masked_cells).toBeGreaterThan(0);
    expect(s.observed.masked_cells).toBeLessThan(10);
    expect(s.observed.kessan_tmax_nov_C).toBeGreaterThan(30.5);
    expect(s.observed.kessan_tmax_nov_C).toBeLessThan(34.5);
    expect(s.observed.marrow_tmax_nov_C).toBeGreaterThan(25.5);
    expect(s.observed.marrow_tmax_nov_C).toBeLessThan(29.5);
    expect(s.observed.orrin_pr_jan_mm_day).toBeGreaterThan(3 * s.observed.orrin_pr_jul_mm_day);
    expect(s.observed.tdps_le_tasmax).toBe(true);
    const corr = s.subseasonal_kessan_tmax_corr_by_lead as number[];
    expect(corr[0]).toBeGreaterThan(0.8);
    expect(Math.max(...corr.slice(28))).toBeLessThan(corr[0]);
    const mean = (x: number[]): number => x.reduce((p, q) => p + q, 0) / x.length;
    expect(mean(corr.slice(0, 5))).toBeGreaterThan(mean(corr.slice(30)) + 0.3);
    const p = s.subseasonal_kessan_p_gt_p90_on_20261209;
    expect(p['20261123']).toBeLessThan(p['20261130']);
    expect(p['20261130']).toBeGreaterThan(0.5);
    const wet = s.seasonal_orrin_rain_mm_by_month_2026 as number[];
    const clim = s.seasonal_orrin_rain_mm_by_month_hindcast as number[];
    for (const month of [1, 2, 3]) expect(wet[month]).toBeGreaterThan(1.2 * clim[month]);
    expect(s.seasonal_tp_nondecreasing).toBe(true);
  });
});
