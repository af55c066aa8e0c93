/**
 * test/reference/checks.json rows for verification scores, ensemble exceedance and the linear percentile:
 * one `it` per row (row id + source), driven from the JSON; the last test asserts every such row ran.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { exceedanceFraction } from '../../src/calibrate/probability.ts';
import { percentileLinear } from '../../src/core/percentile.ts';
import {
  brierScore1950,
  brierSkillScoreSampleClimatology,
  contingencyTable,
  falseAlarmRate,
  falseAlarmRatio,
  hitRate,
  murphyDecomposition1973,
  peirceSkillScore,
  relativeEconomicValueRichardson2000,
  rocArea,
} from '../../src/calibrate/verify.ts';

interface Row {
  id: string;
  quantity: string;
  inputs: Record<string, unknown>;
  expected: number;
  tolerance: number;
  source: string;
}
const rows = JSON.parse(readFileSync(new URL('../reference/checks.json', import.meta.url), 'utf8')) as Row[];

type In = Record<string, any>;
const table = (i: In) => contingencyTable(i.p, i.o, i.warn_if_p_ge);
const HANDLERS: Record<string, (i: In) => number> = {
  brier_score: (i) => brierScore1950(i.p, i.o),
  brier_skill_score_sample_climatology: (i) => brierSkillScoreSampleClimatology(i.p, i.o),
  brier_reliability: (i) => murphyDecomposition1973(i.p, i.o).reliability,
  brier_resolution: (i) => murphyDecomposition1973(i.p, i.o).resolution,
  roc_area: (i) => rocArea(i.p, i.o),
  hit_rate: (i) => hitRate(table(i)),
  false_alarm_rate: (i) => falseAlarmRate(table(i)),
  false_alarm_ratio: (i) => falseAlarmRatio(table(i)),
  peirce_skill_score: (i) => peirceSkillScore(table(i)),
  relative_economic_value: (i) => relativeEconomicValueRichardson2000(i.hit_rate, i.false_alarm_rate, i.base_rate, i.cost_loss),
  ensemble_exceedance_probability: (i) =>
    exceedanceFraction(
      i.members,
      i.threshold,
      i.rule === 'x > threshold'
        ? '>'
        : i.rule === 'x >= threshold'
          ? '>='
          : (() => {
              throw new Error(`unknown rule ${i.rule}`);
            })(),
    ).probability,
  percentile95_linear: (i) => percentileLinear(i.sample_c, 95),
};

const mine = rows.filter((r) => r.quantity in HANDLERS);
const exercised = new Set<string>();

describe('checks.json rows (calibrate)', () => {
  for (const row of mine) {
    it(`${row.id} — ${row.source}`, () => {
      const actual = HANDLERS[row.quantity](row.inputs);
      expect(Math.abs(actual - row.expected)).toBeLessThanOrEqual(row.tolerance);
      exercised.add(row.id);
    });
  }
  it('every row of the handled quantities was exercised', () => {
    expect(mine.length).toBeGreaterThanOrEqual(15);
    for (const q of Object.keys(HANDLERS))
      expect(
        mine.some((r) => r.quantity === q),
        q,
      ).toBe(true);
    expect([...exercised].sort()).toEqual(mine.map((r) => r.id).sort());
  });
});
