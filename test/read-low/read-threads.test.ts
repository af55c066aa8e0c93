/**
 * NetCDF-4 reads on worker threads (hdf5-slice-pool.ts): the values are the same on 0, 1 and 2 threads and
 * equal ncdump's (netCDF-C, Unidata); a failed read names the file and variable and does not stop other
 * reads; idle workers never keep a run from exiting.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { ForelightError, InputError } from '../../src/core/errors.ts';
import { Hdf5SlicePool, SliceError, readThreads } from '../../src/read/hdf5-slice-pool.ts';
import { openDataset } from '../../src/read/open-dataset.ts';
import { ncdumpValues } from './ncdump-reference.ts';

const root = fileURLToPath(new URL('../../', import.meta.url));
const dir = join(root, 'test/fixtures/netcdf/');
const tmp = mkdtempSync(join(tmpdir(), 'forelight-threads-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

type ChildOutput = { threads: number; values: Record<string, { whole: number[]; picked: number[] }> };

function readInChild(file: string, threads: string): ChildOutput {
  const text = execFileSync(process.execPath, [join(root, 'bin/run-ts.mjs'), join(root, 'test/read-low/read-threads-child.ts'), file], {
    env: { ...process.env, FORELIGHT_READ_THREADS: threads },
    encoding: 'utf8',
    timeout: 60_000,
  });
  return JSON.parse(text) as ChildOutput;
}

describe('NetCDF-4 reads on worker threads', () => {
  it.each(['forecast-nc4.nc', 'forecast-nc4-szip.nc'])(
    '%s: the same values on 0, 1 and 2 threads, equal to ncdump; the child exits by itself',
    (name) => {
      const [zero, one, two] = ['0', '1', '2'].map((t) => readInChild(dir + name, t));
      expect([zero.threads, one.threads, two.threads]).toEqual([0, 1, 2]);
      expect(one.values).toEqual(zero.values);
      expect(two.values).toEqual(zero.values);
      const inThread = zero.values;
      // ncdump prints `_` for the fill value; t2m's _FillValue is -32767 (forecast.cdl).
      expect(inThread.t2m.whole).toEqual(ncdumpValues(dir + name, 't2m').map((v) => v ?? -32767));
      const n = inThread.t2m.whole.length;
      expect(inThread.t2m.picked).toEqual([1, 3, 5, 7, 9].map((k) => inThread.t2m.whole[n - k]));
    },
    120_000,
  );

  it('a file replaced after it was opened is refused by name (the worker would open the new one); another file still reads', async () => {
    const file = join(tmp, 'replaced.nc');
    copyFileSync(dir + 'forecast-nc4.nc', file);
    const ds = await openDataset(file);
    const good = await openDataset(dir + 'forecast-nc4.nc');
    try {
      writeFileSync(file, Buffer.alloc(4096)); // the download was replaced after the header was read
      const failed = ds.readRaw('t2m', [0, 0, 0, 0], [3, 4, 5, 6]);
      const fine = good.readRaw('t2m', [0, 0, 0, 0], [3, 4, 5, 6]);
      await expect(failed).rejects.toBeInstanceOf(InputError);
      await expect(failed).rejects.toMatchObject({ code: 'input-changed' });
      await expect(failed).rejects.toThrow(
        `${file}: the file was replaced or modified on disk after it was opened (variable 't2m') — run again once the download has finished`,
      );
      expect(Array.from(await fine)).toEqual(ncdumpValues(dir + 'forecast-nc4.nc', 't2m').map((v) => v ?? -32767));
    } finally {
      await ds.close();
      await good.close();
    }
  });

  it('a worker that dies rejects its pending reads as kind "worker", and the next read gets a new worker', async () => {
    const pool = new Hdf5SlicePool(1, new URL('./exiting-worker.mjs', import.meta.url));
    const request = { path: dir + 'forecast-nc4.nc', identity: 'unused', name: 't2m', start: [0, 0, 0, 0], count: [1, 1, 1, 1] };
    for (let attempt = 0; attempt < 2; attempt++) {
      const read = pool.read(request);
      await expect(read).rejects.toBeInstanceOf(SliceError);
      await expect(read).rejects.toMatchObject({ kind: 'worker', message: 'the read worker stopped (exit code 3)' });
    }
  });

  it('a bad FORELIGHT_READ_THREADS is reported as itself, not as a problem of the NetCDF-4 file', () => {
    const r = spawnSync(
      process.execPath,
      [join(root, 'bin/forelight.mjs'), 'extract', dir + 'forecast-nc4.nc', '--var', 't2m', '--box', '-90,90,-180,180', '--json'],
      {
        env: { ...process.env, FORELIGHT_READ_THREADS: 'two' },
        encoding: 'utf8',
        timeout: 60_000,
      },
    );
    expect(r.status).not.toBe(0);
    expect(r.stderr).toContain("FORELIGHT_READ_THREADS='two' is not a whole number of threads — unset it");
    expect(r.stderr).not.toContain('metadata could not be read');
  }, 60_000);

  it('FORELIGHT_READ_THREADS takes whole numbers ≥ 0; anything else is a one-line error saying what to set', () => {
    expect(readThreads({ FORELIGHT_READ_THREADS: '0' })).toBe(0);
    expect(readThreads({ FORELIGHT_READ_THREADS: ' 3 ' })).toBe(3);
    expect(readThreads({})).toBeGreaterThanOrEqual(1);
    expect(readThreads({})).toBeLessThanOrEqual(2);
    for (const bad of ['two', '-1', '1.5']) {
      expect(() => readThreads({ FORELIGHT_READ_THREADS: bad })).toThrow(ForelightError);
      expect(() => readThreads({ FORELIGHT_READ_THREADS: bad })).toThrow(
        `FORELIGHT_READ_THREADS='${bad}' is not a whole number of threads — unset it, or set 0`,
      );
    }
  });
});
