/** Model-climate thresholds, leave-one-year-out, quantile mapping (numpy-equivalent type-7 percentile, tested in reference-python.test.ts). */
import { describe, expect, it } from 'vitest';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { distinctYears, leadSample, stackYears, startsWithinWindow } from '../../src/calibrate/climate.ts';
import { percentileLinear, percentRankOfSorted, percentileOfSortedWithout, sortValid } from '../../src/core/percentile.ts';
import {
  absoluteThreshold,
  climatePercentileThreshold,
  leaveOneYearOutThresholds,
  ordinal,
  quantileMappedThreshold,
  quantileMappedThresholdObject,
  resolveThresholdSpec,
} from '../../src/calibrate/thresholds.ts';
import type { IndicatorConfig } from '../../src/config/types.ts';
import { climate, leadsOf, YEARS_2006_2025 } from './climate-fixture.ts';
import { mulberry32, normal } from '../support/rng.ts';

const gauss = normal(mulberry32(7));
const weeks = leadsOf('weeks', 3);
const hc = climate(YEARS_2006_2025, 11, weeks, (y, m, l) => 30 + l + gauss());

describe('model-climate percentile thresholds', () => {
  it('q-th percentile over all years × members at the lead, with the origin text', () => {
    const t = climatePercentileThreshold(hc, 1, 90, 'hindcasts', weeks[1]);
    expect(t.origin).toBe('90th percentile of hindcasts 2006–2025 (220 values), lead week 2');
    expect(t.units).toBe('degC');
    const all: number[] = [];
    for (let i = 1; i < hc.values.length; i += 3) all.push(hc.values[i]);
    expect(t.value).toBe(percentileLinear(all, 90));
  });
  it('leave-one-year-out: a year never sets its own threshold', () => {
    const hot = climate(YEARS_2006_2025, 11, weeks, (y) => (y === 4 ? 1000 : y));
    const loo = leaveOneYearOutThresholds(hot, 0, 90);
    expect(loo[4]).toBe(percentileLinear(leadSample(hot, 0, 2010), 90));
    // By hand: without 2010, 19 years x 11 members, h = 208 x 0.9 = 187.2 → year values 0..19 minus 4, rank 17 = 18.
    expect(loo[4]).toBe(18);
    // Without 2011 the hot year (1000) is in the sample: ranks shift and the threshold becomes 19.
    expect(loo[5]).toBe(19);
  });
  it('percentileOfSortedWithout equals the percentile of the reduced copy (random samples with ties)', () => {
    const rand = mulberry32(11);
    for (let trial = 0; trial < 200; trial++) {
      const n = 2 + Math.floor(rand() * 40);
      const xs = Array.from({ length: n }, () => Math.floor(rand() * 8));
      const k = Math.floor(rand() * (n - 1));
      const removed = xs.slice(0, k);
      const q = Math.floor(rand() * 101);
      expect(percentileOfSortedWithout(sortValid(xs), sortValid(removed), q)).toBe(percentileLinear(xs.slice(k), q));
    }
  });
  it('ordinals', () => {
    expect([1, 2, 3, 11, 12, 13, 21, 90, 97.5].map(ordinal)).toEqual([
      '1st',
      '2nd',
      '3rd',
      '11th',
      '12th',
      '13th',
      '21st',
      '90th',
      '97.5th',
    ]);
  });
  it('region override of the threshold spec', () => {
    const ind = {
      threshold: { kind: 'percentile', percentile: 90 },
      regionThresholds: { 'tulva-delta': { kind: 'absolute', value: 35, units: 'degC' } },
    } as unknown as IndicatorConfig;
    expect(resolveThresholdSpec(ind, 'tulva-delta')).toEqual({ kind: 'absolute', value: 35, units: 'degC' });
    expect(resolveThresholdSpec(ind, 'orrin-coast')).toEqual({ kind: 'percentile', percentile: 90 });
  });
});

describe('absolute thresholds and empirical quantile mapping', () => {
  const obs = climate(YEARS_2006_2025, 1, weeks, (y, _m, l) => 28 + l + 0.2 * y);
  it('percent rank is the exact inverse of the type-7 percentile', () => {
    const s = sortValid([3, 1, 2, 2, 5, 8]);
    for (const q of [0, 10, 37, 50, 80, 100]) {
      const x = percentileLinear(s, q);
      expect(percentileLinear(s, percentRankOfSorted(s, x).percent)).toBeCloseTo(x, 12);
    }
    expect(percentRankOfSorted(s, 9)).toEqual({ percent: 100, clipped: true });
  });
  it('identical climates leave the value unchanged; a model 2 degC warmer moves it up by 2 degC', () => {
    expect(quantileMappedThreshold(30.3, obs, obs, 1).value).toBeCloseTo(30.3, 12);
    const warm = climate(YEARS_2006_2025, 1, weeks, (y, _m, l) => 30 + l + 0.2 * y);
    expect(quantileMappedThreshold(30.3, obs, warm, 1).value).toBeCloseTo(32.3, 12);
    const { threshold, clipped } = quantileMappedThresholdObject({ value: 30.3, units: 'degC' }, obs, warm, 1, weeks[1]);
    expect(clipped).toBe(false);
    expect(threshold.origin).toMatch(
      /^absolute 30.3 degC quantile-mapped to 32.3 degC \(percent rank [\d.]+ in observations 2006–2025, 20 values → same percentile of hindcasts 2006–2025, 20 values\), lead week 2$/,
    );
  });
  it('outside the observed range: clipped to the model extreme, no extrapolation', () => {
    const r = quantileMappedThreshold(99, obs, hc, 0);
    expect(r.clipped).toBe(true);
    expect(r.value).toBe(percentileLinear(leadSample(hc, 0), 100));
  });
  it('units must match the indicator', () => {
    expect(() => absoluteThreshold({ value: 95, units: 'degF' }, 'degC', weeks[0], '')).toThrow(/95 degF .* degC/);
  });
});

describe('pooled starts (±windowDays)', () => {
  it('startsWithinWindow is circular over the year end', () => {
    expect(startsWithinWindow('2026-11-26', ['11-19', '11-23', '11-26', '11-30', '12-04'], 7)).toEqual([
      '11-19',
      '11-23',
      '11-26',
      '11-30',
    ]);
    expect(startsWithinWindow('2026-12-30', ['01-02', '01-10'], 5)).toEqual(['01-02']);
  });
  it('leave-one-year-out removes every start of the year; distinct years are counted', () => {
    const pooled = climate([2006, 2006, 2007, 2007, 2008, 2008], 2, weeks, (y) => y);
    expect(distinctYears(pooled)).toBe(3);
    expect(leadSample(pooled, 0, 2007).length).toBe(8);
    expect(Array.from(leaveOneYearOutThresholds(pooled, 0, 0))).toEqual([2, 2, 0, 0, 0, 0]);
  });
});

describe('stackYears', () => {
  it('a year with a different member count is left out with a problem line; others go on', () => {
    const lv = (members: number, nLeads: number) => ({
      leads: leadsOf('weeks', nLeads),
      members,
      values: new Float64Array(members * nLeads).fill(1),
    });
    const r = stackYears('subseasonal hindcasts', 'degC', [
      { year: 2006, leads: lv(11, 3) },
      { year: 2007, leads: lv(10, 3) },
      { year: 2008, leads: lv(11, 2) },
    ]);
    expect(r.climate!.years).toEqual([2006, 2008]);
    expect(r.problems.map(formatDiagnostic)).toEqual([expect.stringMatching(/year 2007 has 10 members, year 2006 has 11/)]);
    expect(r.problems.map((d) => d.code)).toEqual(['hindcast-members']);
    expect(leadSample(r.climate!, 2).length).toBe(11); // 2008 has no lead 3 → NaN, skipped
  });
});
