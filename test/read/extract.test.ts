/**
 * The read stage end to end on in-memory files (fake-forecast.ts) and on the ncgen fixtures. Expected values
 * are worked by hand from the stated rules unless a CDO output file or checks.json row is named.
 */
import { regionClock } from '../../src/core/local-clock.ts';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { RegionConfig, RegionShape } from '../../src/config/types.ts';
import { InputError, UnitError } from '../../src/core/errors.ts';
import { findCoordinates, layoutVariable } from '../../src/read/coordinates.ts';
import { extractBoxFromDataset, extractFromDataset, extractRegionSeries } from '../../src/read/extract.ts';
import { planTime } from '../../src/read/extract-plan.ts';
import { reduceVariable } from '../../src/read/extract-reduce.ts';
import { planBand } from '../../src/read/regions-band.ts';
import { selectRegionCells } from '../../src/read/regions.ts';
import { planUnits } from '../../src/read/units.ts';
import { makeFakeDataset } from './fake-dataset.ts';
import { axis, makeFakeForecast, type ValueFn } from './fake-forecast.ts';

const region = (id: string, shape: RegionShape, utcOffsetHours = 0): RegionConfig => ({
  id,
  name: id,
  shape,
  utcOffsetHours,
  teams: [],
  cellRule: 'centre',
});
const MARROW = region('marrow-highlands', { kind: 'box', south: -9, north: -6.5, west: -1.5, east: 1.5 }, 1);
const KESSAN = region('kessan-lowlands', { kind: 'box', south: -12, north: -9, west: -3.5, east: -0.5 }, 1);
const OUTSIDE = region('far-away', { kind: 'box', south: 40, north: 45, west: 10, east: 12 });

/** 1° grid 0..359 × -14..-4, 6-hourly maxima stamped at the end of their 6 h (00Z reference), 2 members. */
function sixHourlyMax(value: ValueFn, attributes: Record<string, string> = { units: 'K', cell_methods: 'time: maximum' }, more = {}) {
  return makeFakeForecast({
    lat: axis(-14, 1, 11),
    lon: axis(0, 1, 360),
    stepsHours: axis(6, 6, 12),
    members: 2,
    variables: { mx2t6: { attributes, value }, ...more },
  });
}

describe('extractFromDataset', () => {
  it('daily maximum by local day (UTC+1), K → degC, members in file order, one band read per member', async () => {
    // value = 290 + member + step index, so the max over a day is its last 6-h step: steps 0-3 → day 1, 4-7 → day 2.
    const ds = sixHourlyMax((m, t) => 290 + m + t);
    const { series, problems } = await extractFromDataset(ds, {
      quantities: { tmax: 'mx2t6' },
      regions: [MARROW, KESSAN],
      referenceTime: '2026-11-23',
    });
    expect(problems).toEqual([]);
    const marrow = series.find((s) => s.region === 'marrow-highlands');
    expect(marrow?.days).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
    expect(marrow?.units).toBe('degC');
    expect(marrow?.members).toBe(2);
    expect(marrow?.cells).toBe(3 * 3);
    expect(Array.from(marrow?.data ?? []).map((v) => +v.toFixed(9))).toEqual([19.85, 23.85, 27.85, 20.85, 24.85, 28.85]);
    expect(marrow?.provenance).toEqual({ file: 'fc_20261123.nc', variable: 'mx2t6', referenceTime: '2026-11-23T00:00:00Z' });
  });

  it('reads only the union band of all regions, one hyperslab per member (whole rows as the band crosses lon 359→0)', async () => {
    const ds = sixHourlyMax(() => 300);
    await extractFromDataset(ds, { quantities: { tmax: 'mx2t6' }, regions: [MARROW, KESSAN] });
    const reads = ds.reads.filter((r) => r.name === 'mx2t6');
    expect(reads).toHaveLength(2);
    // rows -12..-7 (6), 360 columns, 12 steps, 2 members.
    expect(reads.reduce((a, r) => a + r.values, 0)).toBe(2 * 12 * 6 * 360);
  });

  it('regions with different UTC offsets get their own local days from the same read', async () => {
    const ds = sixHourlyMax((_m, t) => 290 + t);
    const east = { ...MARROW, id: 'marrow-utc10', utcOffsetHours: 10 };
    const { series } = await extractFromDataset(ds, { quantities: { tmax: 'mx2t6' }, regions: [MARROW, east] });
    expect(series.map((s) => s.days)).toEqual([
      ['2026-11-23', '2026-11-24', '2026-11-25'],
      ['2026-11-24', '2026-11-25'],
    ]);
    // UTC+10: the day 2026-11-24 holds the 6-h periods ending 18Z … 12Z (+10 h midpoints 25 … 43 h): steps 2..5.
    expect(Array.from(series[1].data.subarray(0, 2)).map((v) => +v.toFixed(9))).toEqual([5 + 16.85, 9 + 16.85]);
    expect(ds.reads.filter((r) => r.name === 'mx2t6')).toHaveLength(2);
  });

  it('area mean skips missing cells and renormalises weights per member and day', async () => {
    // Kessan lowlands: cells lat -12..-9 × lon 357..359 (4×3). Member 0 has every lon 359 cell missing on all steps.
    const ds = sixHourlyMax((m, _t, _lat, lon) => (m === 0 && lon === 359 ? NaN : 273.15 + (lon === 359 ? 30 : 10)));
    const { series } = await extractFromDataset(ds, { quantities: { tmax: 'mx2t6' }, regions: [KESSAN] });
    const d = series[0].data;
    expect(d[0]).toBeCloseTo(10, 9);
    expect(d[3]).toBeCloseTo((2 * 10 + 30) / 3, 9);
  });

  it('accumulated precipitation in m (lwe_thickness_of_precipitation_amount) → mm/day (checks.json conv-pr-1..3)', async () => {
    const acc = [0.0125, 0.03, 0.03];
    const ds = makeFakeForecast({
      lat: axis(-14, 1, 11),
      lon: axis(0, 1, 360),
      stepsHours: [24, 48, 72],
      members: 1,
      variables: { tp: { attributes: { units: 'm', standard_name: 'lwe_thickness_of_precipitation_amount' }, value: (_m, t) => acc[t] } },
    });
    const { series } = await extractFromDataset(ds, { quantities: { precip: 'tp' }, regions: [MARROW] });
    expect(series[0].units).toBe('mm/day');
    expect(series[0].days).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
    expect(Array.from(series[0].data).map((v) => +v.toFixed(9))).toEqual([12.5, 17.5, 0]);
  });

  it('kg m-2 amounts: per step without bounds (summed), accumulated when time_bnds all start at the reference', async () => {
    // Per-step amounts that fall once (3 then 2): unlabelled amounts that never fall would read as a running
    // accumulation (src/read/DECISIONS.md §2 rule 4).
    const file = (bounds: number[] | null, data = [1, 2, 3, 4]) =>
      makeFakeDataset({
        dimensions: { time: 4, lat: 1, lon: 1, nv: 2 },
        variables: {
          time: {
            dimensions: ['time'],
            attributes: { units: 'hours since 2026-11-23', standard_name: 'time', ...(bounds ? { bounds: 'time_bnds' } : {}) },
            data: [6, 12, 18, 24],
          },
          time_bnds: { dimensions: ['time', 'nv'], data: bounds ?? new Array(8).fill(0) },
          lat: { dimensions: ['lat'], attributes: { standard_name: 'latitude' }, data: [-8] },
          lon: { dimensions: ['lon'], attributes: { standard_name: 'longitude' }, data: [0] },
          pr: { dimensions: ['time', 'lat', 'lon'], attributes: { units: 'kg m-2' }, data },
        },
      });
    const perStep = await extractFromDataset(file(null, [1, 3, 2, 4]), {
      quantities: { precip: 'pr' },
      regions: [{ ...MARROW, utcOffsetHours: 0 }],
    });
    expect(Array.from(perStep.series[0].data)).toEqual([10]);
    const accumulated = await extractFromDataset(file([0, 6, 0, 12, 0, 18, 0, 24]), {
      quantities: { precip: 'pr' },
      regions: [{ ...MARROW, utcOffsetHours: 0 }],
    });
    expect(Array.from(accumulated.series[0].data)).toEqual([4]);
    expect(accumulated.series[0].days).toEqual(['2026-11-23']);
  });

  it('a variable with no ensemble dimension counts as one member', async () => {
    const ds = makeFakeDataset({
      dimensions: { time: 2, lat: 2, lon: 3 },
      variables: {
        time: { dimensions: ['time'], attributes: { units: 'days since 2026-11-23', standard_name: 'time' }, data: [0, 1] },
        lat: { dimensions: ['lat'], attributes: { standard_name: 'latitude' }, data: [-8, -7] },
        lon: { dimensions: ['lon'], attributes: { standard_name: 'longitude' }, data: [-1, 0, 1] },
        rh: {
          dimensions: ['time', 'lat', 'lon'],
          attributes: { units: '1' },
          data: [0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.7, 0.7, 0.7, 0.7, 0.7, 0.7],
        },
      },
    });
    const { series } = await extractFromDataset(ds, { quantities: { rh: 'rh' }, regions: [MARROW] });
    expect(series[0].members).toBe(1);
    expect(Array.from(series[0].data).map((v) => +v.toFixed(9))).toEqual([50, 70]);
  });
});

describe('extractBoxFromDataset (forelight extract --json)', () => {
  it('prints canonical units (K → degC), ISO steps or local dates, members in file order, null where a member has no valid cell', async () => {
    const ds = sixHourlyMax((m, t) => (m === 1 && t < 4 ? NaN : 300 + t));
    const box = { south: -9, north: -6.5, west: -1.5, east: 1.5 };
    const steps = await extractBoxFromDataset(ds, { variable: 'mx2t6', box });
    expect(steps.units).toBe('degC');
    expect(steps.cells).toBe(9);
    expect(steps.times.slice(0, 2)).toEqual(['2026-11-23T06:00:00Z', '2026-11-23T12:00:00Z']);
    const round = (rows: (number | null)[][]) => rows.map((r) => r.map((v) => (v === null ? null : +v.toFixed(9))));
    expect(round(steps.members)[1].slice(0, 5)).toEqual([null, null, null, null, 30.85]);
    const daily = await extractBoxFromDataset(ds, { variable: 'mx2t6', box, daily: 'max', utcOffsetHours: 1 });
    expect(daily.times).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
    expect(round(daily.members)).toEqual([
      [29.85, 33.85, 37.85],
      [null, 33.85, 37.85],
    ]);
  });
});

/** 6-hourly accumulated precipitation (m) over 4 days, `members` members, and the request for Marrow's daily sums. */
async function accumulatedRequest(members: number, stepOuter = false) {
  const ds = makeFakeForecast({
    lat: axis(-14, 1, 11),
    lon: axis(0, 1, 360),
    stepsHours: axis(6, 6, 16),
    members,
    stepOuter,
    variables: { tp: { attributes: { units: 'm' }, value: (m, t, lat) => (t + 1) * (t + 2) * 1e-4 * (1 + m) + lat * 1e-6 } },
  });
  const coords = await findCoordinates(ds);
  const layout = layoutVariable(ds, coords, 'tp');
  const unitPlan = planUnits('precip', 'm', ds.path, 'tp');
  const time = planTime(coords, layout, unitPlan);
  const { band, regions } = planBand([selectRegionCells(coords.grid, MARROW, ds.path)], 11, 360);
  return {
    ds,
    coords,
    band,
    req: { layout, band, regions, time, unitPlan, clocks: [regionClock({ utcOffsetHours: 1 })], daily: 'sum' as const },
  };
}

describe('time chunks (memory bound)', () => {
  it('accumulated precipitation read in chunks of one day gives the same daily totals as one chunk', async () => {
    const { ds, coords, band, req } = await accumulatedRequest(2);
    const [one] = await reduceVariable(ds, coords, req);
    const before = ds.reads.length;
    const [chunked] = await reduceVariable(ds, coords, { ...req, maxChunkValues: 4 * band.nLat * band.nLon });
    expect(ds.reads.length - before).toBe(2 * 4);
    expect(chunked.labels).toEqual(one.labels);
    expect(one.labels).toHaveLength(4);
    one.data.forEach((v, i) => expect(chunked.data[i]).toBeCloseTo(v, 9));
  });
});

describe('(step, number, …) layout', () => {
  it('gives the same de-accumulated means, read in time chunks, as the (number, step, …) file', async () => {
    const memberOuter = await accumulatedRequest(5);
    const stepOuter = await accumulatedRequest(5, true);
    const chunked = (r: typeof memberOuter) => ({ ...r.req, maxChunkValues: 4 * r.band.nLat * r.band.gridLon });
    const [expected] = await reduceVariable(memberOuter.ds, memberOuter.coords, chunked(memberOuter));
    const [got] = await reduceVariable(stepOuter.ds, stepOuter.coords, chunked(stepOuter));
    expect(got.labels).toEqual(expected.labels);
    expect(Array.from(got.data)).toEqual(Array.from(expected.data));
  });
});

describe('read-ahead (threaded readers)', () => {
  it('reads kept in flight and finishing out of order give the same de-accumulated means as one at a time', async () => {
    const setup = await accumulatedRequest(3);
    const { ds, coords, band } = setup;
    const req = { ...setup.req, maxChunkValues: 4 * band.nLat * band.nLon };
    const [sequential] = await reduceVariable(ds, coords, req);
    // A reader like the NetCDF-4 pool: up to 5 reads in flight, each finishing after a different delay.
    let inFlight = 0;
    let most = 0;
    const delays = [9, 1, 6, 0, 4, 8, 2, 7, 3, 5];
    let call = 0;
    const slow = {
      ...ds,
      readAhead: 5,
      readRaw: async (name: string, start: readonly number[], count: readonly number[]) => {
        most = Math.max(most, ++inFlight);
        const values = await ds.readRaw(name, start, count);
        await new Promise((r) => setTimeout(r, delays[call++ % delays.length]));
        inFlight--;
        return values;
      },
    };
    const [ahead] = await reduceVariable(slow, coords, req);
    expect(most).toBe(5);
    expect(ahead.labels).toEqual(sequential.labels);
    expect(Array.from(ahead.data)).toEqual(Array.from(sequential.data));
  });
});

describe('bad input', () => {
  it('variable with no units → UnitError in problems; the other quantity is still computed', async () => {
    const ds = sixHourlyMax(
      () => 300,
      { cell_methods: 'time: maximum' },
      { mn2t6: { attributes: { units: 'K', cell_methods: 'time: minimum' }, value: () => 280 } },
    );
    const { series, problems } = await extractFromDataset(ds, { quantities: { tmax: 'mx2t6', tmin: 'mn2t6' }, regions: [MARROW] });
    expect(series.map((s) => [s.quantity, +s.data[0].toFixed(9)])).toEqual([['tmin', 6.85]]);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toBeInstanceOf(UnitError);
    expect(problems[0].message).toMatch(/fc_20261123\.nc: variable 'mx2t6' \(tmax\) has no units attribute/);
  });

  it('unknown units → UnitError; a missing variable → InputError; both reported, nothing thrown', async () => {
    const ds = sixHourlyMax(() => 300, { units: 'kelvins please', cell_methods: 'time: maximum' });
    const { problems } = await extractFromDataset(ds, { quantities: { tmax: 'mx2t6', tmin: 'mn2t6' }, regions: [MARROW] });
    expect(problems.map((p) => p.code)).toEqual(['unit', 'variable-missing']);
    expect(problems[0].message).toMatch(/units 'kelvins please' that cannot be converted to degC/);
  });

  it('one region outside the grid is reported; the others are still computed', async () => {
    const ds = sixHourlyMax(() => 300);
    const { series, problems } = await extractFromDataset(ds, { quantities: { tmax: 'mx2t6' }, regions: [OUTSIDE, MARROW, KESSAN] });
    expect(series.map((s) => s.region)).toEqual(['marrow-highlands', 'kessan-lowlands']);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toBeInstanceOf(InputError);
    expect(problems[0].message).toMatch(
      /region 'far-away' \(box 40\.\.45, 10\.\.12\) has no grid cell in fc_20261123\.nc \(grid lat -14\.\.-4, lon 0\.\.359\) — check the region shape or the source, or use cell-rule: overlap/,
    );
  });

  it('a region whose cells are all missing → InputError in problems; other regions kept', async () => {
    const ds = sixHourlyMax((_m, _t, lat) => (lat >= -9 ? NaN : 300));
    const { series, problems } = await extractFromDataset(ds, { quantities: { tmax: 'mx2t6' }, regions: [MARROW, KESSAN] });
    expect(series.map((s) => s.region)).toEqual(['kessan-lowlands']);
    expect(problems.map((p) => p.code)).toEqual(['region-all-missing']);
    expect(problems[0].message).toMatch(/every cell of region 'marrow-highlands'/);
  });

  it('wrong forecast date in the file name vs contents → InputError naming both dates', async () => {
    const ds = makeFakeForecast({
      lat: axis(-14, 1, 11),
      lon: axis(0, 1, 360),
      stepsHours: axis(6, 6, 8),
      referenceHours: 72,
      variables: { t2m: { attributes: { units: 'K' }, value: () => 300 } },
    });
    await expect(extractFromDataset(ds, { quantities: { tmean: 't2m' }, regions: [MARROW], referenceTime: '2026-11-23' })).rejects.toThrow(
      /the file holds the forecast of 2026-11-26T00:00:00Z but 2026-11-23T00:00:00Z was requested/,
    );
  });
});

describe('extractRegionSeries on the ncgen fixtures', () => {
  it('tmax by local day equals cdo fldmean -daymax minus 273.15 (test/fixtures/regions/cdo-6h-marrow-daymax.txt)', async () => {
    const file = join(import.meta.dirname, '../fixtures/regions/sixhourly.nc');
    const { series, problems } = await extractRegionSeries(file, {
      quantities: { tmax: 't2m' },
      regions: [{ ...MARROW, utcOffsetHours: 0 }],
      referenceTime: '2026-11-23T00:00Z',
    });
    expect(problems).toEqual([]);
    const cdo = readFileSync(join(import.meta.dirname, '../fixtures/regions/cdo-6h-marrow-daymax.txt'), 'utf8')
      .split('\n')
      .filter((l) => /^\s*\d{4}-/.test(l))
      .map((l) => l.trim().split(/\s+/));
    for (const [date, lev, value] of cdo.slice(0, 6)) {
      const d = series[0].days.indexOf(date);
      expect(Math.abs(series[0].data[Number(lev) * series[0].days.length + d] - (Number(value) - 273.15))).toBeLessThanOrEqual(1e-4);
    }
  });

  it('forecast-centre layout (number, step; forecast_reference_time; tp accumulated in m; mx2t6 stamped at the end of its 6 h), UTC+1 local days, vs numpy (leadtime-expected.json, written by gen-cdl.py)', async () => {
    const dir = join(import.meta.dirname, '../fixtures/regions');
    const expected = JSON.parse(readFileSync(join(dir, 'leadtime-expected.json'), 'utf8'));
    const { series, problems } = await extractRegionSeries(join(dir, 'leadtime.nc'), {
      quantities: { precip: 'tp', tmax: 'mx2t6' },
      regions: [MARROW],
      referenceTime: '2026-11-30',
    });
    expect(problems).toEqual([]);
    const byQ = new Map(series.map((s) => [s.quantity, s]));
    for (const [q, key] of [
      ['precip', 'precip_mm_day'],
      ['tmax', 'tmax_degC'],
    ] as const) {
      const s = byQ.get(q);
      expect(s?.days).toEqual(expected.days);
      expect(s?.provenance.referenceTime).toBe('2026-11-30T00:00:00Z');
      (expected[key] as number[][]).forEach((row, m) =>
        row.forEach((v, d) => expect(Math.abs((s?.data[m * 2 + d] ?? NaN) - v)).toBeLessThanOrEqual(1e-4)),
      );
    }
  });
});
