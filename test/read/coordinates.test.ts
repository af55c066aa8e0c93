/** Coordinate discovery by CF attributes (CF Conventions 1.x §4, §4.4, §7.1, §7.3). */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.ts';
import { findCoordinates, layoutVariable } from '../../src/read/coordinates.ts';
import { parseCellMethods, timeCellMethod } from '../../src/read/cell-methods.ts';
import { makeFakeDataset } from './fake-dataset.ts';
import { makeFakeForecast } from './fake-forecast.ts';

const H = 3_600_000;
const REF = Date.UTC(2026, 10, 23);

describe('findCoordinates', () => {
  it('finds latitude/longitude by units under unusual names, time by axis T, bounds via the bounds attribute', async () => {
    const ds = makeFakeDataset({
      dimensions: { t: 2, yc: 2, xc: 3, nv: 2, ens: 2 },
      variables: {
        yc: { dimensions: ['yc'], attributes: { units: 'degrees_north', bounds: 'yc_b' }, data: [-10, -8] },
        yc_b: { dimensions: ['yc', 'nv'], data: [-11, -9, -9, -7] },
        xc: { dimensions: ['xc'], attributes: { units: 'degree_east' }, data: [0, 2, 4] },
        t: { dimensions: ['t'], attributes: { axis: 'T', units: 'days since 2026-11-23', bounds: 't_b' }, data: [0.5, 1.5] },
        t_b: { dimensions: ['t', 'nv'], data: [0, 1, 1, 2] },
        tas: {
          dimensions: ['t', 'ens', 'yc', 'xc'],
          attributes: { units: 'K', cell_methods: 'area: mean t: maximum (interval: 1 hour)' },
          data: new Array(24).fill(300),
        },
      },
    });
    const c = await findCoordinates(ds);
    expect([c.grid.latName, c.grid.lonName]).toEqual(['yc', 'xc']);
    expect(Array.from(c.grid.latBounds ?? [])).toEqual([-11, -9, -9, -7]);
    expect(c.grid.lonBounds).toBeNull();
    expect(Array.from(c.time?.stampsMs ?? [])).toEqual([REF + 12 * H, REF + 36 * H]);
    expect(Array.from(c.time?.boundsMs ?? [])).toEqual([REF, REF + 24 * H, REF + 24 * H, REF + 48 * H]);
    expect(c.referenceMs).toBeNull();
    expect(c.member).toEqual({ dimension: 'ens', size: 2 });
    const layout = layoutVariable(ds, c, 'tas');
    expect([layout.timeAxis, layout.memberAxis, layout.latAxis, layout.lonAxis]).toEqual([0, 1, 2, 3]);
    expect(timeCellMethod(layout.info, c.time)).toBe('maximum');
  });

  it('reads forecast_reference_time + forecast_period (step) as valid times, member by standard_name realization', async () => {
    const ds = makeFakeForecast({
      lat: [-9, -8],
      lon: [0, 1],
      stepsHours: [6, 12],
      members: 3,
      referenceHours: 72,
      variables: { t2m: { attributes: { units: 'K' }, value: () => 290 } },
    });
    const c = await findCoordinates(ds);
    expect(c.referenceMs).toBe(REF + 72 * H);
    expect(c.time?.dimension).toBe('step');
    expect(Array.from(c.time?.stampsMs ?? [])).toEqual([REF + 78 * H, REF + 84 * H]);
    expect(c.member).toEqual({ dimension: 'number', size: 3 });
  });

  it('a bounds variable with latitude units is not taken for the coordinate; a 2-D latitude is refused as curvilinear', async () => {
    const ds = makeFakeDataset({
      dimensions: { y: 2, x: 1, nv: 2 },
      variables: {
        y_bnds: { dimensions: ['y', 'nv'], attributes: { units: 'degrees_north' }, data: [-11, -9, -9, -7] },
        lon: { dimensions: ['x'], attributes: { units: 'degrees_east' }, data: [0] },
        y: { dimensions: ['y'], attributes: { units: 'degrees_north', bounds: 'y_bnds' }, data: [-10, -8] },
      },
    });
    expect((await findCoordinates(ds)).grid.latName).toBe('y');
    const curvi = makeFakeDataset({
      path: 'curvi.nc',
      dimensions: { j: 1, i: 2 },
      variables: {
        nav_lat: { dimensions: ['j', 'i'], attributes: { standard_name: 'latitude' }, data: [1, 2] },
        nav_lon: { dimensions: ['j', 'i'], attributes: { standard_name: 'longitude' }, data: [1, 2] },
      },
    });
    await expect(findCoordinates(curvi)).rejects.toThrow(
      /curvi\.nc: latitude variable 'nav_lat' has 2 dimensions \(curvilinear grid\) — regrid/,
    );
  });

  it('no latitude coordinate → InputError naming the file and what to add', async () => {
    const ds = makeFakeDataset({ path: 'bad.nc', dimensions: { a: 1 }, variables: { v: { dimensions: ['a'], data: [1] } } });
    await expect(findCoordinates(ds)).rejects.toThrow(/bad\.nc: no latitude coordinate .* — add CF attributes/);
  });

  it('a larger extra dimension (pressure levels) → InputError saying how to select one', async () => {
    const ds = makeFakeDataset({
      path: 'pl.nc',
      dimensions: { lat: 1, lon: 1, plev: 2 },
      variables: {
        lat: { dimensions: ['lat'], attributes: { standard_name: 'latitude' }, data: [0] },
        lon: { dimensions: ['lon'], attributes: { standard_name: 'longitude' }, data: [0] },
        ta: { dimensions: ['plev', 'lat', 'lon'], data: [1, 2] },
      },
    });
    const c = await findCoordinates(ds);
    expect(() => layoutVariable(ds, c, 'ta')).toThrow(InputError);
    expect(() => layoutVariable(ds, c, 'ta')).toThrow(/extra dimension 'plev' of size 2 — select one plev/);
    expect(() => layoutVariable(ds, c, 'nope')).toThrow(/pl\.nc: no variable 'nope' — map the quantity to one of: ta/);
  });
});

describe('parseCellMethods (CF 1.11 §7.3 syntax, §7.3.2 interval)', () => {
  it('splits name lists and methods, ignoring comments in parentheses', () => {
    expect(parseCellMethods('area: mean time: maximum (interval: 6 hours) lat: lon: mean')).toEqual([
      { names: ['area'], method: 'mean', interval: null },
      { names: ['time'], method: 'maximum', interval: '6 hours' },
      { names: ['lat', 'lon'], method: 'mean', interval: null },
    ]);
    expect(parseCellMethods('time: maximum within days time: mean over days')[0]).toEqual({
      names: ['time'],
      method: 'maximum',
      interval: null,
    });
    expect(parseCellMethods('time: sum (interval: 1 day comment: from hourly data)')[0].interval).toBe('1 day');
  });
});
