/** Unit conversions at the input boundary; check values from test/reference/checks.json (row ids named). */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { UnitError } from '../../src/core/errors.ts';
import {
  convertInPlace,
  kelvinToCelsius,
  kelvinToFahrenheit,
  normaliseUnits,
  planUnits,
  precipMmPerDayFromAccumulationM,
  precipMmPerDayFromFluxKgM2S,
  precipMmPerDayFromRateMPerS,
  precipMmPerMonthFromMeanRate,
} from '../../src/read/units.ts';

interface CheckRow {
  id: string;
  inputs: Record<string, number>;
  expected: number;
  tolerance: number;
}
const checks: CheckRow[] = JSON.parse(readFileSync(join(import.meta.dirname, '../reference/checks.json'), 'utf8'));
const row = (id: string): CheckRow => {
  const r = checks.find((c) => c.id === id);
  if (!r) throw new Error(`checks.json has no row ${id}`);
  return r;
};

describe('check values (test/reference/checks.json)', () => {
  const cases: [string, (i: Record<string, number>) => number][] = [
    ['conv-k2c-1', (i) => kelvinToCelsius(i.t_k)],
    ['conv-k2c-2', (i) => kelvinToCelsius(i.t_k)],
    ['conv-k2c-3', (i) => kelvinToCelsius(i.t_k)],
    ['conv-k2f-1', (i) => kelvinToFahrenheit(i.t_k)],
    ['conv-pr-1', (i) => precipMmPerDayFromAccumulationM(i.acc_start_m, i.acc_end_m, i.hours)],
    ['conv-pr-2', (i) => precipMmPerDayFromAccumulationM(i.acc_start_m, i.acc_end_m, i.hours)],
    ['conv-pr-3', (i) => precipMmPerDayFromAccumulationM(i.acc_start_m, i.acc_end_m, i.hours)],
    ['conv-pr-4', (i) => precipMmPerDayFromRateMPerS(i.rate_m_s)],
    ['conv-pr-5', (i) => precipMmPerDayFromFluxKgM2S(i.flux_kg_m2_s)],
    ['conv-pr-6', (i) => precipMmPerMonthFromMeanRate(i.mm_per_day, i.days_in_month)],
  ];
  for (const [id, f] of cases) {
    it(id, () => {
      const r = row(id);
      expect(Math.abs(f(r.inputs) - r.expected)).toBeLessThanOrEqual(r.tolerance);
    });
  }

  it('conv-k2c-2 and conv-pr-4/5 through the array conversion plans (K, m s-1, kg m-2 s-1)', () => {
    const t = Float64Array.of(row('conv-k2c-2').inputs.t_k, NaN);
    convertInPlace(t, planUnits('tmax', 'K', 'f.nc', 't2m'));
    expect(Math.abs(t[0] - row('conv-k2c-2').expected)).toBeLessThanOrEqual(1e-6);
    expect(t[1]).toBeNaN();
    const rate = Float64Array.of(row('conv-pr-4').inputs.rate_m_s);
    convertInPlace(rate, planUnits('precip', 'm s-1', 'f.nc', 'mtpr'));
    expect(Math.abs(rate[0] - row('conv-pr-4').expected)).toBeLessThanOrEqual(1e-6);
    const flux = Float64Array.of(row('conv-pr-5').inputs.flux_kg_m2_s);
    convertInPlace(flux, planUnits('precip', 'kg m-2 s-1', 'f.nc', 'pr'));
    expect(Math.abs(flux[0] - row('conv-pr-5').expected)).toBeLessThanOrEqual(1e-6);
  });
});

describe('unit strings (UDUNITS-2 / CF spellings)', () => {
  it.each([
    ['kg m**-2 s**-1', 'kgm-2s-1'],
    ['kg/m2/s', 'kgm-2s-1'],
    ['kg m-2', 'kgm-2'],
    ['m/s', 'ms-1'],
    ['m s**-1', 'ms-1'],
    ['km/h', 'kmh-1'],
    ['degrees_Celsius', 'degreescelsius'],
    ['deg_C', 'degc'],
    ['mm/day', 'mmday-1'],
  ])('%s → %s', (raw, key) => expect(normaliseUnits(raw)).toBe(key));

  it.each([
    ['tmax', 'degF', 95, 35],
    ['tmin', 'Celsius', 20, 20],
    ['dewpoint', 'degC', 12, 12],
    ['rh', '1', 0.55, 55],
    ['rh', '%', 55, 55],
    ['wind', 'km/h', 36, 10],
    ['precip', 'kg m-2', 3, 3],
    ['precip', 'm', 0.0125, 12.5],
  ] as const)('%s in %s: %f → %f (definitions: (F-32)/1.8, fraction ×100, km/h ÷3.6, m ×1000)', (q, units, raw, want) => {
    const v = Float64Array.of(raw);
    convertInPlace(v, planUnits(q, units, 'f.nc', 'v'));
    expect(v[0]).toBeCloseTo(want, 9);
  });

  it('accumulations, amounts, rates and states are told apart (drives de-accumulation and the daily sum vs mean)', () => {
    expect(planUnits('precip', 'm', 'f.nc', 'tp').kind).toBe('accumulation');
    expect(planUnits('precip', 'kg m-2', 'f.nc', 'tp').kind).toBe('amount');
    expect(planUnits('precip', 'kg m-2 s-1', 'f.nc', 'pr').kind).toBe('rate');
    expect(planUnits('tmax', 'K', 'f.nc', 'mx2t6').kind).toBe('state');
  });

  it('missing units → UnitError naming file, variable and what to do', () => {
    expect(() => planUnits('tmax', undefined, 'fc_20261123.nc', 'mx2t6')).toThrow(UnitError);
    expect(() => planUnits('tmax', ' ', 'fc_20261123.nc', 'mx2t6')).toThrow(
      /fc_20261123\.nc: variable 'mx2t6' \(tmax\) has no units attribute — set it to one of K, degC or degF/,
    );
  });

  it('unknown or incompatible units → UnitError naming file and variable', () => {
    expect(() => planUnits('precip', 'furlongs', 'fc.nc', 'tp')).toThrow(
      /fc\.nc: variable 'tp' \(precip\) has units 'furlongs' that cannot be converted to mm\/day — expected one of m, kg m-2/,
    );
    expect(() => planUnits('tmax', 'm s-1', 'fc.nc', 'u10')).toThrow(UnitError);
  });
});
