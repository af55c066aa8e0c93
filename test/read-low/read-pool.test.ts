/** readManyRaw over worker threads returns what single-threaded readRaw returns, in request order. */
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { readManyRaw } from '../../src/read/hdf5-read-pool.ts';
import { ncdumpValues } from './ncdump-reference.ts';

const dir = fileURLToPath(new URL('../fixtures/netcdf/', import.meta.url));

describe('readManyRaw', () => {
  it('reads several variables and files on 2 workers; a bad request fails alone', async () => {
    const nc4 = dir + 'forecast-nc4.nc';
    const results = await readManyRaw([
      { path: nc4, variable: 't2m', start: [0, 0, 0, 0], count: [3, 4, 5, 6] },
      { path: dir + 'forecast-nc4-szip.nc', variable: 't2m', start: [2, 3, 4, 5], count: [1, 1, 1, 1] },
      { path: nc4, variable: 'nope', start: [0], count: [1] },
      { path: nc4, variable: 'rh', start: [0, 0], count: [5, 5] },
      { path: dir + 'forecast-classic.nc', variable: 'q', start: [0, 0], count: [5, 3] },
    ]);
    // Expected values: ncdump (netCDF-C, Unidata); `_` is the variable's _FillValue or NC_FILL_SHORT.
    const fill = (values: (number | null)[], f: number): number[] => values.map((v) => v ?? f);
    expect(results.map((r) => r.ok)).toEqual([true, true, false, true, true]);
    if (!results[0].ok || !results[1].ok || results[2].ok || !results[3].ok || !results[4].ok) return;
    expect(Array.from(results[0].values)).toEqual(fill(ncdumpValues(nc4, 't2m'), -32767));
    expect(Array.from(results[1].values)).toEqual([-2999]);
    expect(results[2].error.message).toBe(`${nc4}: variable 'nope' not found — use one of: number, step, lat, lon, t2m, time, tp, flag, q, rh, scalar_var`);
    expect(Array.from(results[3].values)).toEqual(fill(ncdumpValues(nc4, 'rh'), 1e20));
    expect(Array.from(results[4].values)).toEqual(fill(ncdumpValues(dir + 'forecast-classic.nc', 'q'), -32767));
  });

  it('returns an empty list without starting workers', async () => {
    expect(await readManyRaw([])).toEqual([]);
  });
});
