/**
 * Tercile categories, ranked probability skill (Epstein 1969; Weigel, Liniger & Appenzeller 2007) and reliability
 * diagrams with consistency bars (Bröcker & Smith 2007): hand values, a worked textbook example, the debiasing
 * property, and an independent numpy script (test/calibrate/reference_categories.py).
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { reliabilityDiagram, DEFAULT_RELIABILITY_EDGES } from '../../src/calibrate/reliability.ts';
import {
  rankedProbabilityScore,
  rankedProbabilitySkill,
  rpssBootstrap,
  rpssDebiasTerm,
  type CategoryCases,
} from '../../src/calibrate/rpss.ts';
import {
  seasonalClimate,
  tercileCases,
  tercileEdges,
  tercileOutlooks,
  tercileProbabilities,
  withTerciles,
} from '../../src/calibrate/terciles.ts';
import type { LeadProbability } from '../../src/probability-types.ts';
import { contingencyTable, falseAlarmRate, falseAlarmRatio, hitRate, peirceSkillScore } from '../../src/calibrate/verify.ts';
import { mulberry32, normal } from '../support/rng.ts';
import { climate, leadsOf, YEARS_2006_2025 } from './climate-fixture.ts';

const script = fileURLToPath(new URL('./reference_categories.py', import.meta.url));
const THIRDS = [1 / 3, 1 / 3, 1 / 3];

describe('ranked probability score (Epstein 1969), hand computations', () => {
  it('cumulative squared differences over the categories', () => {
    expect(rankedProbabilityScore([0.2, 0.5, 0.3], 2)).toBeCloseTo(0.04 + 0.49, 12); // F = 0.2, 0.7, 1; O = 0, 0, 1
    expect(rankedProbabilityScore(THIRDS, 1)).toBeCloseTo(2 / 9, 12);
    expect(rankedProbabilityScore(THIRDS, 0)).toBeCloseTo(5 / 9, 12);
    expect(rankedProbabilityScore([0, 0, 1], 2)).toBe(0);
  });
  it('Weigel et al. (2007) D = (1/M) Σ P_k (1 − P_k): 4/(9M) for equal thirds; p(1 − p)/M for two categories (the debiased BSS)', () => {
    expect(rpssDebiasTerm(9, THIRDS)).toBeCloseTo(4 / 81, 12);
    expect(rpssDebiasTerm(10, [0.9, 0.1])).toBeCloseTo(0.09 / 10, 12);
  });
  it('a climatological M-member ensemble: RPSS ≈ −1/M, debiased RPSS_D ≈ 0 (the point of Weigel et al. 2007)', () => {
    const rand = mulberry32(15);
    const M = 5;
    const n = 6000;
    const probabilities = new Float64Array(3 * n);
    const observed = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      for (let m = 0; m < M; m++) probabilities[3 * i + Math.floor(rand() * 3)] += 1 / M;
      observed[i] = Math.floor(rand() * 3);
    }
    const c: CategoryCases = {
      categories: 3,
      probabilities,
      observed,
      members: new Float64Array(n).fill(M),
      caseYears: Float64Array.from({ length: n }, (_, i) => i),
    };
    const s = rankedProbabilitySkill(c);
    expect(s.rpss).toBeGreaterThan(-1 / M - 0.04);
    expect(s.rpss).toBeLessThan(-1 / M + 0.04);
    expect(Math.abs(s.rpssDebiased)).toBeLessThan(0.03);
  });
});

describe('Wilks, Statistical Methods in the Atmospheric Sciences, 3rd ed., chapter 8', () => {
  it('Example 8.1, the Finley tornado forecasts (a = 28, b = 72, c = 23, d = 2680; table from memory): H, F, FAR, PSS', () => {
    // Forecast "tornado" as p = 1, "no tornado" as p = 0; warn at p ≥ 0.5.
    const p = [...Array(100).fill(1), ...Array(2703).fill(0)];
    const o = [...Array(28).fill(1), ...Array(72).fill(0), ...Array(23).fill(1), ...Array(2680).fill(0)];
    const t = contingencyTable(p, o, 0.5);
    expect(hitRate(t)).toBeCloseTo(28 / 51, 12); // 0.549
    expect(falseAlarmRate(t)).toBeCloseTo(72 / 2752, 12); // 0.026
    expect(falseAlarmRatio(t)).toBeCloseTo(0.72, 12);
    expect(peirceSkillScore(t)).toBeCloseTo(0.523, 3); // Wilks quotes PSS (Hanssen-Kuipers) 0.523 for Finley (from memory)
  });
});

describe('terciles', () => {
  it('edges at the 1/3 and 2/3 quantiles (numpy linear); members on an edge count as near normal', () => {
    const e = tercileEdges([1, 2, 3, 4, 5, 6, 7]);
    expect(e.lower).toBeCloseTo(3, 12); // h = 6/3 = 2 → x[2] = 3
    expect(e.upper).toBeCloseTo(5, 12);
    expect(tercileProbabilities([1, 3, 4, 5, 6, NaN], e)).toEqual({ p: [0.2, 0.6, 0.2], valid: 5 });
  });
  it('seasons are the mean (or sum) of three consecutive months per year and member', () => {
    const c = climate([2006, 2007], 2, leadsOf('months', 4), (y, m, l) => 10 * y + m + l);
    const mean = seasonalClimate(c, 'mean');
    expect(mean.leads.length).toBe(2);
    expect(mean.leads[0].end).toBe(c.leads[2].end);
    expect(mean.values[0]).toBeCloseTo(1, 12); // (0 + 1 + 2) / 3
    expect(seasonalClimate(c, 'sum').values[(1 * 2 + 1) * 2 + 1]).toBeCloseTo(3 * 11 + 6, 12); // year 1, member 1, season 2
  });
});

describe('against numpy (reference_categories.py)', () => {
  const rand = mulberry32(20261203);
  const gauss = normal(rand);
  const members = 9;
  const nLeads = 3;
  const signal = YEARS_2006_2025.map(() => Array.from({ length: nLeads }, gauss));
  const skillOf = [2, 1, 0]; // lead 1 informative, lead 3 none
  const hcValues = YEARS_2006_2025.map((_, y) => signal[y].map((s, l) => Array.from({ length: members }, () => skillOf[l] * s + gauss())));
  const obsValues = YEARS_2006_2025.map((_, y) => signal[y].map((s) => 2 * s + 0.5 * gauss()));
  const hc = climate(YEARS_2006_2025, members, leadsOf('months', nLeads), (y, m, l) => hcValues[y][l][m]);
  const obs = climate(YEARS_2006_2025, 1, leadsOf('months', nLeads), (y, _m, l) => obsValues[y][l]);
  const p = Array.from({ length: 400 }, () => Math.floor(rand() * 11) / 10);
  const o = p.map((x) => (rand() < 0.1 + 0.8 * x ? 1 : 0));
  const resamples = 2000;
  const ref = JSON.parse(
    execFileSync('/usr/bin/python3', [script], {
      input: JSON.stringify({
        hindcast: hcValues,
        observed: obsValues,
        years: YEARS_2006_2025,
        resamples,
        seed: 7,
        p,
        o,
        edges: DEFAULT_RELIABILITY_EDGES,
      }),
    }).toString(),
  );

  it('cross-validated tercile cases, RPS, RPSS and RPSS_D per lead (1e-12)', () => {
    for (let l = 0; l < nLeads; l++) {
      const c = tercileCases(hc, obs, l);
      const r = ref.leads[l];
      expect([...c.observed]).toEqual(r.observed);
      [...c.probabilities].forEach((x, i) => expect(Math.abs(x - r.probabilities[i])).toBeLessThan(1e-12));
      const s = rankedProbabilitySkill(c);
      expect(Math.abs(s.rps - r.rps)).toBeLessThan(1e-12);
      expect(Math.abs(s.rpsClimate - r.rps_clim)).toBeLessThan(1e-12);
      expect(Math.abs(s.rpss - r.rpss)).toBeLessThan(1e-12);
      expect(Math.abs(s.rpssDebiased - r.rpss_d)).toBeLessThan(1e-12);
    }
    // and the skill is where it was built: informative lead above none
    expect(ref.leads[0].rpss_d).toBeGreaterThan(0.2);
    expect(ref.leads[0].rpss_d).toBeGreaterThan(ref.leads[2].rpss_d);
  });

  it('year-block bootstrap interval of RPSS_D within Monte-Carlo tolerance (2000 resamples, different generators)', () => {
    for (let l = 0; l < nLeads; l++) {
      const iv = rpssBootstrap(tercileCases(hc, obs, l), { resamples, seed: 7 });
      expect(Math.abs(iv.low - ref.leads[l].low)).toBeLessThan(0.05);
      expect(Math.abs(iv.high - ref.leads[l].high)).toBeLessThan(0.05);
      expect(iv.low).toBeLessThan(rankedProbabilitySkill(tercileCases(hc, obs, l)).rpssDebiased);
    }
    const again = rpssBootstrap(tercileCases(hc, obs, 0), { resamples: 200, seed: 3 });
    expect(rpssBootstrap(tercileCases(hc, obs, 0), { resamples: 200, seed: 3 })).toEqual(again); // seeded: reproducible
  });

  it('reliability bins exact, consistency bars (Bröcker & Smith 2007) within Monte-Carlo tolerance', () => {
    const d = reliabilityDiagram(p, o, { resamples, seed: 7 });
    expect(d.bins.length).toBe(ref.bins.length);
    d.bins.forEach((b, k) => {
      const r = ref.bins[k];
      expect(b.count).toBe(r.count);
      expect(Math.abs(b.forecastMean - r.forecast_mean)).toBeLessThan(1e-12);
      expect(Math.abs(b.observedFrequency - r.observed_frequency)).toBeLessThan(1e-12);
      expect(Math.abs(b.consistencyLow - r.low)).toBeLessThan(0.04);
      expect(Math.abs(b.consistencyHigh - r.high)).toBeLessThan(0.04);
    });
  });
});

describe('consistency bars tell reliable from unreliable forecasts', () => {
  it('outcomes drawn from the forecasts stay within the bars; outcomes independent of them leave the outer bars', () => {
    const rand = mulberry32(99);
    const p = Array.from({ length: 2000 }, () => Math.floor(rand() * 11) / 10);
    const reliable = reliabilityDiagram(
      p,
      p.map((x) => (rand() < x ? 1 : 0)),
      { resamples: 1000, seed: 1 },
    );
    const outside = reliable.bins.filter((b) => b.observedFrequency < b.consistencyLow || b.observedFrequency > b.consistencyHigh);
    expect(outside.length).toBeLessThanOrEqual(2); // 11 bins at 90 %: about one expected outside by chance
    const noSkill = reliabilityDiagram(
      p,
      p.map(() => (rand() < 0.5 ? 1 : 0)),
      { resamples: 1000, seed: 1 },
    );
    const ends = noSkill.bins.filter((b) => b.forecastMean <= 0.1 || b.forecastMean >= 0.9);
    expect(ends.every((b) => b.observedFrequency < b.consistencyLow || b.observedFrequency > b.consistencyHigh)).toBe(true);
  });
});

describe('tercile outlooks of a forecast (months and 3-month seasons)', () => {
  const rand = mulberry32(8);
  const gauss = normal(rand);
  const hc = climate(YEARS_2006_2025, 5, leadsOf('months', 4), () => 25 + gauss());
  const obs = climate(YEARS_2006_2025, 1, leadsOf('months', 4), () => 25 + gauss());
  const members = 6;
  // members far above the climate in month 1, far below in month 2, at the climate's centre afterwards
  const values = Float64Array.from({ length: members * 4 }, (_, i) => [30, 20, 25, 25][i % 4]);
  const forecast = { leads: leadsOf('months', 4), members, values };
  const boot = { resamples: 300, seed: 2 };

  it('chances per month and season; skill only where observations verify them', () => {
    const out = tercileOutlooks({ forecast, hindcast: hc, observed: obs, how: 'mean', bootstrap: boot });
    const months = out.filter((o) => o.period === 'month');
    const seasons = out.filter((o) => o.period === 'season');
    expect(months.map((o) => [o.below, o.near, o.above])).toEqual([
      [0, 0, 1],
      [1, 0, 0],
      [0, 1, 0],
      [0, 1, 0],
    ]);
    expect(seasons.map((o) => o.months)).toEqual([
      [1, 3],
      [2, 4],
    ]);
    expect(seasons[0].near).toBe(1); // season mean (30 + 20 + 25)/3 = 25: near normal
    expect(out.every((o) => o.skill !== null && o.skill.years === 20 && o.skill.low <= o.skill.high)).toBe(true);
    const unchecked = tercileOutlooks({ forecast, hindcast: hc, observed: null, how: 'mean', bootstrap: boot });
    expect(unchecked.every((o) => o.skill === null)).toBe(true);
  });

  it("dated by the forecast's own months, not the hindcast climate's first year", () => {
    const in2026 = leadsOf('months', 4).map((l) => ({ ...l, start: l.start.replace('2006', '2026'), end: l.end.replace('2006', '2026') }));
    const out = tercileOutlooks({ forecast: { ...forecast, leads: in2026 }, hindcast: hc, observed: obs, how: 'mean', bootstrap: boot });
    const seasons = out.filter((o) => o.period === 'season');
    expect(out.filter((o) => o.period === 'month').map((o) => o.start)).toEqual(in2026.map((l) => l.start));
    expect(seasons.map((o) => [o.start, o.end])).toEqual([
      [in2026[0].start, in2026[2].end],
      [in2026[1].start, in2026[3].end],
    ]);
  });

  it('attached to the months tier of temperature and rain only', () => {
    const probs = leadsOf('months', 4).map((lead) => ({ lead }) as unknown as LeadProbability);
    const base = { forecast, hindcast: hc, observed: obs, aggregate: 'mean' as const, bootstrap: boot };
    const withT = withTerciles(probs, { ...base, units: 'degC' });
    expect(withT[0].terciles?.month.above).toBe(1);
    expect(withT[0].terciles?.season?.months).toEqual([1, 3]);
    expect(withT[3].terciles?.season).toBeNull();
    expect(withTerciles(probs, { ...base, units: '1' })[0].terciles).toBeUndefined(); // an index 0..1 has no seasonal categories
    const weeks = { ...forecast, leads: leadsOf('weeks', 4) };
    expect(withTerciles(probs, { ...base, forecast: weeks, units: 'degC' })[0].terciles).toBeUndefined();
  });
});
