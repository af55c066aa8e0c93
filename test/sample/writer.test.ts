// The streaming NetCDF classic writer, checked against Debian `ncdump` (netCDF-C 4.9, the reference
// implementation of the Unidata "NetCDF Classic Format Specification").
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { openDataset } from '../../src/read/open-dataset.ts';
import { createNetcdfClassic, type NcFileSpec, type NcFormat } from '../../src/sample/netcdf-classic-writer.ts';

const dir = mkdtempSync(join(tmpdir(), 'forelight-writer-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const ncdump = (...args: string[]): string => execFileSync('ncdump', args, { encoding: 'utf8' });

function smallSpec(format: NcFormat): NcFileSpec {
  return {
    format,
    dimensions: [
      { name: 'time', size: 2, unlimited: true },
      { name: 'lat', size: 2 },
      { name: 'lon', size: 3 },
    ],
    attributes: {
      Conventions: 'CF-1.8',
      counts: { type: 'int', values: [1, -2] },
      flags: { type: 'short', values: [7] },
      ratio: { type: 'float', values: [0.25] },
      pi: 3.5,
    },
    variables: [
      { name: 'lat', type: 'double', dimensions: ['lat'], attributes: { units: 'degrees_north' } },
      { name: 'time', type: 'double', dimensions: ['time'], attributes: { units: 'hours since 2026-11-26 00:00:00' } },
      // 3 shorts per record: 6 bytes padded to 8 between records (spec: vsize rounded up to 4).
      {
        name: 'packed',
        type: 'short',
        dimensions: ['time', 'lon'],
        attributes: {
          scale_factor: { type: 'float', values: [0.01] },
          add_offset: { type: 'float', values: [300] },
          _FillValue: { type: 'short', values: [-32767] },
        },
      },
      { name: 'field', type: 'float', dimensions: ['time', 'lat', 'lon'], attributes: { _FillValue: { type: 'float', values: [1e20] } } },
      { name: 'code', type: 'int', dimensions: [] },
      { name: 'odd', type: 'byte', dimensions: ['lon'] },
    ],
  };
}

async function writeSmall(path: string, format: NcFormat): Promise<void> {
  const w = await createNetcdfClassic(path, smallSpec(format));
  await w.write('field', 3, Float32Array.from([4, 5, 6, 7, 8, 9, 10, 11, 1e20])); // record 0 tail, record 1 whole
  await w.write('field', 0, Float32Array.from([1, 2.5, 3]));
  await w.write('packed', 0, Int16Array.from([1, -32767, 3, 4, 5, 6]));
  await w.write('lat', 0, [-4, -4.5]);
  await w.write('time', 0, [12, 36]);
  await w.write('code', 0, [42]);
  await w.write('odd', 0, [-1, 0, 1]);
  await w.close();
}

describe('netcdf classic writer vs ncdump', () => {
  for (const [format, kind] of [
    ['classic', 'classic'],
    ['64bit-offset', '64-bit offset'],
    ['cdf5', 'cdf5'],
  ] as const) {
    it(`${format}: ncdump -k says "${kind}" and dumps header and data as written`, async () => {
      const path = join(dir, `small-${format}.nc`);
      await writeSmall(path, format);
      expect(ncdump('-k', path).trim()).toBe(kind);
      const cdl = ncdump(path);
      expect(cdl).toContain('time = UNLIMITED ; // (2 currently)');
      expect(cdl).toContain('short packed(time, lon) ;');
      expect(cdl).toContain('packed:scale_factor = 0.01f ;');
      expect(cdl).toContain('packed:_FillValue = -32767s ;');
      expect(cdl).toContain(':counts = 1, -2 ;');
      expect(cdl).toContain(':flags = 7s ;');
      expect(cdl).toContain(':ratio = 0.25f ;');
      expect(cdl).toContain(':pi = 3.5 ;');
      expect(cdl).toContain(':Conventions = "CF-1.8" ;');
      const data = cdl.slice(cdl.indexOf('data:')).replace(/\s+/g, ' ');
      expect(data).toContain('lat = -4, -4.5 ;');
      expect(data).toContain('time = 12, 36 ;');
      expect(data).toContain('packed = 1, _, 3, 4, 5, 6 ;');
      expect(data).toContain('field = 1, 2.5, 3, 4, 5, 6, 7, 8, 9, 10, 11, _ ;');
      expect(data).toContain('code = 42 ;');
      expect(data).toContain('odd = -1, 0, 1 ;');
    });
  }

  it('a single record variable is stored without record padding (spec special case)', async () => {
    const path = join(dir, 'one-record-var.nc');
    const w = await createNetcdfClassic(path, {
      format: 'classic',
      dimensions: [{ name: 't', size: 3, unlimited: true }],
      variables: [{ name: 's', type: 'short', dimensions: ['t'] }],
    });
    await w.write('s', 0, [1, 2, 3]);
    await w.close();
    expect(ncdump('-v', 's', path).replace(/\s+/g, ' ')).toContain('s = 1, 2, 3 ;');
    expect(statSync(path).size).toBe(w.totalBytes);
  });

  for (const format of ['64bit-offset', 'cdf5'] as const) {
    it(`${format}: a variable beginning beyond 4 GiB is read back by ncdump and by Forelight's reader (sparse file)`, async () => {
      const path = join(dir, `big-${format}.nc`);
      const huge = 400_000_000; // floats: 1.6 GB each, three of them push `tail` past 4.8 GB
      const w = await createNetcdfClassic(path, {
        format,
        dimensions: [
          { name: 'n', size: huge },
          { name: 'k', size: 2 },
        ],
        variables: ['a', 'b', 'c']
          .map((name) => ({ name, type: 'float' as const, dimensions: ['n'] }))
          .concat([{ name: 'tail', type: 'float', dimensions: ['k'] }]),
      });
      await w.write('c', huge - 1, [7.5]);
      await w.write('tail', 0, [1.25, -2]);
      await w.close();
      expect(w.totalBytes).toBeGreaterThan(2 ** 32);
      expect(ncdump('-v', 'tail', path).replace(/\s+/g, ' ')).toContain('tail = 1.25, -2 ;');
      const ds = await openDataset(path);
      try {
        expect(Array.from(await ds.readRaw('tail', [0], [2]))).toEqual([1.25, -2]);
        expect(Array.from(await ds.readRaw('c', [huge - 1], [1]))).toEqual([7.5]);
      } finally {
        await ds.close();
      }
      rmSync(path);
    });
  }

  it('refuses a write that overruns the variable, naming file and variable', async () => {
    const w = await createNetcdfClassic(join(dir, 'overrun.nc'), {
      format: 'classic',
      dimensions: [{ name: 'x', size: 2 }],
      variables: [{ name: 'v', type: 'int', dimensions: ['x'] }],
    });
    await expect(w.write('v', 1, [1, 2])).rejects.toThrow(/overrun.nc.*overruns v/);
    await w.close();
  });

  it('refuses CDF-1 when offsets pass 2 GiB', async () => {
    const spec: NcFileSpec = {
      format: 'classic',
      dimensions: [{ name: 'n', size: 600_000_000 }],
      variables: [
        { name: 'a', type: 'float', dimensions: ['n'] },
        { name: 'b', type: 'float', dimensions: ['n'] },
      ],
    };
    await expect(createNetcdfClassic(join(dir, 'too-big.nc'), spec)).rejects.toThrow(/use format 64bit-offset or cdf5/);
  });
});
