/**
 * Reads larger than one 4 MiB read piece, on a file written at test time by netCDF4-python (Unidata)
 * with numpy arange data, so the expected value at flat index i is i (+ offset): exact in float32 below 2^24.
 * Command: /usr/bin/python3 -c '<WRITE_SCRIPT below>' OUT.nc
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Dataset } from '../../src/read/dataset.ts';
import { openDataset } from '../../src/read/open-dataset.ts';

const WRITE_SCRIPT = `
import sys, netCDF4, numpy as np
d = netCDF4.Dataset(sys.argv[1], 'w', format='NETCDF3_CLASSIC')
d.createDimension('time', None); d.createDimension('y', 1100); d.createDimension('x', 1000)
fixed = d.createVariable('fixed', 'f4', ('y', 'x')); fixed[:] = np.arange(1_100_000, dtype=np.float32).reshape(1100, 1000)
big = d.createVariable('big', 'f4', ('time', 'y', 'x'))
small = d.createVariable('small', 'i2', ('time', 'x'))
for t in range(3):
    big[t] = np.arange(1_100_000, dtype=np.float32).reshape(1100, 1000) + t * 1_100_000
    small[t] = np.arange(1000, dtype=np.int16) - t
d.close()
`;

const dir = mkdtempSync(join(tmpdir(), 'forelight-large-'));
const file = join(dir, 'large.nc');
let ds: Dataset;
beforeAll(async () => {
  execFileSync('/usr/bin/python3', ['-c', WRITE_SCRIPT, file]);
  ds = await openDataset(file);
});
afterAll(async () => {
  await ds?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('reads beyond one read piece (numpy arange reference)', () => {
  it('reads a whole 4.4 MB non-record variable', async () => {
    const v = await ds.readRaw('fixed', [0, 0], [1100, 1000]);
    expect(v.length).toBe(1_100_000);
    expect(v.every((x, i) => x === i)).toBe(true);
  });

  it('reads interleaved 4.4 MB records and a box across records', async () => {
    const v = await ds.readRaw('big', [0, 0, 0], [3, 1100, 1000]);
    expect(v.every((x, i) => x === i)).toBe(true);
    const box = await ds.readRaw('big', [1, 500, 300], [2, 3, 4]);
    const expected: number[] = [];
    for (let t = 1; t < 3; t++) for (let y = 500; y < 503; y++) for (let x = 300; x < 304; x++) expected.push(t * 1_100_000 + y * 1000 + x);
    expect(Array.from(box)).toEqual(expected);
    expect(Array.from(await ds.readRaw('small', [0, 998], [3, 2]))).toEqual([998, 999, 997, 998, 996, 997]);
  });
});

describe('a header larger than the first 64 KiB prefix (ncgen -k 64-bit-offset, ncdump reference)', () => {
  it('re-reads a longer prefix and still finds the data', async () => {
    const cdl = join(dir, 'wide-header.cdl');
    const nc = join(dir, 'wide-header.nc');
    const history = 'x'.repeat(150_000);
    writeFileSync(
      cdl,
      `netcdf wide { dimensions: n = 3 ; variables: double v(n) ; v:note = "${history}" ; :history = "${history}" ; data: v = 1.5, -2, 3.25 ; }`,
    );
    execFileSync('ncgen', ['-k', '64-bit-offset', '-o', nc, cdl]);
    const wide = await openDataset(nc);
    try {
      expect((wide.attributes.history as string).length).toBe(150_000);
      // ncdump (netCDF-C, Unidata) prints v = 1.5, -2, 3.25 for this file.
      expect(execFileSync('ncdump', ['-v', 'v', nc], { encoding: 'utf8' })).toContain('v = 1.5, -2, 3.25 ;');
      expect(Array.from(await wide.readRaw('v', [0], [3]))).toEqual([1.5, -2, 3.25]);
    } finally {
      await wide.close();
    }
  });
});
