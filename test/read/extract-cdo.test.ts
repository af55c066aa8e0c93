/**
 * Box means and daily reductions checked against Debian's CDO 2.1.1 on fixtures made with ncgen
 * (test/fixtures/regions/make-fixtures.sh has the exact commands; CDO's output is committed beside them).
 * CDO's fldmean weights cells by area from bounds (derived from the centres when absent); sellonlatbox
 * keeps cells whose centre lies in the box, edges inclusive. CDO computes in float32 for float data, so
 * agreement is asked to 1e-4 K (= 1e-4 °C).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { extractBoxJson, type BoxExtractJson } from '../../src/read/extract.ts';
import { openDataset } from '../../src/read/open-dataset.ts';
import { findCoordinates } from '../../src/read/coordinates.ts';
import { selectRegionCells } from '../../src/read/regions.ts';

const DIR = join(import.meta.dirname, '../fixtures/regions');
const TOL = 1e-4;

/** CDO `outputtab,date[,time],lev,value` text → [member][step] values and the dates. */
function readCdo(name: string): { dates: string[]; members: number[][] } {
  const members: number[][] = [];
  const dates: string[] = [];
  for (const line of readFileSync(join(DIR, name), 'utf8').split('\n')) {
    const f = line.trim().split(/\s+/);
    if (line.startsWith('#') || f.length < 3) continue;
    const lev = Number(f[f.length - 2]);
    const value = Number(f[f.length - 1]);
    (members[lev] ??= []).push(value);
    if (lev === 0) dates.push(f[0]);
  }
  return { dates, members };
}

/** `extract` prints canonical °C; CDO keeps the file's K: compare in K (T[K] = T[degC] + 273.15, SI definition). */
function expectMembersClose(got: BoxExtractJson, cdo: { members: number[][] }, steps: number): void {
  expect(got.units).toBe('degC');
  expect(got.members.length).toBe(cdo.members.length);
  got.members.forEach((row, m) => {
    for (let t = 0; t < steps; t++) expect(Math.abs((row[t] as number) + 273.15 - cdo.members[m][t])).toBeLessThanOrEqual(TOL);
  });
}

const boxes = [
  {
    file: 'grid360.nc',
    cdo: 'cdo-g360-marrow.txt',
    box: { south: -9, north: -6.5, west: -1.5, east: 1.5 },
    what: 'box crossing 0° on a 0..360 grid, edges on centres, one missing cell',
  },
  {
    file: 'grid360-nc4.nc',
    cdo: 'cdo-g360-marrow.txt',
    box: { south: -9, north: -6.5, west: -1.5, east: 1.5 },
    what: 'same data as NetCDF-4/HDF5 (ncgen -k nc4)',
  },
  {
    file: 'grid360.nc',
    cdo: 'cdo-g360-kessan.txt',
    box: { south: -12, north: -9, west: -3.5, east: -0.5 },
    what: 'box west of 0° on a 0..360 grid',
  },
  { file: 'grid360.nc', cdo: 'cdo-g360-orrin.txt', box: { south: -8.5, north: -6, west: 2, east: 4 }, what: 'box east of 0°' },
  {
    file: 'grid360.nc',
    cdo: 'cdo-g360-dateline.txt',
    box: { south: -12, north: -6, west: 177, east: -177 },
    what: 'box crossing 180° on a 0..360 grid',
  },
  {
    file: 'grid180desc.nc',
    cdo: 'cdo-g180-marrow.txt',
    box: { south: -9, north: -6.5, west: -1.5, east: 1.5 },
    what: 'descending latitude with lat_bnds/lon_bnds, -180..180 grid',
  },
  {
    file: 'grid180desc.nc',
    cdo: 'cdo-g180-kessan.txt',
    box: { south: -12, north: -9, west: -3.5, east: -0.5 },
    what: 'descending latitude, box west of 0°',
  },
  {
    file: 'grid180desc.nc',
    cdo: 'cdo-g180-dateline.txt',
    box: { south: -12, north: -6, west: 177, east: -177 },
    what: 'box crossing 180° on a -180..180 grid',
  },
];

describe('box means vs cdo fldmean -sellonlatbox (Debian cdo 2.1.1)', () => {
  for (const b of boxes) {
    it(`${b.what} (${b.cdo})`, async () => {
      const got = await extractBoxJson(join(DIR, b.file), { variable: 't2m', box: b.box });
      const cdo = readCdo(b.cdo);
      expect(got.times).toEqual(['2026-11-23T00:00:00Z', '2026-11-24T00:00:00Z']);
      expectMembersClose(got, cdo, 2);
    });
  }

  it('selects the same cells as cdo sellonlatbox when box edges lie on centres (cdo-g360-marrow-cells.txt)', async () => {
    const ds = await openDataset(join(DIR, 'grid360.nc'));
    const coords = await findCoordinates(ds);
    await ds.close();
    const cells = selectRegionCells(
      coords.grid,
      {
        id: 'marrow-highlands',
        name: 'm',
        utcOffsetHours: 1,
        teams: [],
        cellRule: 'centre',
        shape: { kind: 'box', south: -9, north: -6.5, west: -1.5, east: 1.5 },
      },
      'grid360.nc',
    );
    const ours = Array.from(cells.latIndex, (y, k) => {
      const lon = coords.grid.lon[cells.lonIndex[k]];
      return `${lon > 180 ? lon - 360 : lon} ${coords.grid.lat[y]}`;
    }).sort();
    const theirs = readFileSync(join(DIR, 'cdo-g360-marrow-cells.txt'), 'utf8')
      .split('\n')
      .filter((l) => l.trim() && !l.startsWith('#'))
      .map((l) => l.trim().split(/\s+/).map(Number).join(' '))
      .sort();
    expect(ours).toEqual(theirs);
  });
});

describe('daily reduction per cell then area mean vs cdo fldmean -daymax / -daymean (6-hourly fixture)', () => {
  it('daily maximum, box crossing 0° (cdo-6h-marrow-daymax.txt); the incomplete last day is dropped', async () => {
    const got = await extractBoxJson(join(DIR, 'sixhourly.nc'), {
      variable: 't2m',
      box: { south: -9, north: -6.5, west: -1.5, east: 1.5 },
      daily: 'max',
      utcOffsetHours: 0,
    });
    const cdo = readCdo('cdo-6h-marrow-daymax.txt');
    expect(got.times).toEqual(cdo.dates.slice(0, 3));
    expectMembersClose(got, cdo, 3);
  });

  it('daily mean (cdo-6h-kessan-daymean.txt)', async () => {
    const got = await extractBoxJson(join(DIR, 'sixhourly.nc'), {
      variable: 't2m',
      box: { south: -12, north: -9, west: -3.5, east: -0.5 },
      daily: 'mean',
    });
    const cdo = readCdo('cdo-6h-kessan-daymean.txt');
    expect(got.times).toEqual(cdo.dates.slice(0, 3));
    expectMembersClose(got, cdo, 3);
  });

  it('local days UTC+1 = cdo daymax after shifttime,1hour (cdo-6h-marrow-daymax-utc+1.txt)', async () => {
    const got = await extractBoxJson(join(DIR, 'sixhourly.nc'), {
      variable: 't2m',
      box: { south: -9, north: -6.5, west: -1.5, east: 1.5 },
      daily: 'max',
      utcOffsetHours: 1,
    });
    const cdo = readCdo('cdo-6h-marrow-daymax-utc+1.txt');
    expect(got.times).toEqual(cdo.dates.slice(0, 3));
    expectMembersClose(got, cdo, 3);
  });

  it('local days UTC-3 = cdo daymin after shifttime,-3hour; the lone first local evening is dropped (cdo-6h-marrow-daymin-utc-3.txt)', async () => {
    const got = await extractBoxJson(join(DIR, 'sixhourly.nc'), {
      variable: 't2m',
      box: { south: -9, north: -6.5, west: -1.5, east: 1.5 },
      daily: 'min',
      utcOffsetHours: -3,
    });
    const cdo = readCdo('cdo-6h-marrow-daymin-utc-3.txt');
    expect(got.times).toEqual(cdo.dates.slice(1, 4));
    expectMembersClose(got, { members: cdo.members.map((row) => row.slice(1)) }, 3);
  });
});
