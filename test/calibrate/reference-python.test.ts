/**
 * Independent reference: test/calibrate/reference_scores.py (numpy 1.24 + scipy 1.10, Debian /usr/bin/python3)
 * on seeded random forecasts. Command: /usr/bin/python3 test/calibrate/reference_scores.py < input.json
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { percentileLinear } from '../../src/core/percentile.ts';
import {
  brierScore1950,
  brierSkillScoreSampleClimatology,
  contingencyTable,
  falseAlarmRate,
  hitRate,
  relativeEconomicValueRichardson2000,
  rocArea,
} from '../../src/calibrate/verify.ts';
import { mulberry32, normal } from '../support/rng.ts';

const script = fileURLToPath(new URL('./reference_scores.py', import.meta.url));

describe('scores vs numpy/scipy reference_scores.py', () => {
  const rand = mulberry32(20261126);
  const gauss = normal(rand);
  const n = 500;
  // p as 10-member ensemble fractions (ties on purpose), o correlated with p.
  const p = Array.from({ length: n }, () => Math.floor(rand() * 11) / 10);
  const o: number[] = p.map((x) => (rand() < 0.2 + 0.6 * x ? 1 : 0));
  const thresholds = [0.1, 0.3, 0.5, 0.7, 0.9];
  const alphas = [0.05, 0.2, 0.5, 0.8, 0.95];
  const samples = [
    Array.from({ length: 7 }, gauss),
    Array.from({ length: 20 }, () => 30 + 3 * gauss()),
    Array.from({ length: 220 }, () => Math.round(10 * gauss()) / 4), // many ties
  ];
  const qs = [0, 5, 10, 33.3, 50, 90, 95, 97.5, 100];
  const ref = JSON.parse(
    execFileSync('/usr/bin/python3', [script], {
      input: JSON.stringify({ p, o, thresholds, alphas, percentile_samples: samples, qs }),
    }).toString(),
  );

  it('Brier score and BSS (numpy)', () => {
    expect(Math.abs(brierScore1950(p, o) - ref.bs)).toBeLessThan(1e-9);
    expect(Math.abs(brierSkillScoreSampleClimatology(p, o) - ref.bss)).toBeLessThan(1e-9);
  });
  it('ROC area = scipy.stats.mannwhitneyu U / (n1 n0), ties 1/2', () => {
    expect(Math.abs(rocArea(p, o) - ref.auc)).toBeLessThan(1e-9);
  });
  it('hit rate, false-alarm rate and REV at each threshold and cost/loss (numpy, Richardson 2000)', () => {
    thresholds.forEach((t, k) => {
      const tab = contingencyTable(p, o, t);
      const h = hitRate(tab);
      const f = falseAlarmRate(tab);
      expect(Math.abs(h - ref.rates[k].H)).toBeLessThan(1e-9);
      expect(Math.abs(f - ref.rates[k].F)).toBeLessThan(1e-9);
      const s = o.reduce((a, b) => a + b, 0) / n;
      alphas.forEach((al, j) =>
        expect(Math.abs(relativeEconomicValueRichardson2000(h, f, s, al) - ref.rates[k].rev[j])).toBeLessThan(1e-9),
      );
    });
  });
  it("percentile = numpy.percentile(method='linear') on random samples", () => {
    samples.forEach((x, i) => qs.forEach((q, j) => expect(Math.abs(percentileLinear(x, q) - ref.percentiles[i][j])).toBeLessThan(1e-9)));
  });
});
