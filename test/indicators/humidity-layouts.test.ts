/**
 * Humidity as portals deliver it, in files written by python3-xarray (test/indicators/humidity/make_humidity.py):
 * 2 m specific humidity with surface pressure (kg kg-1 with Pa, and g kg-1 with hPa), and relative humidity with
 * the daily mean temperature. The dewpoint Forelight derives and the humidex on it must equal numpy's within 1e-4,
 * numpy applying the published formulas itself: e = qp/(ε + (1−ε)q) (WMO-No. 8 Annex 4.B), inverse Magnus form of
 * Alduchov & Eskridge (1996) eq. 21, humidex of Masterton & Richardson (1979).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { RegionConfig } from '../../src/config/types.ts';
import { feelsLikeSeries } from '../../src/indicators/feels-like-series.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import type { Quantity, RegionSeries } from '../../src/types.ts';

const tmp = mkdtempSync(join(tmpdir(), 'forelight-humidity-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
const expected = JSON.parse(
  execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'humidity/make_humidity.py'), tmp], { encoding: 'utf8' }),
) as Record<'tdQp' | 'humidexQp' | 'tdRh' | 'humidexRh', number[][]>;

const REGION: RegionConfig = {
  id: 'kessan',
  name: 'kessan',
  utcOffsetHours: 0,
  teams: [],
  cellRule: 'centre',
  shape: { kind: 'box', south: -12, north: -9, west: -3.5, east: -0.5 },
};

async function read(file: string, quantities: Partial<Record<Quantity, string>>): Promise<Map<Quantity, RegionSeries>> {
  const { series, problems } = await extractRegionSeries(join(tmp, file), { quantities, regions: [REGION] });
  expect(problems).toEqual([]);
  return new Map(series.map((s) => [s.quantity, s]));
}

function expectClose(got: Float64Array, want: number[][]): void {
  expect(got).toHaveLength(want.flat().length);
  want.flat().forEach((v, i) => expect(Math.abs(got[i] - v)).toBeLessThanOrEqual(1e-4));
}

describe('dewpoint derived from the humidity a file holds, vs numpy', () => {
  it.each(['qp.nc', 'qp-g-hpa.nc'])('%s: specific humidity with surface pressure', async (file) => {
    const inputs = await read(file, { tmax: 'tasmax', 'specific-humidity': 'q2m', 'surface-pressure': 'sp' });
    expect(inputs.get('specific-humidity')?.units).toBe('kg/kg');
    expect(inputs.get('surface-pressure')?.units).toBe('hPa');
    expect(inputs.get('tmax')?.days).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
    const humidex = feelsLikeSeries('humidex', inputs, 'humidex-q', 'tmax');
    expectClose(humidex.data, expected.humidexQp);
    // At a given temperature the humidex depends on the dewpoint alone: invert it to check the dewpoint itself,
    // 1/(273.15 + Td) = 1/273.16 − ln(e/6.11)/5417.7530 with e = (H − T)/0.5555 + 10.
    const tmax = inputs.get('tmax')!.data;
    const dewpoint = humidex.data.map((h, i) => 1 / (1 / 273.16 - Math.log(((h - tmax[i]) / 0.5555 + 10) / 6.11) / 5417.753) - 273.15);
    expectClose(dewpoint, expected.tdQp);
  });

  it("heat index from specific humidity equals the heat index of numpy's dewpoint given as a dewpoint series", async () => {
    const inputs = await read('qp.nc', { tmax: 'tasmax', 'specific-humidity': 'q2m', 'surface-pressure': 'sp' });
    const tmax = inputs.get('tmax')!;
    const dewpoint: RegionSeries = { ...tmax, quantity: 'dewpoint', data: Float64Array.from(expected.tdQp.flat()) };
    const fromQ = feelsLikeSeries('heat-index', inputs, 'hi', 'tmax');
    const fromTd = feelsLikeSeries(
      'heat-index',
      new Map([
        ['tmax', tmax],
        ['dewpoint', dewpoint],
      ]),
      'hi',
      'tmax',
    );
    expect(fromQ.data.every(Number.isFinite)).toBe(true);
    expectClose(fromQ.data, [Array.from(fromTd.data)]);
  });

  it('relative humidity with the daily mean temperature', async () => {
    const inputs = await read('rh.nc', { tmax: 'tasmax', tmean: 'tas', rh: 'hurs' });
    const humidex = feelsLikeSeries('humidex', inputs, 'humidex-rh', 'tmax');
    expect(humidex.notes).toEqual([]);
    expectClose(humidex.data, expected.humidexRh);
  });

  it('specific humidity without surface pressure is refused naming both quantities', async () => {
    const inputs = await read('qp.nc', { tmax: 'tasmax', 'specific-humidity': 'q2m' });
    expect(() => feelsLikeSeries('heat-index', inputs, 'hi', 'tmax')).toThrow(/needs quantity "surface-pressure"/);
  });
});
