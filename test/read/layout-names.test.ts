/**
 * Other layouts users meet, made from the ncgen fixtures with NCO (`ncrename`, `ncatted`, `ncpdq`, `ncap2`,
 * `ncecat`): ensemble dimensions named realization/number/member/ensemble, lead dimensions named
 * step/lead_time/forecast_period, longitude before latitude and member innermost, a scalar or size-1 height
 * coordinate, and _FillValue/missing_value of another type than the data. Each must give the numbers of the
 * unchanged file, which are themselves checked against cdo (cdo-g360-kessan.txt) and numpy (leadtime-expected.json).
 * Sources: CF 1.11 §3.5 (missing_value may differ in type from the data only when packed — readers accept it in
 * practice, as netCDF4-python and CDO do), §4.3 and §5.7 (scalar coordinate variables such as height), §4.4
 * (forecast_period); member and lead names are common practice (ECMWF, C3S, NCEP files), no source.
 */
import { execFileSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { extractBoxJson } from '../../src/read/extract.ts';
import { openDataset } from '../../src/read/open-dataset.ts';

const DIR = join(import.meta.dirname, '../fixtures/regions');
const tmp = mkdtempSync(join(tmpdir(), 'forelight-names-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
let n = 0;
/** A copy of a fixture changed by NCO commands (each given the file as last argument; `{f}` also stands for it). */
function variant(fixture: string, ...commands: string[][]): string {
  const out = join(tmp, `v${++n}.nc`);
  copyFileSync(join(DIR, fixture), out);
  for (const [tool, ...args] of commands) execFileSync(tool, [...args.map((a) => (a === '{f}' ? out : a)), out]);
  return out;
}

const KESSAN = { south: -12, north: -9, west: -3.5, east: -0.5 };

/** cdo fldmean -sellonlatbox on grid360.nc (committed by make-fixtures.sh), per member and step, K. */
function cdoKessan(): number[][] {
  const members: number[][] = [];
  for (const line of readFileSync(join(DIR, 'cdo-g360-kessan.txt'), 'utf8').split('\n')) {
    const f = line.trim().split(/\s+/);
    if (!line.startsWith('#') && f.length >= 3) (members[Number(f[f.length - 2])] ??= []).push(Number(f[f.length - 1]));
  }
  return members;
}

async function expectKessanAsCdo(file: string, variable = 't2m'): Promise<void> {
  const got = await extractBoxJson(file, { variable, box: KESSAN });
  const cdo = cdoKessan();
  expect(got.members).toHaveLength(cdo.length);
  got.members.forEach((row, m) => row.forEach((v, t) => expect(Math.abs((v as number) + 273.15 - cdo[m][t])).toBeLessThanOrEqual(1e-4)));
}

describe('ensemble dimension names (no standard_name: found by name)', () => {
  it.each(['realization', 'member', 'ensemble', 'number'])('%s', async (name) => {
    const file = variant(
      'grid360.nc',
      ['ncatted', '-O', '-a', 'standard_name,number,d,,'],
      ...(name === 'number' ? [] : [['ncrename', '-O', '-d', `number,${name}`, '-v', `number,${name}`]]),
    );
    const ds = await openDataset(file);
    expect(ds.variable('t2m')?.dimensions).toEqual(['time', name, 'lat', 'lon']);
    await ds.close();
    await expectKessanAsCdo(file);
  });
});

describe('member dimension named otherwise and moved (ncrename then ncpdq)', () => {
  it.each([
    ['realization', 'realization,time,lat,lon'],
    ['member', 'lat,member,lon,time'],
    ['ensemble', 'time,lon,lat,ensemble'],
  ])('%s in order %s', async (name, order) => {
    const file = variant(
      'grid360.nc',
      ['ncatted', '-O', '-a', 'standard_name,number,d,,'],
      ['ncrename', '-O', '-d', `number,${name}`, '-v', `number,${name}`],
      ['ncpdq', '-O', '-a', order, '{f}'],
    );
    const ds = await openDataset(file);
    expect(ds.variable('t2m')?.dimensions).toEqual(order.split(','));
    await ds.close();
    await expectKessanAsCdo(file);
  });
});

describe('dimension order, height coordinate, fill values', () => {
  it.each([
    ['lon,lat,time,number', 'classic'],
    ['lat,lon,time,number', 'classic'],
    ['lat,lon,time,number', 'NetCDF-4 (nccopy -k nc4 -d1)'],
  ])('time and member inner to the grid: ncpdq -a %s, %s', async (order, kind) => {
    const file = variant('grid360.nc', ['ncpdq', '-O', '-a', order, '{f}']);
    const read = kind === 'classic' ? file : join(tmp, `nc4-${++n}.nc`);
    if (read !== file) execFileSync('nccopy', ['-k', 'nc4', '-d', '1', file, read]);
    const ds = await openDataset(read);
    expect(ds.variable('t2m')?.dimensions).toEqual(order.split(','));
    await ds.close();
    await expectKessanAsCdo(read);
  });

  it('a scalar height coordinate (2 m, CF §5.7) named in coordinates', async () => {
    await expectKessanAsCdo(
      variant('grid360.nc', [
        'ncap2',
        '-O',
        '-s',
        'height=2.0;height@units="m";height@standard_name="height";height@positive="up";t2m@coordinates="height"',
        '{f}',
      ]),
    );
  });

  it('a height dimension of size 1 in front (ncecat -u height)', async () => {
    const file = join(tmp, 'height-dim.nc');
    execFileSync('ncecat', ['-O', '-u', 'height', join(DIR, 'grid360.nc'), file]);
    const ds = await openDataset(file);
    expect(ds.variable('t2m')?.dimensions).toEqual(['height', 'time', 'number', 'lat', 'lon']);
    await ds.close();
    await expectKessanAsCdo(file);
  });

  it('a level dimension of size 3 is refused in one line naming file, variable and dimension; the suggested ncks selection reads as the level', async () => {
    const levels = ['0.0f', '1.0f', '2.0f'].map((add) => variant('grid360.nc', ['ncap2', '-O', '-s', `t2m=t2m+${add}`, '{f}']));
    const file = join(tmp, 'levels.nc');
    execFileSync('ncecat', ['-O', '-u', 'level', ...levels, file]);
    const message = await extractBoxJson(file, { variable: 't2m', box: KESSAN }).then(
      () => 'read',
      (e: Error) => e.message,
    );
    expect(message.split('\n')).toHaveLength(1);
    expect(message).toContain(`${file}: variable 't2m' has extra dimension 'level' of size 3`);
    const fix = /ncks -d (level,0) (\S+) (\S+)/.exec(message);
    expect(fix?.[2]).toBe(file);
    execFileSync('ncks', ['-O', '-d', fix![1], fix![2], fix![3]], { cwd: tmp });
    await expectKessanAsCdo(join(tmp, fix![3]));
  });

  it.each([
    ['double', 'd'],
    ['short', 's'],
    ['int', 'l'],
  ])("missing_value stored as %s on float data instead of _FillValue (the fixture's missing cell stays missing)", async (_type, code) => {
    const file = variant('grid360.nc', ['ncatted', '-O', '-a', '_FillValue,t2m,d,,', '-a', `missing_value,t2m,o,${code},-9999`]);
    const ds = await openDataset(file);
    const attrs = ds.variable('t2m')?.attributes;
    expect(attrs?._FillValue).toBeUndefined();
    expect(attrs?.missing_value).toBe(-9999);
    await ds.close();
    await expectKessanAsCdo(file);
    // The box of marrow-highlands holds the missing cell: the mean must equal cdo, which skips it.
    const marrow = await extractBoxJson(file, { variable: 't2m', box: { south: -9, north: -6.5, west: -1.5, east: 1.5 } });
    const original = await extractBoxJson(join(DIR, 'grid360.nc'), {
      variable: 't2m',
      box: { south: -9, north: -6.5, west: -1.5, east: 1.5 },
    });
    expect(marrow).toEqual(original);
  });
});

/** cdo fldmean -sellonlatbox of a file made at test time, per member and step (cdo applies fill and packing itself). */
function cdoBox(file: string, box: { south: number; north: number; west: number; east: number }): number[][] {
  const lonlat = `-sellonlatbox,${box.west},${box.east},${box.south},${box.north}`;
  const out = execFileSync('cdo', ['-s', '--precision', '12', 'outputtab,date,lev,value', '-fldmean', lonlat, file], { encoding: 'utf8' });
  const members: number[][] = [];
  for (const line of out.split('\n')) {
    const f = line.trim().split(/\s+/);
    if (!line.startsWith('#') && f.length === 3) (members[Number(f[1])] ??= []).push(Number(f[2]));
  }
  return members;
}

async function expectAsCdo(file: string, box: { south: number; north: number; west: number; east: number }): Promise<void> {
  const got = await extractBoxJson(file, { variable: 't2m', box });
  const cdo = cdoBox(file, box);
  expect(got.members).toHaveLength(cdo.length);
  got.members.forEach((row, m) => row.forEach((v, t) => expect(Math.abs((v as number) + 273.15 - cdo[m][t])).toBeLessThanOrEqual(1e-4)));
}

const MARROW = { south: -9, north: -6.5, west: -1.5, east: 1.5 };

describe('fill values of another type and packed data, each against cdo on the same file', () => {
  // CF 1.11 §2.5.1: _FillValue should have the variable's type; ncatted writes a double one on float data anyway,
  // as converted files do. The fixture's one missing cell lies in marrow-highlands.
  it('a double _FillValue on float data (ncatted -a _FillValue,t2m,o,d,-9999)', async () => {
    const file = variant('grid360.nc', ['ncatted', '-O', '-a', '_FillValue,t2m,o,d,-9999']);
    const ds = await openDataset(file);
    expect(ds.variable('t2m')?.attributes._FillValue).toBe(-9999);
    await ds.close();
    await expectAsCdo(file, KESSAN);
    await expectAsCdo(file, MARROW);
  });

  // CF 1.11 §8.1 packed data: unpacked = packed × scale_factor + add_offset; ncpdq -P all_new packs float to short.
  it('short data with scale_factor/add_offset (ncpdq -P all_new), missing cell kept missing', async () => {
    const file = variant('grid360.nc', ['ncpdq', '-O', '-P', 'all_new', '{f}']);
    const ds = await openDataset(file);
    const attrs = ds.variable('t2m')?.attributes;
    expect(typeof attrs?.scale_factor).toBe('number');
    expect(typeof attrs?.add_offset).toBe('number');
    await ds.close();
    expect(execFileSync('ncdump', ['-h', file], { encoding: 'utf8' })).toMatch(/short t2m\(/);
    await expectAsCdo(file, KESSAN);
    await expectAsCdo(file, MARROW);
  });

  it('short data packed with a double missing_value and no _FillValue', async () => {
    const file = variant(
      'grid360.nc',
      ['ncpdq', '-O', '-P', 'all_new', '{f}'],
      ['ncatted', '-O', '-a', 'missing_value,t2m,o,d,-9999', '-a', '_FillValue,t2m,d,,'],
    );
    await expectAsCdo(file, KESSAN);
    await expectAsCdo(file, MARROW);
  });
});
