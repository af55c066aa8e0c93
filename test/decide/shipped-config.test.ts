/** The decide stage on the shipped Veloria configuration (loader and decide agree on ids, caps, rules). */
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import { decideStages } from '../../src/decide/decide-stages.ts';
import { tunedKey } from '../../src/core/keys.ts';
import { EMPTY_HISTORY } from '../../src/decide/types.ts';
import { prob } from './helpers.ts';

describe('decideStages with config/forelight.yaml', async () => {
  const config = await loadConfig();

  it('Heat Index P = 0.9 on day 2 in the lowlands issues act-now at once; malaria months wait for a second run', () => {
    const probabilities = [
      prob('kessan-lowlands', 'days', 2, 0.9, 0.2, 'heat-index'),
      prob('tulva-delta', 'months', 2, 0.95, 0.2, 'malaria-pf'),
    ];
    const { decisions, regionStages } = decideStages({
      config,
      probabilities,
      history: EMPTY_HISTORY,
      thresholdsFromCostLoss: new Map([[tunedKey('kessan-lowlands', 'heat-index-days-mindful'), 0.25]]),
      expectedTiers: new Set(config.sources.map((s) => s.tier)),
    });
    expect(decisions.filter((d) => !d.missing).map((d) => [d.region, d.indicator, d.tier, d.rawStageId, d.stageId])).toEqual([
      ['kessan-lowlands', 'heat-index', 'days', 'act-now', 'act-now'],
      ['tulva-delta', 'malaria-pf', 'months', 'mindful', 'quiet'],
    ]);
    expect(decisions.find((d) => d.region === 'tulva-delta' && d.indicator === 'malaria-pf')?.reasons).toContain(
      'held at quiet: 1 of 2 runs needed to escalate',
    );
    // Every other region × indicator × tier has no data and no earlier stage: "no forecast available", never quiet.
    const missing = decisions.filter((d) => d.missing);
    expect(missing.length).toBeGreaterThan(0);
    expect(missing.every((d) => d.stageId === 'no-forecast' && d.missing?.held === false)).toBe(true);
    expect(regionStages.map((r) => r.stageId)).toEqual(['act-now', 'no-forecast', 'quiet', 'no-forecast']);
  });
});
