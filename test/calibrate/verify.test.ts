/** Verification details beyond the checks.json numbers: CHECKS.md §12 hand check of the 12-case example. */
import { describe, expect, it } from 'vitest';
import {
  bestProbabilityThreshold,
  brierScore1950,
  brierSkillScoreSampleClimatology,
  contingencyTable,
  hitRate,
  murphyDecomposition1973,
  reliabilityTable,
  rocPoints,
  valueEnvelope,
  VALUE_ALPHAS,
} from '../../src/calibrate/verify.ts';

// CHECKS.md §12 invented example.
const P = [0.1, 0.1, 0.1, 0.1, 0.3, 0.3, 0.3, 0.7, 0.7, 0.7, 0.9, 0.9];
const O = [0, 0, 0, 1, 0, 1, 0, 1, 1, 0, 1, 1];

describe('verification (CHECKS.md §12 hand check)', () => {
  it('ROC points (0,0), (0,1/3), (1/6,2/3), (1/2,5/6), (1,1)', () => {
    const pts = rocPoints(P, O).map((q) => [q.falseAlarmRate, q.hitRate]);
    const want = [
      [0, 0],
      [0, 1 / 3],
      [1 / 6, 2 / 3],
      [1 / 2, 5 / 6],
      [1, 1],
    ];
    expect(pts).toHaveLength(5);
    pts.forEach((pt, i) => {
      expect(pt[0]).toBeCloseTo(want[i][0], 12);
      expect(pt[1]).toBeCloseTo(want[i][1], 12);
    });
  });
  it('reliability table: bins 0.1/0.3/0.7/0.9 with observed frequency 1/4, 1/3, 2/3, 1', () => {
    const t = reliabilityTable(P, O);
    expect(t.map((r) => r.count)).toEqual([4, 3, 3, 2]);
    t.forEach((r, i) => expect(r.observedFrequency).toBeCloseTo([1 / 4, 1 / 3, 2 / 3, 1][i], 12));
  });
  it('Murphy (1973) identity BS = REL - RES + UNC holds exactly with distinct-value bins', () => {
    const d = murphyDecomposition1973(P, O);
    expect(d.reliability - d.resolution + d.uncertainty).toBeCloseTo(brierScore1950(P, O), 14);
    const coarse = reliabilityTable(P, O, [0.5]);
    expect(coarse.map((r) => r.count)).toEqual([7, 5]);
  });
  it('warning at p >= 0.5 gives a = 4, b = 1, c = 2, d = 5', () => {
    expect(contingencyTable(P, O, 0.5)).toEqual({ a: 4, b: 1, c: 2, d: 5 });
  });
  it('value envelope: at alpha = s = 0.5 the best threshold is 0.7 with V = PSS = 0.5 (Richardson 2000: max V = PSS at alpha = s)', () => {
    const best = bestProbabilityThreshold(P, O, 0.5);
    expect(best.threshold).toBe(0.7);
    expect(best.value).toBeCloseTo(0.5, 12);
    const env = valueEnvelope(P, O);
    expect(env.map((v) => v.alpha)).toEqual(VALUE_ALPHAS);
    expect(VALUE_ALPHAS[0]).toBe(0.05);
    expect(VALUE_ALPHAS[18]).toBe(0.95);
    expect(Math.max(...env.map((v) => v.value))).toBeCloseTo(0.5, 12);
    // Low cost/loss favours warning at low probabilities.
    expect(bestProbabilityThreshold(P, O, 0.1).threshold).toBeLessThanOrEqual(0.3);
    // Never "always warn" (p >= 0), even at a tiny cost/loss ratio where warning always is cheap.
    const withZeros = Float64Array.from([0, 0, 0, 0.1, 0.2, 0.9]);
    const events = Float64Array.from([0, 1, 0, 1, 0, 1]);
    expect(bestProbabilityThreshold(withZeros, events, 0.05).threshold).toBeGreaterThan(0);
  });
  it('no events: BSS and hit rate are NaN, never 0', () => {
    const none = P.map(() => 0);
    expect(brierSkillScoreSampleClimatology(P, none)).toBeNaN();
    expect(hitRate(contingencyTable(P, none, 0.5))).toBeNaN();
  });
  it('mismatched lengths throw', () => {
    expect(() => brierScore1950([0.1], [0, 1])).toThrow(/1 forecasts but 2 outcomes/);
  });
});
