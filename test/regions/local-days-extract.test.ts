/**
 * Sub-daily input reduced to local days of a DST zone, end to end: `forelight extract FILE --daily max|mean
 * --time-zone Europe/Lisbon` on an hourly file written by netCDF4-python across Lisbon's spring change, against Python's zoneinfo
 * (local_days_extract_reference.py): the same kept days (the 23-hour change day included, the partial last day left
 * out) and the same daily maxima and means. Control: UTC days (--utc-offset 0) give other means after the change.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '../..');
const nc = join(mkdtempSync(join(tmpdir(), 'forelight-local-days-')), 'hourly.nc');
const ref = JSON.parse(execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'local_days_extract_reference.py'), nc]).toString()) as {
  days: string[];
  max_c: number[];
  mean_c: number[];
  hours: number[];
};
const extract = (daily: 'max' | 'mean', ...clock: string[]) =>
  JSON.parse(
    execFileSync(process.execPath, [
      join(ROOT, 'bin/forelight.mjs'),
      'extract',
      nc,
      '--var',
      'tas',
      '--box',
      '38.2,38.8,-8.8,-8.2', // inside the one cell centred at 38.5° N, 8.5° W
      '--daily',
      daily,
      ...clock,
      '--json',
    ]).toString(),
  ) as { units: string; times: string[]; members: number[][]; cells: number };

describe('forelight extract --daily max|mean --time-zone (DST) vs zoneinfo', () => {
  it.each([
    ['max', 'max_c'],
    ['mean', 'mean_c'],
  ] as const)('--daily %s: same local days and values as Python; the change day has 23 hours', (daily, key) => {
    expect(ref.hours).toContain(23);
    const got = extract(daily, '--time-zone', 'Europe/Lisbon');
    expect(got.units).toBe('degC');
    expect(got.cells).toBe(1);
    expect(got.times).toEqual(ref.days);
    got.members[0].forEach((v, i) => expect(Math.abs(v - ref[key][i]), ref.days[i]).toBeLessThan(1e-6));
  });

  it('control: UTC days (--utc-offset 0) give other daily means once summer time has begun', () => {
    const utc = extract('mean', '--utc-offset', '0');
    const after = ref.days.filter((d) => d > '2026-03-29');
    expect(after.length).toBeGreaterThan(0);
    for (const d of after)
      expect(Math.abs(utc.members[0][utc.times.indexOf(d)] - ref.mean_c[ref.days.indexOf(d)]), d).toBeGreaterThan(1e-3);
  });
});
