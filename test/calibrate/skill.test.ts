/**
 * Skill over hindcasts with synthetic truth. Theory for the climatological ensemble (common knowledge, derived here):
 * members iid with the truth, event base rate s, N members → p ~ Binomial(N, s)/N independent of o, so
 * E[BS] = s(1-s)(1 + 1/N) and BSS ≈ -1/N; the ROC area is 0.5. Perfect ensemble → BSS 1, ROC area 1.
 */
import { describe, expect, it } from 'vitest';
import { skillByLead, skillReports, type SkillRequest } from '../../src/calibrate/skill.ts';
import { climate, leadsOf, YEARS_2006_2025 } from './climate-fixture.ts';
import { mulberry32, normal } from '../support/rng.ts';

const gate = { floor: 0, minEvents: 5, poolLeads: { days: 7, weeks: 1, months: 1 }, resamples: 1000, seed: 1, action: 'withhold' as const };
const years = (n: number) => Array.from({ length: n }, (_, i) => 1000 + i);

function req(over: Partial<SkillRequest>): SkillRequest {
  return {
    hindcast: climate([2006], 1, leadsOf('days', 1), () => 0),
    observed: null,
    threshold: { kind: 'percentile', percentile: 80 },
    stageProbabilities: [0.3, 0.6],
    gate,
    minHindcastYears: 10,
    ...over,
  };
}

describe('synthetic truth', () => {
  it('perfect ensemble against observations (all members = truth): BSS 1, ROC area 1', () => {
    const g = normal(mulberry32(1));
    const truth = Array.from({ length: 60 }, g);
    const leads = leadsOf('days', 1);
    const [r] = skillReports(
      req({
        hindcast: climate(years(60), 10, leads, (y) => truth[y]),
        observed: climate(years(60), 1, leads, (y) => truth[y]),
        // A percentile event: with an absolute one the day lead is quantile-mapped leave-one-year-out, and a mapping
        // built without year y can only place the threshold between y's neighbours (see the week/day test below).
        threshold: { kind: 'percentile', percentile: 70 },
      }),
    );
    expect(r.basis).toBe('observed');
    expect(r.cases).toBe(60);
    expect(r.brierSkillScore).toBe(1);
    expect(r.rocArea).toBe(1);
    expect(r.summary.skilful).toBe(true);
  });
  it('perfect ensemble, potential (perfect-model) skill with LOYO percentile thresholds: BSS 1, ROC area 1', () => {
    const g = normal(mulberry32(2));
    const truth = Array.from({ length: 30 }, g);
    const [r] = skillReports(req({ hindcast: climate(years(30), 5, leadsOf('weeks', 1), (y) => truth[y]) }));
    expect(r.basis).toBe('potential');
    expect(r.cases).toBe(150);
    expect(r.brierSkillScore).toBe(1);
    expect(r.rocArea).toBe(1);
    expect(r.flags).toContain('potential skill only: no observations configured');
    expect(r.summary.years).toBe(30); // independent cases are years, not years × members
    expect(r.summary.skilful).toBe(false); // a perfect-model estimate never passes the gate by itself
    expect(r.summary.gate.reason).toBe('potential-only');
  });
  it('absolute threshold at week and day leads: a model 2 degC too warm is corrected by LOYO quantile mapping (BSS 1)', () => {
    const g = normal(mulberry32(6));
    const signal = Array.from({ length: 40 }, g);
    const obs = climate(years(40), 1, leadsOf('weeks', 1), (y) => signal[y]);
    const warm = climate(years(40), 8, leadsOf('weeks', 1), (y) => signal[y] + 2);
    const [r] = skillReports(req({ hindcast: warm, observed: obs, threshold: { kind: 'absolute', value: 0.3, units: 'degC' } }));
    expect(r.brierSkillScore).toBe(1);
    const dayObs = climate(years(40), 1, leadsOf('days', 1), (y) => signal[y]);
    const dayWarm = climate(years(40), 8, leadsOf('days', 1), (y) => signal[y] + 2);
    const [d] = skillReports(req({ hindcast: dayWarm, observed: dayObs, threshold: { kind: 'absolute', value: 0.3, units: 'degC' } }));
    expect(d.brierSkillScore).toBe(1); // days are mapped too (Déqué 2007 empirical quantile mapping)
  });
  it('climatological ensemble against observations: BSS ≈ -1/N (N = 10), ROC area ≈ 0.5', () => {
    const g = normal(mulberry32(3));
    const leads = leadsOf('days', 1);
    const Y = 1500;
    const hc = climate(years(Y), 10, leads, () => g());
    const obs = climate(years(Y), 1, leads, () => g());
    const [r] = skillReports(req({ hindcast: hc, observed: obs, threshold: { kind: 'percentile', percentile: 50 } }));
    expect(r.cases).toBe(Y);
    // Sampling s.d. with 1500 cases: BSS ≈ 0.02, ROC area ≈ 0.015 (s = 0.5); tolerances ≈ 3 s.d.
    expect(Math.abs(r.brierSkillScore + 0.1)).toBeLessThan(0.06);
    expect(Math.abs(r.rocArea - 0.5)).toBeLessThan(0.05);
    expect(r.summary.skilful).toBe(false);
  });
  it('climatological ensemble, potential skill: BSS ≈ -1/(N-1) with N - 1 = 9 forecast members, ROC ≈ 0.5', () => {
    const g = normal(mulberry32(4));
    const [r] = skillReports(
      req({ hindcast: climate(years(300), 10, leadsOf('weeks', 1), () => g()), threshold: { kind: 'percentile', percentile: 70 } }),
    );
    expect(r.cases).toBe(3000);
    expect(Math.abs(r.brierSkillScore + 1 / 9)).toBeLessThan(0.04);
    expect(Math.abs(r.rocArea - 0.5)).toBeLessThan(0.04);
  });
});

describe('skill reports', () => {
  it('full report content: REL/RES/UNC, reliability table, H/F per stage probability, value curve 0.05..0.95', () => {
    const g = normal(mulberry32(5));
    const leads = leadsOf('weeks', 2);
    const signal = YEARS_2006_2025.map(() => g());
    const hc = climate(YEARS_2006_2025, 10, leads, (y) => signal[y] + 0.7 * g());
    const obs = climate(YEARS_2006_2025, 1, leads, (y) => signal[y] + 0.7 * g());
    const reps = skillReports(req({ hindcast: hc, observed: obs }));
    expect(reps).toHaveLength(2);
    const r = reps[1];
    expect(r.lead.index).toBe(2);
    expect(r.reliability - r.resolution + r.uncertainty).toBeCloseTo(r.brierScore, 12);
    expect(r.reliabilityTable.reduce((a, b) => a + b.count, 0)).toBe(20);
    expect(r.stages.map((s) => s.probability)).toEqual([0.3, 0.6]);
    expect(r.value).toHaveLength(19);
    expect(r.rocArea).toBeGreaterThan(0.6); // strong shared signal
    expect(skillByLead(reps).get(2)).toBe(r.summary);
    expect(r.summary.basis).toBe('observed');
  });
  it('observations missing a lead: that lead falls back to potential skill, labelled', () => {
    const hc = climate(YEARS_2006_2025, 10, leadsOf('weeks', 2), (y, m) => y + m / 10);
    const obs = climate(YEARS_2006_2025, 1, leadsOf('weeks', 1), (y) => y);
    const reps = skillReports(req({ hindcast: hc, observed: obs }));
    expect(reps.map((r) => r.basis)).toEqual(['observed', 'potential']);
    expect(reps[1].flags).toContain('potential skill only: observations do not cover lead week 2');
  });
  it('fewer than minHindcastYears: "thresholds unstable: only N hindcast years" flag', () => {
    const [r] = skillReports(req({ hindcast: climate(years(6), 4, leadsOf('weeks', 1), (y, m) => y * m) }));
    expect(r.flags[0]).toBe('thresholds unstable: only 6 hindcast years (minimum 10)');
  });
  it('no events in the cases: scores NaN, the gate fails, flag says why', () => {
    const [r] = skillReports(req({ hindcast: climate(years(12), 4, leadsOf('weeks', 1), () => 1) }));
    expect(r.brierSkillScore).toBeNaN();
    expect(r.summary.skilful).toBe(false);
    expect(r.flags.some((f) => f.startsWith('no-contrast: 0 events in 48 cases'))).toBe(true);
  });
});
