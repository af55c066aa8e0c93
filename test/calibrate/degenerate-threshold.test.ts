/**
 * Thresholds that cannot tell a forecast from a normal year (src/calibrate/degenerate-threshold.ts), on a
 * saturated suitability index like the sample's Orrin Coast wet season (invented Veloria climates). Expected
 * thresholds follow by hand from the definitions: every type-7 percentile of 200 values all equal to 1 is 1
 * (Hyndman & Fan 1996), no value is greater than 1, and 0.75 below every observation has percent rank 0, which the
 * quantile mapping sends to the model's minimum.
 */
import { describe, expect, it } from 'vitest';
import { leadProbabilities, type ProbabilityRequest } from '../../src/calibrate/probability.ts';
import type { LeadValues } from '../../src/calibrate/lead-tiers.ts';
import type { LeadWindow } from '../../src/types.ts';
import { climate, YEARS_2006_2025 } from './climate-fixture.ts';

const APRIL: LeadWindow[] = [{ tier: 'months', index: 4, start: '2027-04-01', end: '2027-04-30' }];

function forecast(members: number[]): LeadValues {
  return { leads: APRIL, members: members.length, values: Float64Array.from(members) };
}

function request(over: Partial<ProbabilityRequest>): ProbabilityRequest {
  return {
    source: 'seasonal',
    region: 'orrin-coast',
    indicator: 'malaria-pf',
    units: '1',
    forecast: forecast(Array(25).fill(1)),
    hindcast: climate(YEARS_2006_2025, 10, APRIL, () => 1, '1'),
    observed: climate(YEARS_2006_2025, 1, APRIL, () => 1, '1'),
    threshold: { kind: 'absolute', value: 0.75, units: '1' },
    calibration: { minMembers: 10, minHindcastYears: 10 },
    ...over,
  };
}

function run(req: ProbabilityRequest) {
  const [p] = leadProbabilities(req);
  return { p, held: p.flags.filter((f) => f.startsWith('threshold-degenerate:')) };
}

describe('degenerate thresholds are held and said, never a silent 0 %', () => {
  it('0.75 below every observed April maps to the saturated model minimum 1: unreachable, lead held', () => {
    const { p } = run(request({}));
    expect(p.threshold.value).toBe(1);
    expect(p.baseRate).toBe(1);
    expect(p.probability).toBeNaN();
    expect(p.flags.some((f) => f.startsWith('threshold-degenerate: lead month 4: threshold 1 1 is exceeded by no hindcast value'))).toBe(
      true,
    );
  });
  it('the 90th percentile of a saturated index is 1, which nothing exceeds: held', () => {
    const { p } = run(request({ threshold: { kind: 'percentile', percentile: 90 }, observed: null }));
    expect(p.threshold.value).toBe(1);
    expect(p.probability).toBeNaN();
    expect(p.flags.join(' ')).toContain('stands for an event of frequency 10 %');
  });
  it('every past April and every member above the mapped threshold: 100 % says nothing a normal year does not, held', () => {
    // Model values 0.5 (one value) and 1 (199): 0.75 below every observation maps to 0.5; 199 of 200 exceed it.
    const hindcast = climate(YEARS_2006_2025, 10, APRIL, (y, m) => (y === 0 && m === 0 ? 0.5 : 1), '1');
    const { p } = run(request({ hindcast }));
    expect(p.threshold.value).toBe(0.5);
    expect(p.probability).toBeNaN();
    expect(p.flags.join(' ')).toContain('exceeded by 99.5 % of the hindcast values and in 100 % of normal years');
  });
  it('a threshold inside the climate keeps its probability', () => {
    // Hindcast values 0.5, 0.505, …, observed 0.6 … 0.98: the mapped threshold lies inside both climates.
    const hindcast = climate(YEARS_2006_2025, 10, APRIL, (y, m) => 0.5 + (y * 10 + m) / 400, '1');
    const observed = climate(YEARS_2006_2025, 1, APRIL, (y) => 0.6 + y / 50, '1');
    const { p, held } = run(request({ hindcast, observed, forecast: forecast([...Array(12).fill(0.6), ...Array(13).fill(0.95)]) }));
    expect(Number.isFinite(p.probability)).toBe(true);
    expect(held).toEqual([]);
  });
  it('a value above every past one and a forecast below it is a true "lower than ever", not held', () => {
    // Weekly heat index never above 36 in 20 years; the mapped threshold is the model maximum, no member reaches it.
    const weeks: LeadWindow[] = [{ tier: 'weeks', index: 1, start: '2026-12-01', end: '2026-12-07' }];
    const hindcast = climate(YEARS_2006_2025, 10, weeks, (y, m) => 30 + (y * 10 + m) / 100, 'degC');
    const observed = climate(YEARS_2006_2025, 1, weeks, (y) => 30 + y / 10, 'degC');
    const { p, held } = run(
      request({
        units: 'degC',
        hindcast,
        observed,
        threshold: { kind: 'absolute', value: 36, units: 'degC' },
        forecast: { leads: weeks, members: 3, values: Float64Array.from([29, 30, 31]) },
      }),
    );
    expect(p.probability).toBe(0);
    expect(held).toEqual([]);
  });
});
