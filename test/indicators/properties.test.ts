/** Property tests of the formulas (shape of the published curves, CHECKS.md §2, §6, §8, §9, §10). */
import { describe, expect, it } from 'vitest';
import { excessHeatFactorNairnFawcett2015 } from '../../src/indicators/excess-heat-factor-nairn-fawcett-2015.ts';
import {
  HEAT_INDEX_TABLE_MAX_F,
  heatIndexBeyondTableC,
  heatIndexBeyondTableF,
  heatIndexRegressionRothfusz1990F,
  heatIndexRothfusz1990C,
  heatIndexRothfusz1990F,
} from '../../src/indicators/heat-index-rothfusz-1990.ts';
import { relativeR0Mordecai2013 } from '../../src/indicators/relative-r0-mordecai-2013.ts';
import { DETINOVA_1962 } from '../../src/indicators/sporogony-detinova-1962.ts';
import {
  craigMonthlySuitability1999,
  craigRainfallMembership1999,
  craigTemperatureMembership1999,
} from '../../src/indicators/suitability-craig-1999.ts';
import { dailySurvivalMartens1997, survivalThroughSporogony } from '../../src/indicators/survival-martens-1997.ts';
import { computeIndicator, dayOfYearPercentileThreshold } from '../../src/indicators/compute.ts';
import { dayList, indicator, inputsOf, regionSeries, rng } from './fixtures.ts';

describe('Heat Index (WPC algorithm)', () => {
  it('rises with humidity at fixed temperature above 80 °F (Steadman 1979 sultriness increases with vapour pressure); flat at the table top', () => {
    for (let t = 82; t <= 110; t += 2) {
      let prev = -Infinity;
      for (let rh = 15; rh <= 100; rh += 1) {
        const hi = heatIndexRothfusz1990F(t, rh);
        if (heatIndexBeyondTableF(t, rh)) expect(hi, `T=${t} RH=${rh}`).toBe(HEAT_INDEX_TABLE_MAX_F);
        else expect(hi, `T=${t} RH=${rh}`).toBeGreaterThan(prev);
        prev = hi;
      }
    }
  });
  it('is flagged (NaN), not extrapolated, below 40 °F or outside 0..100 %', () => {
    expect(heatIndexRothfusz1990F(35, 50)).toBeNaN();
    expect(heatIndexRothfusz1990F(90, 101)).toBeNaN();
  });
  it('beyond the published table (NWS chart of Steadman 1979: T > 110 °F or HI > 137 °F, from memory) it is capped, never extrapolated', () => {
    // The raw Rothfusz regression gives about 380 °F at 120 °F and 100 % (issue finding 8)
    expect(heatIndexRegressionRothfusz1990F(120, 100)).toBeGreaterThan(370);
    expect(heatIndexRothfusz1990F(120, 100)).toBe(137);
    expect(heatIndexBeyondTableF(120, 100)).toBe(true);
    expect(heatIndexBeyondTableF(125, 5)).toBe(true); // hotter than the chart's last column, even if dry
    expect(heatIndexRothfusz1990F(125, 5)).toBeLessThan(137);
    expect(heatIndexBeyondTableF(110, 40)).toBe(false); // chart cell 136 (checks.json hi-nws-chart-10)
    expect(heatIndexBeyondTableF(90, 100)).toBe(false); // chart cell 132 (hi-nws-chart-13)
    expect(heatIndexBeyondTableC(45, 20)).toBe(true);
    expect(heatIndexRothfusz1990C(50, 90)).toBeCloseTo((137 - 32) / 1.8, 12);
  });
});

describe('Martens (1997) daily survival', () => {
  it('peaks near 21.83 °C (p = 0.9039, CHECKS.md §8) and falls on both sides', () => {
    let bestT = NaN;
    let best = -1;
    for (let t = 4; t < 40; t += 0.01) {
      const p = dailySurvivalMartens1997(t);
      if (p > best) [best, bestT] = [p, t];
    }
    expect(Math.abs(bestT - 21.83)).toBeLessThan(0.02);
    expect(Math.abs(best - 0.9039)).toBeLessThan(1e-4);
    for (let t = 22; t < 39.5; t += 0.5) expect(dailySurvivalMartens1997(t + 0.5)).toBeLessThan(dailySurvivalMartens1997(t));
    for (let t = 21.5; t > 4; t -= 0.5) expect(dailySurvivalMartens1997(t - 0.5)).toBeLessThan(dailySurvivalMartens1997(t));
  });
  it('is 0 outside the published bounds 11/3..40 °C', () => {
    for (const t of [-5, 0, 3.6, 11 / 3, 40, 41, 50]) expect(dailySurvivalMartens1997(t)).toBe(0);
  });
});

describe('suitability is 0 outside the published bounds', () => {
  it('p^n is 0 at or below the Detinova (1962) minimum and at or above 40 °C', () => {
    for (const s of ['falciparum', 'vivax'] as const) {
      const k = DETINOVA_1962[s];
      for (const t of [k.tMinC - 5, k.tMinC, 40, 45]) expect(survivalThroughSporogony(t, k)).toBe(0);
      expect(survivalThroughSporogony(k.tMinC + 1, k)).toBeGreaterThan(0);
    }
  });
  it('Craig (1999) membership is 0 at ≤ 18 °C, ≥ 40 °C and 0 mm; 1 on 22..32 °C and ≥ 80 mm (breakpoints from memory)', () => {
    for (const t of [5, 17.9, 18, 40, 42]) expect(craigTemperatureMembership1999(t)).toBe(0);
    for (const t of [22, 27, 32]) expect(craigTemperatureMembership1999(t)).toBe(1);
    expect(craigRainfallMembership1999(0)).toBe(0);
    expect(craigRainfallMembership1999(150)).toBe(1);
    expect(craigMonthlySuitability1999(25, 0)).toBe(0);
  });
  it('Mordecai (2013) relative R0 is 0 below ≈15.76 °C and above ≈33.71 °C, 1 at the optimum', () => {
    for (const t of [10, 15.7, 33.75, 38]) expect(relativeR0Mordecai2013(t)).toBe(0);
    expect(relativeR0Mordecai2013(16)).toBeGreaterThan(0);
    expect(relativeR0Mordecai2013(25.565)).toBeCloseTo(1, 6);
  });
});

describe('Excess Heat Factor (Nairn & Fawcett 2015)', () => {
  it('is never positive when the 3-day mean is below T95, whatever the acclimatisation term', () => {
    const r = rng(7);
    for (let k = 0; k < 2000; k++) {
      const t95 = 20 + 10 * r();
      const t3 = t95 - 8 * r() - 1e-9;
      const t30 = t95 - 15 + 25 * r();
      expect(excessHeatFactorNairnFawcett2015(t3, t95, t30)).toBeLessThanOrEqual(0);
    }
  });
  it('is positive exactly when T3 > T95', () => {
    expect(excessHeatFactorNairnFawcett2015(25.1, 25, 30)).toBeGreaterThan(0);
    expect(excessHeatFactorNairnFawcett2015(25, 25, 20)).toBe(0);
  });
});

describe('acclimatisation: the same heat weighs more early in the warm season (day-of-year thresholds)', () => {
  it('a 34 °C spell in early November gives more heat load than the same spell in late January, with thresholds from a climatology that warms through the season (common practice, no source)', () => {
    // Invented climatology, 10 years: Tmax rises from about 29 °C (1 Nov) to about 33 °C (31 Jan).
    const byDate = new Map<string, number>();
    for (let y = 2010; y < 2020; y++) {
      dayList(`${y}-11-01`, 92).forEach((d, i) => byDate.set(d, 29 + (4 * i) / 91 + ((i * 7 + y) % 5) * 0.2));
    }
    const threshold = dayOfYearPercentileThreshold(byDate, 90, 15);
    expect(threshold('2026-11-05')).toBeLessThan(threshold('2027-01-25') - 2);
    const spell = (first: string) => {
      const days = dayList(first, 3);
      const tmax = regionSeries('tmax', days, 1, Float64Array.from([34, 34, 34]));
      return computeIndicator(indicator('heat-load', {}, 3), inputsOf(tmax), { climatology: { dayOfYearThresholdC: threshold } }).data[2];
    };
    const early = spell('2026-11-04');
    const late = spell('2027-01-24');
    expect(early).toBeGreaterThan(late + 5);
  });
});
