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
import type { LeadClimate } from '../../src/calibrate/lead-climate.ts';
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

interface Reference {
  slope: number;
  threshold: number[];
  loyo: number[][];
  stderr: number;
  t90: number;
  t90loyo: number;
  loyoStderr: number[];
  loyoSlope: number[];
}

function numpyReference(c: LeadClimate, q: number): Reference {
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

describe('trend-aware climate vs numpy/scipy reference_trend.py (lstsq, percentile, linregress, t.ppf)', () => {
  const c = warming(20261203);
  const ref = numpyReference(c, 90);
  it('the common least-squares slope (one level per lead) equals numpy.linalg.lstsq within 1e-9', () => {
    expect(climateSlope(c).slope).toBeCloseTo(ref.slope, 9);
    // The invented trend is 0.04 °C a year; its standard error with N(0, 1) noise over 20 years × 10 members × 3
    // leads is 1/√(30 · 665) = 0.0071 (least-squares slope variance σ²/Σ(x − x̄)²), so ±0.025 is 3.5 standard errors.
    expect(Math.abs(climateSlope(c).slope - 0.04)).toBeLessThan(0.025);
  });
  it("the slope's standard error (year means, n − 2) equals scipy.stats.linregress and t(0.95, 18) scipy.stats.t.ppf, 1e-9", () => {
    const fit = climateSlope(c);
    expect(fit.standardError).toBeCloseTo(ref.stderr, 9);
    expect(fit.criticalT).toBeCloseTo(ref.t90, 9);
    expect(fit.applied).toBe(true); // 0.4 °C per decade against N(0, 1) noise: about 20 standard errors
    expect(fit.slope).toBe(fit.fitted);
  });
  it('leave-one-year-out runs the same test on each 19-year fit: slope, standard error, t(0.95, 17) as numpy/scipy', () => {
    c.years.forEach((year, y) => {
      const fit = climateSlope(c, year);
      expect(fit.fitted).toBeCloseTo(ref.loyoSlope[y], 9);
      expect(fit.standardError).toBeCloseTo(ref.loyoStderr[y], 9);
      expect(fit.criticalT).toBeCloseTo(ref.t90loyo, 9);
      expect(fit.years).toBe(19);
    });
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
      // No noise: the year means lie on the line, standard error 0; t(0.95, 18) = 1.7341 (t tables, e.g. scipy).
      hindcast: {
        perDecade: expect.closeTo(0.5, 9),
        standardErrorPerDecade: expect.closeTo(0, 9),
        criticalT: expect.closeTo(1.7341, 4),
        applied: true,
      },
      observed: null,
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

describe('a trend is applied only when the data tell it from zero (two-sided 90 %, common practice, no source)', () => {
  /** 20 years × 10 members × 3 leads: `perDecade` trend, a weather shared by the year's members and leads (sd
   * `yearSd`) and the member's own noise (sd `valueSd`). */
  function invented(seed: number, perDecade: number, yearSd: number, valueSd: number): LeadClimate {
    const gauss = normal(mulberry32(seed));
    const weather = YEARS_2006_2025.map(() => yearSd * gauss());
    const c = climate(
      YEARS_2006_2025,
      MEMBERS,
      leadsOf('weeks', LEADS),
      (y, _m, l) => 30 + (perDecade / 10) * y + weather[y] + 0.2 * l + valueSd * gauss(),
    );
    return { ...c, recentreOn: ISSUE_YEAR };
  }
  const raw = (c: LeadClimate): LeadClimate => ({ ...c, recentreOn: undefined });

  it('+0.3 K per decade with small noise: applied, the threshold re-centred on 2026 (fit checked against scipy)', () => {
    const c = invented(7, 0.3, 0.2, 0.3);
    const fit = climateSlope(c);
    const ref = numpyReference(c, 90);
    expect(fit.standardError).toBeCloseTo(ref.stderr, 9);
    expect(fit.applied).toBe(true);
    expect(Math.abs(fit.fitted) / fit.standardError).toBeGreaterThan(ref.t90);
    expect(climatePercentileThreshold(c, 0, 90, 'hindcasts', c.leads[0]).value).toBeCloseTo(ref.threshold[0], 9);
  });

  it('pure noise: not applied, slope 0, the threshold that of the climate as it is; the note data say so', () => {
    // This seed fits −0.14 K per decade, 1.06 standard errors (t(0.95, 18) = 1.73): like the sample's noise slopes.
    const c = invented(13, 0, 0.5, 1);
    const fit = climateSlope(c);
    expect(fit.standardError).toBeCloseTo(numpyReference(c, 90).stderr, 9);
    expect(fit.applied).toBe(false);
    expect(fit.slope).toBe(0);
    expect(fit.fitted).not.toBe(0); // the noise does fit a slope; it is not used
    expect(climatePercentileThreshold(c, 0, 90, 'hindcasts', c.leads[0]).value).toBe(
      climatePercentileThreshold(raw(c), 0, 90, 'hindcasts', c.leads[0]).value,
    );
    expect(leaveOneYearOutThresholds(c, 1, 90)).toEqual(leaveOneYearOutThresholds(raw(c), 1, 90));
  });

  it('two starts of each year pooled (a window of starts): the test still counts 20 years, not 40 entries', () => {
    const one = invented(13, 0, 0.5, 1);
    const perYear = one.members * LEADS;
    const twice: LeadClimate = {
      ...one,
      years: one.years.flatMap((y) => [y, y]),
      values: Float64Array.from(
        one.years.flatMap((_, y) => [0, 1].flatMap(() => Array.from(one.values.subarray(y * perYear, (y + 1) * perYear)))),
      ),
    };
    const [a, b] = [climateSlope(one), climateSlope(twice)];
    expect(b.years).toBe(20);
    expect(b.criticalT).toBe(a.criticalT);
    expect(b.fitted).toBeCloseTo(a.fitted, 12);
    expect(b.standardError).toBeCloseTo(a.standardError, 12);
    expect(b.applied).toBe(false);
  });

  it('over 400 pure-noise climates the trend is applied in about 10 % (binomial 400 × 0.1: 40 ± 6, 3 sd)', () => {
    const applied = Array.from({ length: 400 }, (_, i) => climateSlope(invented(1000 + i, 0, 0.5, 1)).applied).filter(Boolean).length;
    expect(applied).toBeGreaterThanOrEqual(22);
    expect(applied).toBeLessThanOrEqual(58);
  });
});
