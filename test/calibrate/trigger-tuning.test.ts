/**
 * Cost/loss triggers judged out of sample (src/calibrate/trigger-tuning.ts) against an independent numpy/scipy
 * script (test/calibrate/reference_triggers.py, /usr/bin/python3): leave-one-year-out thresholds of maximum
 * relative economic value (Richardson 2000, QJRMS 126:649-667), their year-block bootstrap interval, and the
 * member-count-free threshold (median of Beta(k, n - k + 1), scipy.stats.beta). Plus simulations: without skill
 * the in-sample value is optimistic while the out-of-sample value is below 0.
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { VerificationCases } from '../../src/calibrate/bootstrap.ts';
import {
  binomialTail,
  leaveOneYearOutWarnings,
  memberCountFreeThreshold,
  outOfSampleValueCurve,
  tuneTrigger,
} from '../../src/calibrate/trigger-tuning.ts';
import { mulberry32, normal } from '../support/rng.ts';

const script = fileURLToPath(new URL('./reference_triggers.py', import.meta.url));

/** 20 years × `starts` cases of an n-member ensemble; `skill` 0 makes the outcome independent of the forecast. */
function simulate(seed: number, skill: number, members = 10, starts = 3): VerificationCases {
  const rand = mulberry32(seed);
  const gauss = normal(rand);
  const p: number[] = [],
    o: number[] = [],
    year: number[] = [];
  for (let y = 0; y < 20; y++) {
    for (let s = 0; s < starts; s++) {
      const signal = gauss();
      let above = 0;
      for (let m = 0; m < members; m++) if (skill * signal + Math.sqrt(1 - skill * skill) * gauss() > 1.28) above++;
      p.push(above / members);
      o.push(skill * signal + Math.sqrt(1 - skill * skill) * gauss() > 1.28 ? 1 : 0);
      year.push(2006 + y);
    }
  }
  return {
    p: Float64Array.from(p),
    members: new Float64Array(p.length).fill(members),
    o: Float64Array.from(o),
    caseYears: Float64Array.from(year),
    years: [...new Set(year)],
  };
}

describe('out-of-sample triggers vs numpy/scipy (reference_triggers.py)', () => {
  const cases = simulate(20261203, 0.8);
  const alphas = [0.05, 0.1, 0.2, 0.35, 0.5, 0.8];
  const kn = [
    [1, 10],
    [3, 10],
    [10, 10],
    [1, 11],
    [5, 51],
    [2, 4],
  ];
  const resamples = 20000;
  const ref = JSON.parse(
    execFileSync('/usr/bin/python3', [script], {
      input: JSON.stringify({ p: [...cases.p], o: [...cases.o], year: [...cases.caseYears], alphas, resamples, seed: 11, kn }),
    }).toString(),
  );
  const ours = outOfSampleValueCurve(cases, alphas, { resamples, seed: 11 });

  it('leave-one-year-out warnings, their value, hit and false-alarm rates equal numpy exactly (1e-12)', () => {
    const warnings = leaveOneYearOutWarnings(cases, alphas);
    alphas.forEach((_, j) => {
      expect([...warnings[j]]).toEqual(ref.curve[j].warn);
      expect(Math.abs(ours[j].value - ref.curve[j].value)).toBeLessThan(1e-12);
      expect(Math.abs(ours[j].hitRate - ref.curve[j].H)).toBeLessThan(1e-12);
      expect(Math.abs(ours[j].falseAlarmRate - ref.curve[j].F)).toBeLessThan(1e-12);
    });
  });
  it('the all-years threshold and its in-sample value equal numpy', () => {
    alphas.forEach((_, j) => {
      expect(ours[j].threshold).toBeCloseTo(ref.curve[j].threshold, 12);
      expect(Math.abs(ours[j].inSampleValue - ref.curve[j].in_sample)).toBeLessThan(1e-12);
    });
  });
  // The value of 60 cases takes few distinct values, so a percentile may sit on a neighbouring atom: tolerance 5 % of
  // the interval's width plus 0.01 (common practice, no source).
  it("90 % interval of the out-of-sample value agrees with numpy's bootstrap within Monte-Carlo error (20000 resamples)", () => {
    alphas.forEach((_, j) => {
      const tol = 0.05 * (ref.curve[j].high - ref.curve[j].low) + 0.01;
      expect(Math.abs(ours[j].interval.low - ref.curve[j].low)).toBeLessThan(tol);
      expect(Math.abs(ours[j].interval.high - ref.curve[j].high)).toBeLessThan(tol);
      expect(ours[j].interval.low).toBeLessThanOrEqual(ours[j].value);
    });
  });
  it('member-count-free threshold = scipy.stats.beta(k, n - k + 1).median(), where binom.sf(k - 1, n, q) = 1/2', () => {
    kn.forEach(([k, n], i) => {
      expect(Math.abs(memberCountFreeThreshold(k, n) - ref.median[i])).toBeLessThan(1e-9);
      expect(Math.abs(ref.tail[i] - 0.5)).toBeLessThan(1e-9);
      expect(Math.abs(binomialTail(n, k, ref.median[i]) - 0.5)).toBeLessThan(1e-9);
    });
  });
});

describe('member-count-free threshold', () => {
  it('with the hindcast ensemble size it is exactly "k of n": a fraction j/n reaches it only when j >= k', () => {
    for (const n of [4, 10, 11, 25, 51]) {
      for (let k = 1; k <= n; k++) {
        const q = memberCountFreeThreshold(k, n);
        for (let j = 0; j <= n; j++) expect(j / n >= q).toBe(j >= k);
      }
    }
  });
  it('1 of 10 hindcast members is 4 of 50 forecast members, not 5 (P(at least 1 of 10) = 1/2 at q = 1 - 0.5^(1/10))', () => {
    const q = memberCountFreeThreshold(1, 10);
    expect(q).toBeCloseTo(1 - 0.5 ** 0.1, 10); // closed form for k = 1 (from memory; checked by scipy above)
    expect(Math.ceil(q * 50)).toBe(4);
  });
});

describe('in-sample versus out-of-sample value on simulated hindcasts', () => {
  const options = { resamples: 200, seed: 3 };
  const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
  it('no skill (outcome independent of the forecast): the in-sample value is optimistic, the out-of-sample value is below 0', () => {
    const inSample: number[] = [];
    const outOfSample: number[] = [];
    for (let r = 0; r < 60; r++) {
      const [v] = outOfSampleValueCurve(simulate(1000 + r, 0), [0.1], options);
      inSample.push(v.inSampleValue);
      if (Number.isFinite(v.value)) outOfSample.push(v.value);
    }
    // The in-sample choice is optimistic by construction; judged on unseen years the trigger loses value.
    expect(mean(inSample) - mean(outOfSample)).toBeGreaterThan(0.05);
    expect(mean(outOfSample)).toBeLessThan(0);
  });
  it('real skill: the out-of-sample value is positive and its interval excludes 0', () => {
    const [v] = outOfSampleValueCurve(simulate(77, 0.9, 10, 5), [0.2], { resamples: 1000, seed: 5 });
    expect(v.value).toBeGreaterThan(0.2);
    expect(v.interval.low).toBeGreaterThan(0);
    expect(v.inSampleValue).toBeGreaterThanOrEqual(v.value);
  });
});

describe('tuneTrigger', () => {
  const observed = simulate(5, 0.8);
  const potential = simulate(6, 0.95, 9);
  it('uses only the observed leads when any lead has observations (perfect-model cases are never mixed in)', () => {
    const t = tuneTrigger(
      [
        { index: 1, basis: 'observed', cases: observed },
        { index: 2, basis: 'potential', cases: potential },
      ],
      0.2,
      { resamples: 100, seed: 1 },
    );
    expect(t?.basis).toBe('observed');
    expect(t?.leads).toEqual([1]);
    expect(t?.cases).toBe(observed.p.length);
    expect(t?.hindcastMembers).toBe(10);
    expect(t?.hindcastCount).toBe(Math.round((t?.value.threshold ?? NaN) * 10));
    expect(t?.forecastThreshold).toBeCloseTo(memberCountFreeThreshold(t?.hindcastCount ?? 0, 10), 12);
  });
  it('falls back to perfect-model cases, labelled, when no lead has observations', () => {
    const t = tuneTrigger([{ index: 2, basis: 'potential', cases: potential }], 0.2, { resamples: 100, seed: 1 });
    expect(t?.basis).toBe('potential');
    expect(t?.hindcastMembers).toBe(9);
  });
  it('gives no trigger when the cases hold no event', () => {
    const none = { ...observed, o: new Float64Array(observed.o.length) };
    expect(tuneTrigger([{ index: 1, basis: 'observed', cases: none }], 0.2, { resamples: 100, seed: 1 })).toBeNull();
  });
});
