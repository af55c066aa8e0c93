/** Bad input: NaN members propagate with counts; impossible values are rejected naming region and quantity. */
import { describe, expect, it } from 'vitest';
import { ForelightError, InputError, UnitError } from '../../src/core/errors.ts';
import { computeIndicator } from '../../src/indicators/compute.ts';
import { dayList, indicator, inputsOf, regionSeries } from './fixtures.ts';

const days = dayList('2026-11-26', 6);
const temps = (v: number[]) => Float64Array.from(v);

describe('NaN propagation (counted as missing, never read as zero)', () => {
  it('heat index: a NaN member-day gives NaN there and missing = 1', () => {
    const tmax = temps([33, 34, NaN, 35, 36, 34, 30, 31, 32, 33, 34, 35]);
    const dew = temps([24, 24, 24, 25, 25, 25, 22, 22, 22, 22, 22, 22]);
    const r = computeIndicator(
      indicator('heat-index'),
      inputsOf(regionSeries('tmax', days, 2, tmax), regionSeries('dewpoint', days, 2, dew)),
    );
    expect(r.data[2]).toBeNaN();
    expect(r.missing).toBe(1);
    expect(r.outOfRange).toBe(0);
    expect(r.data[3]).toBeGreaterThan(35);
  });

  it('running mean: a NaN day spoils every window that contains it and nothing else', () => {
    const t = temps([30, 31, NaN, 33, 34, 35]);
    const r = computeIndicator(indicator('tmax-mean', {}, 2), inputsOf(regionSeries('tmax', days, 1, t)));
    expect(Array.from(r.data.subarray(0, 4)).map(Number.isNaN)).toEqual([true, false, true, true]);
    expect(r.data[4]).toBeCloseTo(33.5, 12);
    expect(r.missing).toBe(3);
  });

  it('hot-days-run: unknown (NaN) after a missing day until a day at or below the threshold', () => {
    const t = temps([36, NaN, 36, 30, 36, 36]);
    const r = computeIndicator(indicator('hot-days-run', { dayThresholdC: 35 }), inputsOf(regionSeries('tmax', days, 1, t)));
    expect(Array.from(r.data)).toEqual([1, NaN, NaN, 0, 1, 2]);
    expect(r.missing).toBe(2);
  });

  it("out of a formula's valid range → NaN counted in outOfRange, not missing", () => {
    // 55 °C is possible as an input (< 60) but outside the heat-index range (≤ 120 °F = 48.9 °C).
    const r = computeIndicator(
      indicator('heat-index'),
      inputsOf(
        regionSeries('tmax', days, 1, temps([30, 55, 30, 30, 30, 30])),
        regionSeries('dewpoint', days, 1, temps([20, 20, 20, 20, 20, 20])),
      ),
    );
    expect(r.data[1]).toBeNaN();
    expect(r.outOfRange).toBe(1);
    expect(r.missing).toBe(1);
  });
});

describe('impossible values are rejected with region and quantity', () => {
  it('RH 130 % → InputError naming region, quantity and the file', () => {
    const rh = temps([60, 70, 130, 80, 60, 50]);
    const run = () =>
      computeIndicator(
        indicator('heat-index'),
        inputsOf(
          regionSeries('tmax', days, 1, temps([30, 30, 30, 30, 30, 30]), 'orrin-coast'),
          regionSeries('rh', days, 1, rh, 'orrin-coast'),
        ),
      );
    expect(run).toThrow(InputError);
    expect(run).toThrow(/orrin-coast.*quantity rh.*130/);
    expect(run).toThrow(/forecast-20261123\.nc/);
  });

  it('T −120 °C → InputError naming region and quantity', () => {
    const run = () =>
      computeIndicator(
        indicator('tmax-mean'),
        inputsOf(regionSeries('tmax', days, 1, temps([30, 31, -120, 30, 30, 30]), 'marrow-highlands')),
      );
    expect(run).toThrow(InputError);
    expect(run).toThrow(/marrow-highlands, quantity tmax.*-120/);
  });

  it('Kelvin left in a series → UnitError', () => {
    const s = { ...regionSeries('tmax', days, 1, temps([300, 301, 302, 303, 304, 305])), units: 'K' };
    expect(() => computeIndicator(indicator('tmax-mean'), inputsOf(s))).toThrow(UnitError);
  });

  it('apparent temperature without wind fails naming "wind" (calm is never assumed)', () => {
    const run = () =>
      computeIndicator(
        indicator('apparent-temperature'),
        inputsOf(
          regionSeries('tmax', days, 1, temps([30, 30, 30, 30, 30, 30])),
          regionSeries('dewpoint', days, 1, temps([20, 20, 20, 20, 20, 20])),
        ),
      );
    expect(run).toThrow(ForelightError);
    expect(run).toThrow(/needs quantity "wind"/);
  });

  it('EHF without T95 in the climatology fails saying what to configure', () => {
    const s = regionSeries('tmax', days, 1, temps([30, 30, 30, 30, 30, 30]));
    expect(() => computeIndicator(indicator('excess-heat-factor'), inputsOf(s, { ...s, quantity: 'tmin' }), {})).toThrow(
      /T95.*hindcasts or observations/,
    );
  });
});
