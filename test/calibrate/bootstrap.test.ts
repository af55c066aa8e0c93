/**
 * Fair Brier score (Ferro 2014, "Fair scores for ensemble forecasts", QJRMS 140, eq. 8), year-block bootstrap
 * intervals and the Weibull percentile against an independent numpy/scipy script
 * (test/calibrate/reference_bootstrap.py, run by /usr/bin/python3), plus the defining property of a fair score.
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { yearBlockBootstrap, type VerificationCases } from '../../src/calibrate/bootstrap.ts';
import { fairBrierScoreFerro2014, fairBrierSkillScore } from '../../src/calibrate/fair-brier.ts';
import { brierSkillScoreSampleClimatology } from '../../src/calibrate/verify.ts';
import { percentileLinear } from '../../src/core/percentile.ts';
import { mulberry32, normal } from '../support/rng.ts';

const script = fileURLToPath(new URL('./reference_bootstrap.py', import.meta.url));

describe('fair Brier score and year-block bootstrap vs numpy/scipy (reference_bootstrap.py)', () => {
  const rand = mulberry32(20261202);
  const gauss = normal(rand);
  // 20 years × 3 pooled starts; 11-member ensembles (i of m above); outcome correlated with the forecast.
  const year: number[] = [],
    i: number[] = [],
    m: number[] = [],
    o: number[] = [];
  for (let y = 0; y < 20; y++) {
    const signal = gauss();
    for (let s = 0; s < 3; s++) {
      const members = s === 2 ? 51 : 11;
      let above = 0;
      for (let k = 0; k < members; k++) if (signal + gauss() > 1) above++;
      year.push(2006 + y);
      i.push(above);
      m.push(members);
      o.push(signal + gauss() > 1 ? 1 : 0);
    }
  }
  const cases: VerificationCases = {
    p: Float64Array.from(i, (x, k) => x / m[k]),
    members: Float64Array.from(m),
    o: Float64Array.from(o),
    caseYears: Float64Array.from(year),
    years: [...new Set(year)],
  };
  const samples = [Array.from({ length: 19 }, gauss), Array.from({ length: 209 }, () => 30 + 2 * gauss())];
  const qs = [0, 5, 10, 50, 75, 90, 95, 100];
  const resamples = 20000;
  const ref = JSON.parse(
    execFileSync('/usr/bin/python3', [script], { input: JSON.stringify({ i, m, o, year, resamples, seed: 7, samples, qs }) }).toString(),
  );

  it('fair Brier score and fair BSS equal numpy to 1e-12 (mixed 11- and 51-member cases)', () => {
    expect(Math.abs(fairBrierScoreFerro2014(cases.p, cases.members, cases.o) - ref.fair_bs)).toBeLessThan(1e-12);
    expect(Math.abs(fairBrierSkillScore(cases.p, cases.members, cases.o) - ref.fair_bss)).toBeLessThan(1e-12);
  });
  it("90 % intervals of BSS, fair BSS and ROC area agree with numpy's bootstrap within Monte-Carlo error (0.02 at 20000 resamples)", () => {
    const ours = yearBlockBootstrap(cases, { resamples, seed: 7 });
    const pairs: [typeof ours.rocArea, number[]][] = [
      [ours.brierSkillScore, ref.bss],
      [ours.fairBrierSkillScore, ref.fair],
      [ours.rocArea, ref.auc],
    ];
    for (const [iv, r] of pairs) {
      expect(Math.abs(iv.low - r[0])).toBeLessThan(0.02);
      expect(Math.abs(iv.high - r[1])).toBeLessThan(0.02);
    }
  });
  it('the same seed gives the same interval; another seed a slightly different one', () => {
    const a = yearBlockBootstrap(cases, { resamples: 1000, seed: 3 });
    expect(yearBlockBootstrap(cases, { resamples: 1000, seed: 3 })).toEqual(a);
    expect(yearBlockBootstrap(cases, { resamples: 1000, seed: 4 }).brierSkillScore).not.toEqual(a.brierSkillScore);
  });
  it("Weibull percentile (Hyndman-Fan type 6) = numpy.percentile(method='weibull')", () => {
    samples.forEach((x, k) =>
      qs.forEach((q, j) => expect(Math.abs(percentileLinear(x, q, 'weibull') - ref.weibull[k][j])).toBeLessThan(1e-9)),
    );
  });
});

describe('fairness (Ferro 2014, section 2: the expected fair score does not depend on ensemble size)', () => {
  it('members drawn like the truth: fair BSS ≈ 0 for 5 and for 50 members, the plain BSS ≈ −1/m', () => {
    const gauss = normal(mulberry32(11));
    for (const members of [5, 50]) {
      const n = 4000;
      const p = new Float64Array(n),
        mm = new Float64Array(n).fill(members),
        o = new Float64Array(n);
      for (let k = 0; k < n; k++) {
        let above = 0;
        for (let j = 0; j < members; j++) if (gauss() > 0.5) above++;
        p[k] = above / members;
        o[k] = gauss() > 0.5 ? 1 : 0;
      }
      // Sampling s.d. of either score with 4000 cases ≈ 0.02 (s ≈ 0.31); tolerance ≈ 2.5 s.d.
      expect(Math.abs(fairBrierSkillScore(p, mm, o))).toBeLessThan(0.05);
      expect(Math.abs(brierSkillScoreSampleClimatology(p, o) + 1 / members)).toBeLessThan(0.05);
    }
  });
  it('one member is not an ensemble: NaN', () => {
    expect(fairBrierScoreFerro2014([1], [1], [1])).toBeNaN();
  });
});
