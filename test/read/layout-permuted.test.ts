/**
 * The same ensemble stored (number, step, lat, lon) and, permuted by NCO's `ncpdq -a step,number` (Debian nco),
 * (step, number, lat, lon): Forelight must give the same box means in every member and step, from classic and from
 * NetCDF-4 (`nccopy -k nc4 -d1 -s`) files.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { extractBoxJson } from '../../src/read/extract.ts';
import { openDataset } from '../../src/read/open-dataset.ts';

const fixture = fileURLToPath(new URL('../fixtures/netcdf/forecast-classic.nc', import.meta.url));
const tmp = mkdtempSync(join(tmpdir(), 'forelight-permuted-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('(step, number, lat, lon) files written by ncpdq', () => {
  const permuted = join(tmp, 'step-outer.nc');
  const permutedNc4 = join(tmp, 'step-outer-nc4.nc');
  execFileSync('ncpdq', ['-O', '-a', 'step,number', fixture, permuted]);
  execFileSync('nccopy', ['-k', 'nc4', '-d', '1', '-s', permuted, permutedNc4]);
  const box = { south: -90, north: 90, west: -180, east: 180 };

  it.each([
    ['classic', permuted],
    ['NetCDF-4', permutedNc4],
  ])('%s: the permutation really is step-outer, and every member and step equals the original', async (_kind, file) => {
    const ds = await openDataset(file);
    try {
      expect(ds.variable('t2m')?.dimensions).toEqual(['step', 'number', 'lat', 'lon']);
    } finally {
      await ds.close();
    }
    const original = await extractBoxJson(fixture, { variable: 't2m', box });
    const got = await extractBoxJson(file, { variable: 't2m', box });
    expect(original.members).toHaveLength(3);
    expect(got).toEqual(original);
  });
});
