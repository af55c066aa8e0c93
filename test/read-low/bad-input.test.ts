/** Bad input gives one-line InputErrors naming the file and what to do. */
import { execFileSync, spawnSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, rmSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.ts';
import { checkHdf5Filters } from '../../src/read/hdf5-filters.ts';
import { openDataset } from '../../src/read/open-dataset.ts';

const dir = fileURLToPath(new URL('../fixtures/netcdf/', import.meta.url));
const tmp = mkdtempSync(join(tmpdir(), 'forelight-read-low-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

function truncatedCopy(name: string, bytes: number): string {
  const out = join(tmp, `${bytes}-${name}`);
  copyFileSync(dir + name, out);
  truncateSync(out, bytes);
  return out;
}

async function openError(path: string): Promise<InputError> {
  const err = await openDataset(path).then(
    () => undefined,
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(InputError);
  expect((err as Error).message).not.toContain('\n');
  return err as InputError;
}

describe('openDataset on bad files', () => {
  // forecast-classic.nc is 3012 bytes (ncgen); its last variable ends at the end of the file.
  it('reports a classic file cut in its data with the expected and found sizes', async () => {
    const file = truncatedCopy('forecast-classic.nc', 2000);
    const err = await openError(file);
    expect(err.message).toBe(`${file}: file is truncated: expected 3012 bytes, found 2000 — re-download it`);
    expect(err.code).toBe('input-truncated');
  });

  it('reports a classic file cut inside its header', async () => {
    const file = truncatedCopy('forecast-64bit.nc', 100);
    expect((await openError(file)).message).toMatch(
      /file is truncated: the NetCDF header continues past the end of the file \(100 bytes\) — re-download it$/,
    );
  });

  it('reports a NetCDF-4 file shorter than its HDF5 superblock end-of-file address', async () => {
    const file = truncatedCopy('forecast-nc4.nc', 20000);
    expect((await openError(file)).message).toBe(`${file}: file is truncated: expected 41300 bytes, found 20000 — re-download it`);
  });

  it('rejects a text file and an empty file as not NetCDF, naming what it starts with', async () => {
    const text = join(tmp, 'notes.txt');
    writeFileSync(text, 'station,temp\n1,20\n');
    expect((await openError(text)).message).toMatch(
      /notes\.txt: not a NetCDF file \(starts with "stat"; expected CDF\\x01, CDF\\x02, CDF\\x05 or an HDF5 signature\) — it is text \(an error page or a listing\?\), not data: check the source path, or download the file again$/,
    );
    const empty = join(tmp, 'empty.nc');
    writeFileSync(empty, '');
    expect((await openError(empty)).message).toContain('not a NetCDF file (the file is empty; expected');
    expect((await openError(empty)).message).toMatch(/— download it again/);
  });

  // What portals deliver instead of the file (common practice, no source): a gzip-compressed file under its .nc name,
  // a zip archive of NetCDF files. The command the refusal prints is run as printed, and its output reads.
  it.each([
    {
      what: 'a gzip-compressed file under a .nc name',
      pack: (f: string) => execFileSync('sh', ['-c', `gzip -c ${dir}forecast-classic.nc > ${f}`]),
    },
    { what: 'a zip archive of the NetCDF file', pack: (f: string) => execFileSync('zip', ['-j', '-q', f, `${dir}forecast-classic.nc`]) },
  ])('$what: the printed command unpacks it into a file that reads', async ({ pack }) => {
    const work = mkdtempSync(join(tmp, 'packed-'));
    const file = join(work, 'download.nc');
    pack(file);
    const message = (await openError(file)).message;
    const command = /\((gunzip -c \S+ > \S+)\)|\((unzip \S+)\)/.exec(message);
    expect(command).not.toBeNull();
    execFileSync('sh', ['-c', command![1] ?? command![2]], { cwd: work });
    const unpacked = join(work, command![1] ? 'unpacked.nc' : 'forecast-classic.nc');
    const [ds, original] = [await openDataset(unpacked), await openDataset(dir + 'forecast-classic.nc')];
    try {
      expect(Array.from(await ds.readRaw('t2m', [0, 0, 0, 0], [3, 4, 5, 6]))).toEqual(
        Array.from(await original.readRaw('t2m', [0, 0, 0, 0], [3, 4, 5, 6])),
      );
    } finally {
      await ds.close();
      await original.close();
    }
  });

  it('names a missing file', async () => {
    expect((await openError(join(tmp, 'absent.nc'))).message).toMatch(/absent\.nc: cannot open the file \(ENOENT\) — check the path/);
  });
});

describe('variables and selections', () => {
  it.each(['one-record-classic.nc', 'forecast-nc4.nc'])('%s: reading a variable the file lacks lists the ones it has', async (name) => {
    const ds = await openDataset(dir + name);
    try {
      expect(ds.variable('tas')).toBeUndefined();
      await expect(ds.readRaw('tas', [0], [1])).rejects.toThrow(
        `${dir}${name}: variable 'tas' not found — use one of: ${ds.variables.map((v) => v.name).join(', ')}`,
      );
    } finally {
      await ds.close();
    }
  });

  it.each(['forecast-classic.nc', 'forecast-nc4.nc'])('%s: a box outside the variable names the dimension', async (name) => {
    const ds = await openDataset(dir + name);
    try {
      await expect(ds.readRaw('t2m', [0, 0, 4, 0], [1, 1, 2, 6])).rejects.toThrow(
        /variable 't2m' dimension 'lat' has size 5 but the read asks for 2 values from index 4/,
      );
      await expect(ds.readRaw('t2m', [0, 0], [1, 1])).rejects.toThrow(
        /has 4 dimensions \(number, step, lat, lon\) but start\/count have 2\/2/,
      );
    } finally {
      await ds.close();
    }
  });
});

describe('checkHdf5Filters (mocked filter lists: ncgen/nccopy here cannot write a filter h5wasm lacks)', () => {
  it('accepts deflate, shuffle, fletcher32 and szip (HDF Group registered filter ids 1-4)', () => {
    expect(() => checkHdf5Filters('a.nc', 't2m', [{ id: 2 }, { id: 1 }, { id: 3 }, { id: 4 }])).not.toThrow();
  });

  it('names an unsupported filter and how to re-compress', () => {
    expect(() => checkHdf5Filters('a.nc', 't2m', [{ id: 2 }, { id: 32015, name: 'zstd' }])).toThrow(
      "a.nc: variable 't2m' is compressed with HDF5 filter 32015 (zstd), which this reader cannot decode — re-compress the file with `nccopy -d1 a.nc fixed.nc` (deflate), or install decoding support for filter 32015",
    );
    expect(() => checkHdf5Filters('a.nc', 'tp', [{ id: 32001 }])).toThrow(/filter 32001 \(blosc\)/);
    expect(() => checkHdf5Filters('a.nc', 'tp', [{ id: 40000 }])).toThrow(/filter 40000 \(unknown\)/);
  });
});

// h5py (HDF5 for Python) writes a filter it does not have when allow_unknown_filter=True (then stored as
// optional and skipped at write time). The test is skipped where /usr/bin/python3 has no h5py.
const hasH5py = spawnSync('/usr/bin/python3', ['-c', 'import h5py']).status === 0;
const H5PY_SCRIPT = `
import sys, h5py, numpy as np
with h5py.File(sys.argv[1], 'w') as f:
    f.create_dataset('v', data=np.arange(12, dtype='f4').reshape(3, 4), chunks=(1, 4), compression=32015, compression_opts=(3,), allow_unknown_filter=True)
    f.create_dataset('plain', data=np.arange(6, dtype='i2').reshape(2, 3))
`;

describe.skipIf(!hasH5py)('a plain HDF5 file written by h5py with a zstd (32015) filter', () => {
  it('refuses the zstd variable by name and reads the other one with netCDF-C style phony dimensions', async () => {
    const file = join(tmp, 'zstd.h5');
    execFileSync('/usr/bin/python3', ['-c', H5PY_SCRIPT, file]);
    const ds = await openDataset(file);
    try {
      await expect(ds.readRaw('v', [0, 0], [1, 4])).rejects.toThrow(/variable 'v' is compressed with HDF5 filter 32015 \(zstd\)/);
      expect(ds.variable('plain')).toMatchObject({ dimensions: ['phony_dim_0', 'phony_dim_1'], shape: [2, 3], type: 'short' });
      expect(Array.from(await ds.readRaw('plain', [1, 1], [1, 2]))).toEqual([4, 5]); // numpy arange(6).reshape(2, 3)[1, 1:3]
    } finally {
      await ds.close();
    }
  });
});
