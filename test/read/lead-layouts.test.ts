/**
 * Lead-time layouts as cfgrib/xarray and portals write them, files written by python3-xarray
 * (test/read/leads/make_leads.py), daily box means checked against numpy within 1e-4 K: a `step` dimension with a
 * scalar `forecast_reference_time` and `valid_time(step)` (CF 1.11 §4.4 forecast_period / forecast_reference_time;
 * the cfgrib layout), the same with a 2-D `valid_time(time, step)` and a size-1 `time` (xarray's expand_dims), and a
 * `lead_time` axis whose reference time is only a global ISO 8601 attribute (common practice, no source).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { extractBoxJson } from '../../src/read/extract.ts';

const tmp = mkdtempSync(join(tmpdir(), 'forelight-leads-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
const expected = JSON.parse(
  execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'leads/make_leads.py'), tmp], { encoding: 'utf8' }),
) as number[][];

describe('lead-time layouts (xarray-written) vs numpy daily box means', () => {
  it.each(['step.nc', 'valid2d.nc', 'leadattr.nc'])('%s', async (file) => {
    const got = await extractBoxJson(join(tmp, file), {
      variable: 't2m',
      box: { south: -12, north: -9, west: -3.5, east: -0.5 },
      daily: 'mean',
    });
    expect(got.times).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
    got.members.forEach((row, m) =>
      row.forEach((v, d) => expect(Math.abs((v as number) + 273.15 - expected[m][d])).toBeLessThanOrEqual(1e-4)),
    );
  });
});
