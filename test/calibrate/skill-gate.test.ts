/**
 * The skill gate (calibrate/skill-gate.ts) on simulated hindcasts. No-skill: observations independent of the
 * forecasts, 20 years × 11 members, 90th-percentile events (about 2 events per lead, the situation of the audit:
 * a ROC ≥ 0.6 gate passed 29 % of such leads). A gate on the lower end of a 90 % interval should pass about 5 %
 * (its one-sided level); real skill should pass nearly always. Simulation seeds are fixed, so the counts are
 * reproducible; the bounds leave room for Monte-Carlo noise (binomial s.d. of a 5 % rate over 300 windows ≈ 1.3 %).
 */
import { describe, expect, it } from 'vitest';
import { skillReports } from '../../src/calibrate/skill.ts';
import { poolingWindow } from '../../src/calibrate/skill-gate.ts';
import { SKILL_GATE_DEFAULTS } from '../../src/config/build-config.ts';
import type { Tier } from '../../src/types.ts';
import type { DecisionConfig } from '../../src/config/decision-config.ts';
import { climate, leadsOf } from './climate-fixture.ts';
import { mulberry32, normal } from '../support/rng.ts';

const YEARS = Array.from({ length: 20 }, (_, i) => 2006 + i);
const gate: DecisionConfig['skillGate'] = {
  ...SKILL_GATE_DEFAULTS,
  poolLeads: { ...SKILL_GATE_DEFAULTS.poolLeads },
  action: 'say-no-skill',
};

/** Share of pooling windows that pass, over `runs` simulated hindcast sets of `leads` leads. */
function passRate(
  tier: Tier,
  leads: number,
  runs: number,
  seed: number,
  noise: number | null,
  g = gate,
  warming: { perYear: number; recentreOn?: number } = { perYear: 0 },
): { rate: number; windows: number } {
  const gauss = normal(mulberry32(seed));
  let passed = 0;
  let windows = 0;
  for (let r = 0; r < runs; r++) {
    const ls = leadsOf(tier, leads);
    const signal = YEARS.map(() => ls.map(() => gauss()));
    // noise null: no skill (observations independent of the members); else shared signal plus noise.
    const trend = (y: number) => warming.perYear * (y - 9.5);
    const hc = climate(YEARS, 11, ls, (y, _m, l) => trend(y) + (noise === null ? gauss() : signal[y][l] + noise * gauss()));
    const obs = climate(YEARS, 1, ls, (y, _m, l) => trend(y) + (noise === null ? gauss() : signal[y][l] + noise * gauss()));
    const on = warming.recentreOn;
    const reports = skillReports({
      hindcast: on === undefined ? hc : { ...hc, recentreOn: on },
      observed: on === undefined ? obs : { ...obs, recentreOn: on },
      threshold: { kind: 'percentile', percentile: 90 },
      stageProbabilities: [],
      gate: g,
      minHindcastYears: 15,
    });
    const seen = new Set<string>();
    for (const rep of reports) {
      if (seen.has(rep.summary.gate.leads)) continue;
      seen.add(rep.summary.gate.leads);
      windows++;
      if (rep.summary.skilful) passed++;
    }
  }
  return { rate: passed / windows, windows };
}

describe('skill gate on simulated hindcasts', () => {
  it('no skill, days pooled by lead week (default gate): passes at most ~5 % of windows', () => {
    const { rate, windows } = passRate('days', 14, 100, 71, null);
    expect(windows).toBe(200);
    // measured: 7 of 200 windows (3.5 %)
    expect(rate).toBeLessThanOrEqual(0.06);
  });
  it('no skill, weeks pooled by 4: passes at most ~5 % of windows', () => {
    const { rate } = passRate('weeks', 4, 100, 72, null, { ...gate, poolLeads: { ...gate.poolLeads, weeks: 4 } });
    // measured: 4 of 100 windows (4 %)
    expect(rate).toBeLessThanOrEqual(0.07);
  });
  it('real skill (members and observation share a signal of s.d. 1, each with noise s.d. 0.3): passes in nearly every window', () => {
    // measured: 39 of 40 windows; with noise 0.5 (weaker skill) 80 %, 0.7 55 % — 14 events per window limit what can be shown.
    expect(passRate('days', 14, 20, 73, 0.3).rate).toBeGreaterThanOrEqual(0.9);
  });
  it('no skill beyond a warming shared by model and observations (0.15 s.d. a year): a raw climate credits the trend as skill, a trend-aware one does not', () => {
    const raw = passRate('days', 14, 40, 75, null, gate, { perYear: 0.15 });
    const aware = passRate('days', 14, 40, 75, null, gate, { perYear: 0.15, recentreOn: 2026 });
    // measured: raw 22 of 80 windows (27.5 %); trend-aware 1 of 80 (1.25 %) (trend-climate.ts: each held-out year
    // re-centred on itself, its trend fitted without it)
    expect(raw.rate).toBeGreaterThan(0.15);
    expect(aware.rate).toBeLessThanOrEqual(0.08);
  });
  it('weeks one by one with 20 years: about 2 events per lead is too few to judge (default min-events 5)', () => {
    const { rate } = passRate('weeks', 4, 10, 74, 0.3);
    expect(rate).toBe(0);
  });
});

describe('pooling windows', () => {
  it('consecutive blocks of pool-leads per tier: days 1–7, 8–14; weeks one by one', () => {
    expect(poolingWindow('days', 1, gate)).toEqual({ first: 1, last: 7 });
    expect(poolingWindow('days', 7, gate)).toEqual({ first: 1, last: 7 });
    expect(poolingWindow('days', 8, gate)).toEqual({ first: 8, last: 14 });
    expect(poolingWindow('weeks', 3, gate)).toEqual({ first: 3, last: 3 });
    expect(poolingWindow('weeks', 3, { ...gate, poolLeads: { ...gate.poolLeads, weeks: 2 } })).toEqual({ first: 3, last: 4 });
  });
  it('every lead of a window gets the same verdict (no flipping from day to day)', () => {
    const gauss = normal(mulberry32(9));
    const ls = leadsOf('days', 14);
    const signal = YEARS.map(() => ls.map(() => gauss()));
    const hc = climate(YEARS, 11, ls, (y, _m, l) => signal[y][l] + 0.8 * gauss());
    const obs = climate(YEARS, 1, ls, (y, _m, l) => signal[y][l] + 0.8 * gauss());
    const reps = skillReports({
      hindcast: hc,
      observed: obs,
      threshold: { kind: 'percentile', percentile: 90 },
      stageProbabilities: [],
      gate,
      minHindcastYears: 15,
    });
    const first = reps.slice(0, 7).map((r) => r.summary.gate);
    expect(new Set(first.map((g) => JSON.stringify(g))).size).toBe(1);
    expect(first[0].leads).toBe('days 1–7');
    expect(first[0].events).toBe(reps.slice(0, 7).reduce((a, r) => a + r.events, 0));
    expect(reps[7].summary.gate.leads).toBe('days 8–14');
  });
});
