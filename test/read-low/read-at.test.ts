/** readRawAt (decode only chosen elements) returns exactly readRaw's values at those positions (fixtures by ncgen). */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { openDataset } from '../../src/read/open-dataset.ts';
import { mulberry32 } from '../support/rng.ts';

const DIR = join(import.meta.dirname, '../fixtures/netcdf');

describe('classic readRawAt', () => {
  for (const name of ['forecast-classic.nc', 'forecast-64bit.nc', 'forecast-cdf5.nc']) {
    it(`${name}: random boxes and positions (record and non-record variables, every type) agree with readRaw`, async () => {
      const ds = await openDataset(join(DIR, name));
      const rand = mulberry32(20261202);
      try {
        expect(ds.readRawAt).toBeTypeOf('function');
        for (const v of ds.variables.filter((x) => x.type !== 'char' && x.shape.length > 0)) {
          for (let trial = 0; trial < 10; trial++) {
            const start = v.shape.map((n) => Math.floor(rand() * n));
            const count = v.shape.map((n, d) => 1 + Math.floor(rand() * (n - start[d])));
            const all = await ds.readRaw(v.name, start, count);
            const positions = Int32Array.from({ length: 1 + Math.floor(rand() * all.length) }, () => Math.floor(rand() * all.length));
            const picked = await ds.readRawAt!(v.name, start, count, positions);
            expect(Array.from(picked)).toEqual(Array.from(positions, (p) => all[p]));
          }
        }
      } finally {
        await ds.close();
      }
    });
  }
});
