/** Exceedance probabilities per lead (checks.json ens-exc-gt convention), flags and bad hindcast input. */
import { describe, expect, it } from 'vitest';
import { leadProbabilities, type ProbabilityRequest } from '../../src/calibrate/probability.ts';
import type { LeadValues } from '../../src/calibrate/lead-tiers.ts';
import type { LeadClimate } from '../../src/calibrate/lead-climate.ts';
import { climate, leadsOf, YEARS_2006_2025 } from './climate-fixture.ts';
import { skillSummary } from '../support/skill-summary.ts';

// checks.json row ens-exc-gt: these 10 members, threshold 32.0, P(x > 32) = 0.4.
const ENS = [31.2, 33.5, 29.8, 35.1, 32.0, 30.0, 34.4, 28.9, 32.0, 36.3];

function forecast(leads: number, members = ENS, tier: 'days' | 'weeks' = 'weeks'): LeadValues {
  const values = new Float64Array(members.length * leads);
  members.forEach((x, m) => values.fill(x, m * leads, (m + 1) * leads));
  return { leads: leadsOf(tier, leads), members: members.length, values };
}

function request(over: Partial<ProbabilityRequest>): ProbabilityRequest {
  return {
    source: 'subseasonal',
    region: 'marrow-highlands',
    indicator: 'tmax-week',
    units: 'degC',
    forecast: forecast(3),
    hindcast: climate(YEARS_2006_2025, 10, leadsOf('weeks', 3), (y, m) => 30 + (y * 10 + m) / 100),
    observed: null,
    threshold: { kind: 'absolute', value: 32, units: 'degC' },
    calibration: { minMembers: 10, minHindcastYears: 10 },
    ...over,
  };
}

describe('leadProbabilities', () => {
  it('strict > on the ens-exc-gt members gives 0.4 (checks.json ens-exc-gt), base rate from hindcasts', () => {
    const [p] = leadProbabilities(request({}));
    expect(p.probability).toBeCloseTo(0.4, 12);
    expect(p.operator).toBe('>');
    expect(p.calibrated).toBe(true);
    expect(p.flags).toEqual([]);
    // hindcast values 30.00..31.99: none above 32.
    expect(p.baseRate).toBe(0);
    expect(p.threshold.origin).toBe('absolute 32 degC, lead week 1 (not quantile-mapped: no observations, raw model values)');
  });
  it('percentile spec: model-climate threshold and base rate ≈ 1 - q/100', () => {
    const [p] = leadProbabilities(request({ threshold: { kind: 'percentile', percentile: 90 } }));
    expect(p.threshold.origin).toBe('90th percentile of hindcasts 2006–2025 (200 values), lead week 1');
    expect(p.threshold.value).toBeCloseTo(30 + 179.1 / 100, 12); // numpy type 7: h = 199 × 0.9 = 179.1
    expect(p.baseRate).toBeCloseTo(20 / 200, 12);
    // members above 31.791: 33.5, 35.1, 32.0, 34.4, 32.0, 36.3
    expect(p.probability).toBeCloseTo(0.6, 12);
  });
  it('normal-year rate is the observed frequency where observations exist: a model 1 degC too warm does not show as a higher normal-year rate', () => {
    // Observations 30.00..30.19 (one per year); hindcasts 1 degC warmer. Absolute 30.15: 4 of 20 observed years exceed.
    const observed = climate(YEARS_2006_2025, 1, leadsOf('weeks', 3), (y) => 30 + y / 100);
    const warm = climate(YEARS_2006_2025, 10, leadsOf('weeks', 3), (y, m) => 31 + (y * 10 + m) / 1000);
    const [p] = leadProbabilities(request({ hindcast: warm, observed, threshold: { kind: 'absolute', value: 30.15, units: 'degC' } }));
    expect(p.baseRate).toBeCloseTo(4 / 20, 12);
    const [q] = leadProbabilities(
      request({ hindcast: warm, observed: null, threshold: { kind: 'absolute', value: 30.15, units: 'degC' } }),
    );
    expect(q.baseRate).toBe(1); // without observations: the model's own (biased) frequency
  });
  it('skill summaries are attached by lead index', () => {
    const s = skillSummary(0.1);
    const out = leadProbabilities(request({ skill: new Map([[2, s]]) }));
    expect(out.map((p) => p.skill)).toEqual([null, s, null]);
  });
  it('hindcasts shorter than the forecast: uncovered leads uncalibrated with a clear message, others go on', () => {
    const out = leadProbabilities(
      request({ hindcast: climate(YEARS_2006_2025, 10, leadsOf('weeks', 2), () => 30), threshold: { kind: 'percentile', percentile: 90 } }),
    );
    expect(out.map((p) => p.calibrated)).toEqual([true, true, false]);
    expect(out[2].flags).toContain('uncalibrated: hindcasts of subseasonal do not cover lead week 3');
    expect(out[2].probability).toBeNaN();
    expect(out[2].threshold.origin).toMatch(/^no threshold for the 90 percentile at lead week 3/);
    expect(out[0].probability).toBeCloseTo(0.7, 12); // threshold 30: all members but 29.8, 30.0, 28.9
  });
  it('hindcasts with a different member count (usual in operations, 11 against 51): named in a flag, leads stay calibrated on the pooled climate', () => {
    const out = leadProbabilities(
      request({ hindcast: climate(YEARS_2006_2025, 11, leadsOf('weeks', 3), () => 30), threshold: { kind: 'percentile', percentile: 90 } }),
    );
    expect(out.every((p) => p.calibrated)).toBe(true);
    expect(out[0].flags).toContain(
      'hindcast-members: hindcasts have 11 members per year, the forecast 10; thresholds pool all hindcast years × members, skill was measured with 11-member ensembles',
    );
    expect(out[0].threshold.value).toBe(30);
  });
  it('uncalibrated percentile lead falls back to the observed climatology, labelled "not model climate"', () => {
    const observed: LeadClimate = climate(YEARS_2006_2025, 1, leadsOf('weeks', 3), (y) => 30 + y / 10);
    const out = leadProbabilities(request({ hindcast: null, observed, threshold: { kind: 'percentile', percentile: 50 } }));
    expect(out[0].calibrated).toBe(false);
    expect(out[0].threshold.origin).toBe('50th percentile of observations 2006–2025 (20 values), lead week 1 (not model climate)');
  });
  it('fewer than minHindcastYears: "thresholds unstable: only N hindcast years"', () => {
    const out = leadProbabilities(request({ hindcast: climate(YEARS_2006_2025.slice(0, 8), 10, leadsOf('weeks', 3), () => 30) }));
    expect(out[0].flags).toContain('thresholds unstable: only 8 hindcast years (minimum 10)');
    expect(out[0].calibrated).toBe(true);
  });
  it('missing members: counted, and few-members states the 1/N step', () => {
    const f = forecast(3, [...ENS.slice(0, 8), NaN, NaN]);
    const [p] = leadProbabilities(request({ forecast: f, hindcast: climate(YEARS_2006_2025, 10, leadsOf('weeks', 3), () => 30) }));
    expect(p.validMembers).toBe(8);
    expect(p.probability).toBeCloseTo(3 / 8, 12);
    expect(p.flags).toEqual([
      'missing-members: 2 of 10 members have no value at lead week 1',
      'few-members: 8 valid members < 10; the probability moves in steps of 1/8 (12.5 %)',
    ]);
  });
  it('quantile mapping at week and day leads when observations cover them (Déqué 2007 empirical mapping)', () => {
    const obs = climate(YEARS_2006_2025, 1, leadsOf('weeks', 3), (y) => 31 + y / 10);
    const hcWarm = climate(YEARS_2006_2025, 10, leadsOf('weeks', 3), (y) => 33 + y / 10);
    const [w] = leadProbabilities(request({ observed: obs, hindcast: hcWarm }));
    expect(w.threshold.value).toBeCloseTo(34, 12); // 32 is the observed median → model median 34
    const d = leadProbabilities(
      request({
        forecast: forecast(1, ENS, 'days'),
        observed: climate(YEARS_2006_2025, 1, leadsOf('days', 1), (y) => 31 + y / 10),
        hindcast: climate(YEARS_2006_2025, 10, leadsOf('days', 1), (y) => 33 + y / 10),
      }),
    );
    expect(d[0].threshold.value).toBeCloseTo(34, 12);
    expect(d[0].threshold.origin).toMatch(/^absolute 32 degC quantile-mapped to 34 degC .*lead day 1$/);
    const raw = leadProbabilities(
      request({ forecast: forecast(1, ENS, 'days'), hindcast: climate(YEARS_2006_2025, 10, leadsOf('days', 1), (y) => 33 + y / 10) }),
    );
    expect(raw[0].threshold.origin).toBe('absolute 32 degC, lead day 1 (not quantile-mapped: no observations, raw model values)');
  });
});
