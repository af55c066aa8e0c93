/**
 * Trend-aware climate (src/calibrate/trend-climate.ts) against the independent numpy script
 * test/calibrate/reference_trend.py (numpy.linalg.lstsq, numpy.percentile method='linear' and 'weibull'), on an
 * invented warming hindcast (Veloria sample world): 0.4 °C per decade, a drift with lead, N(0, 1) noise and a few
 * missing members. Then what it must do in use: the threshold and normal-year rate of the forecast sit on the issue
 * year, leave-one-year-out never lets the held-out year set its own trend, and the default is on for temperature
 * kinds only.
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { LeadClimate } from '../../src/calibrate/climate.ts';
import { climateSlope } from '../../src/calibrate/trend-climate.ts';
import { climatePercentileThreshold, leaveOneYearOutThresholds } from '../../src/calibrate/thresholds.ts';
import { leadProbabilities } from '../../src/calibrate/probability.ts';
import { defaultTrendClimate } from '../../src/indicators/registry.ts';
import { mulberry32, normal } from '../support/rng.ts';
import { climate, leadsOf, YEARS_2006_2025 } from './climate-fixture.ts';

const script = fileURLToPath(new URL('./reference_trend.py', import.meta.url));
const MEMBERS = 10;
const LEADS = 3;
const ISSUE_YEAR = 2026;

function warming(seed: number): LeadClimate {
  const gauss = normal(mulberry32(seed));
  const c = climate(YEARS_2006_2025, MEMBERS, leadsOf('weeks', LEADS), (y, _m, l) => 30 + 0.04 * y + 0.3 * l + gauss());
  const values = Float64Array.from(c.values);
  [5, 77, 301, 598].forEach((i) => (values[i] = Number.NaN)); // two members each at leads 2 and 3
  return { ...c, values, recentreOn: ISSUE_YEAR };
}

function numpyReference(c: LeadClimate, q: number): { slope: number; threshold: number[]; loyo: number[][] } {
  const values = c.years.map((_, y) =>
    Array.from({ length: c.members }, (_, m) =>
      Array.from(c.values.subarray((y * c.members + m) * LEADS, (y * c.members + m + 1) * LEADS), (v) => (Number.isNaN(v) ? null : v)),
    ),
  );
  return JSON.parse(
    execFileSync('/usr/bin/python3', [script], {
      input: JSON.stringify({ years: c.years, values, target: ISSUE_YEAR, q }),
      encoding: 'utf8',
    }),
  );
}

describe('trend-aware climate vs numpy reference_trend.py (lstsq, percentile)', () => {
  const c = warming(20261203);
  const ref = numpyReference(c, 90);
  it('the common least-squares slope (one level per lead) equals numpy.linalg.lstsq within 1e-9', () => {
    expect(climateSlope(c).slope).toBeCloseTo(ref.slope, 9);
    // The invented trend is 0.04 °C a year; its standard error with N(0, 1) noise over 20 years × 10 members × 3
    // leads is 1/√(30 · 665) = 0.0071 (least-squares slope variance σ²/Σ(x − x̄)²), so ±0.025 is 3.5 standard errors.
    expect(Math.abs(climateSlope(c).slope - 0.04)).toBeLessThan(0.025);
  });
  it('the 90th percentile of the climate re-centred on the issue year equals numpy (type 7) within 1e-9', () => {
    c.leads.forEach((lead, l) => {
      const t = climatePercentileThreshold(c, l, 90, 'hindcasts', lead);
      expect(t.value).toBeCloseTo(ref.threshold[l], 9);
      expect(t.origin).toBe(
        `90th percentile of hindcasts 2006–2025 (${l === 0 ? 200 : 198} values, detrended and re-centred on 2026), lead week ${l + 1}`,
      );
    });
  });
  it('leave-one-year-out: each year fitted without itself and re-centred on itself, as numpy (Weibull) within 1e-9', () => {
    c.leads.forEach((_, l) => {
      const mine = leaveOneYearOutThresholds(c, l, 90);
      ref.loyo[l].forEach((v, y) => expect(mine[y]).toBeCloseTo(v, 9));
    });
  });
  it('the held-out year never sets its own trend: changing only 2025 leaves its own threshold unchanged', () => {
    const last = c.years.length - 1;
    const values = Float64Array.from(c.values);
    for (let i = last * MEMBERS * LEADS; i < values.length; i++) values[i] += 5;
    const changed = { ...c, values };
    expect(leaveOneYearOutThresholds(changed, 0, 90)[last]).toBe(leaveOneYearOutThresholds(c, 0, 90)[last]);
    expect(leaveOneYearOutThresholds(changed, 0, 90)[0]).not.toBe(leaveOneYearOutThresholds(c, 0, 90)[0]);
  });
});

describe('trend-aware climate in use', () => {
  // No noise: value = 30 + 0.05 (year − 2006) + m/100, so the issue-year climate is 31.00..31.09 exactly.
  const exact = climate(YEARS_2006_2025, MEMBERS, leadsOf('weeks', 1), (y, m) => 30 + 0.05 * y + m / 100);
  const forecast = {
    leads: leadsOf('weeks', 1),
    members: MEMBERS,
    values: Float64Array.from({ length: MEMBERS }, (_, m) => 31.0405 + m / 1000),
  };
  const request = (hindcast: LeadClimate) => ({
    source: 'subseasonal',
    region: 'marrow-highlands',
    indicator: 'tmax-week',
    units: 'degC',
    forecast,
    hindcast,
    observed: null,
    threshold: { kind: 'percentile' as const, percentile: 50 },
    calibration: { minMembers: 10, minHindcastYears: 10 },
  });
  it('the median threshold sits on the issue year (31.045 °C), not the middle of 2006–2025 (30.52 °C); run.json gets 0.5 °C/decade', () => {
    const [trend] = leadProbabilities(request({ ...exact, recentreOn: ISSUE_YEAR }));
    expect(trend.threshold.value).toBeCloseTo(31.045, 9); // median of 31.00..31.09 (each value 20 times)
    expect(trend.probability).toBe(0.5); // members 31.0405..31.0495: five above 31.045
    expect(trend.climateTrend).toEqual({
      onYear: 2026,
      firstYear: 2006,
      lastYear: 2025,
      hindcastPerDecade: expect.closeTo(0.5, 9),
      observedPerDecade: null,
      units: 'degC',
    });
    const [raw] = leadProbabilities(request(exact));
    expect(raw.threshold.value).toBeCloseTo(30.52, 9); // the raw pooled median: 30 + 0.05 · 9.5 + 0.045
    expect(raw.probability).toBe(1); // every member of 2026 is "above normal" in the raw climate
    expect(raw.climateTrend).toBeUndefined();
  });
  it('on by default for temperature kinds, off for kinds that need rainfall (malaria suitability)', () => {
    expect(defaultTrendClimate('tmax-mean')).toBe(true);
    expect(defaultTrendClimate('heat-index')).toBe(true);
    expect(defaultTrendClimate('excess-heat-factor')).toBe(true);
    expect(defaultTrendClimate('malaria-suitability')).toBe(false);
  });
});
