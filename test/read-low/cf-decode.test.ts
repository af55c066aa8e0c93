/**
 * decodeCf against netCDF4-python (Unidata) auto mask-and-scale, run at test time:
 * /usr/bin/python3 test/read-low/netcdf4-decoded.py FILE VAR...
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { decodeCf } from '../../src/read/cf-decode.ts';
import type { VariableInfo } from '../../src/read/dataset.ts';
import { openDataset } from '../../src/read/open-dataset.ts';

const dir = fileURLToPath(new URL('../fixtures/netcdf/', import.meta.url));
const script = fileURLToPath(new URL('./netcdf4-decoded.py', import.meta.url));
// `flag` (byte, no _FillValue) is left out: netCDF4-python masks byte -127 in classic files with fill mode
// on, while the NUG (and ncdump) assume no default fill for bytes; decodeCf follows the NUG (tested below).
const NAMES = ['t2m', 'tp', 'q', 'rh', 'time'];

describe.each(['forecast-classic.nc', 'forecast-cdf5.nc', 'forecast-nc4.nc', 'extended-types-nc4.nc'])('decodeCf on %s', (fileName) => {
  it('masks and unpacks exactly as netCDF4-python (Unidata) does', async () => {
    const file = dir + fileName;
    const ds = await openDataset(file);
    try {
      const names = ds.variables.map((v) => v.name).filter((n) => NAMES.includes(n) || fileName.startsWith('extended'));
      const reference = JSON.parse(execFileSync('/usr/bin/python3', [script, file, ...names], { encoding: 'utf8' })) as Record<
        string,
        (number | null)[]
      >;
      for (const name of names) {
        const info = ds.variable(name)!;
        const { values, missing } = decodeCf(
          info,
          await ds.readRaw(
            name,
            info.shape.map(() => 0),
            info.shape,
          ),
        );
        const expected = reference[name];
        expect(
          Array.from(values, (v) => (Number.isNaN(v) ? null : v)),
          name,
        ).toEqual(expected);
        expect(missing, name).toBe(expected.filter((v) => v === null).length);
      }
    } finally {
      await ds.close();
    }
  });
});

function info(type: VariableInfo['type'], attributes: VariableInfo['attributes']): VariableInfo {
  return { name: 'x', dimensions: ['n'], shape: [4], type, attributes };
}

describe('decodeCf rules', () => {
  it('masks netCDF-C default fill values when _FillValue is absent (netcdf.h NC_FILL_FLOAT, NC_FILL_SHORT)', () => {
    const f = decodeCf(info('float', {}), Float64Array.of(1, Math.fround(9.969209968386869e36), 2, NaN));
    expect(Array.from(f.values)).toEqual([1, NaN, 2, NaN]);
    expect(f.missing).toBe(2);
    expect(Array.from(decodeCf(info('short', {}), Float64Array.of(-32767, 5)).values)).toEqual([NaN, 5]);
  });

  it('does not mask byte default fill -127 (NetCDF Users Guide, _FillValue: no default fill assumed for byte)', () => {
    expect(Array.from(decodeCf(info('byte', {}), Float64Array.of(-127, 1)).values)).toEqual([-127, 1]);
  });

  it('tests valid_range on packed values before scale_factor/add_offset (CF §2.5.1, §8.1)', () => {
    const d = decodeCf(info('short', { valid_range: [0, 100], scale_factor: 0.5, add_offset: 10 }), Float64Array.of(-1, 0, 100, 101));
    expect(Array.from(d.values)).toEqual([NaN, 10, 60, NaN]);
    expect(d.missing).toBe(2);
  });

  it('masks every missing_value of a vector and a float _FillValue given as double (CF §2.5.1)', () => {
    const d = decodeCf(
      info('float', { missing_value: [-999, -998, -997], _FillValue: 1e20 }),
      Float64Array.of(-999, -998, -997, Math.fround(1e20), 3),
    );
    expect(Array.from(d.values)).toEqual([NaN, NaN, NaN, NaN, 3]);
  });

  it('decodes in place (the returned array is the raw array)', () => {
    const raw = Float64Array.of(1, 2);
    expect(decodeCf(info('double', { scale_factor: 2 }), raw).values).toBe(raw);
  });
});
