/**
 * Data that vanishes never lowers a stage (issue: "no bulletin may be calmer than the last good advice without
 * saying why"): a region × indicator × tier without usable data holds its last issued stage for
 * escalation.hold-missing-runs runs, then shows "no forecast available" (never the lowest stage); when data comes
 * back, relaxing still takes relax-after-runs runs. Expected values follow from these rules by hand (this
 * project's design, documented in src/decide/decide-stages.ts; no external source).
 */
import { describe, expect, it } from 'vitest';
import { decideStages } from '../../src/decide/decide-stages.ts';
import { trackKey } from '../../src/core/keys.ts';
import { NO_FORECAST_ID, type StageHistory } from '../../src/decide/types.ts';
import type { Tier } from '../../src/types.ts';
import type { LeadProbability } from '../../src/probability-types.ts';
import { makeConfig, prob } from './helpers.ts';

const tiers = new Set<Tier>(['weeks', 'months']);
const key = trackKey('r1', 'heat', 'weeks');
const braceIssued: StageHistory = {
  version: 1,
  tracks: { [key]: { stageId: 'brace', runsAbove: 0, lowestAboveId: null, runsBelow: 1, highestBelowId: 'mindful' } },
};

function run(probabilities: LeadProbability[], history: StageHistory, holdMissingRuns = 2) {
  const config = makeConfig({ holdMissingRuns });
  return decideStages({
    config,
    probabilities,
    history,
    expectedTiers: tiers,
    unavailable: new Map([[key, 'short_20261130.nc: variable tasmax has no units']]),
  });
}

// Only the months tier has data: the weeks tier of r1 vanished.
const monthsOnly = [prob('r1', 'months', 1, 0.1)];

describe('a tier whose data vanished', () => {
  it('holds the last issued stage for hold-missing-runs runs, says why, keeps the persistence counters, then "no forecast available"', () => {
    const first = run(monthsOnly, braceIssued);
    const d1 = first.decisions.find((d) => d.region === 'r1' && d.tier === 'weeks');
    expect(d1).toMatchObject({
      stageId: 'brace',
      missing: { held: true, runs: 1, reason: 'short_20261130.nc: variable tasmax has no units' },
    });
    expect(d1?.reasons).toEqual([
      'no usable data: short_20261130.nc: variable tasmax has no units',
      'held at brace: run 1 of 2 without usable data (never relaxed because data vanished)',
      'issued: brace',
    ]);
    expect(first.regionStages.find((r) => r.region === 'r1')?.stageId).toBe('brace');
    expect(first.nextHistory.tracks[key]).toEqual({ ...braceIssued.tracks[key], missingRuns: 1 });

    const second = run(monthsOnly, first.nextHistory);
    expect(second.decisions.find((d) => d.region === 'r1' && d.tier === 'weeks')).toMatchObject({
      stageId: 'brace',
      missing: { held: true, runs: 2 },
    });

    const third = run(monthsOnly, second.nextHistory);
    const d3 = third.decisions.find((d) => d.region === 'r1' && d.tier === 'weeks');
    expect(d3).toMatchObject({ stageId: NO_FORECAST_ID, missing: { held: false, runs: 3 } });
    expect(d3?.reasons[1]).toBe('hold of 2 runs without data expired → no forecast available');
    // The other tier has data (quiet): the region is quiet from it, and the missing tier is no stage at all.
    expect(third.regionStages.find((r) => r.region === 'r1')?.stageId).toBe('quiet');
    expect(third.nextHistory.tracks[key]).toMatchObject({ stageId: 'brace', missingRuns: 3 });
  });

  it('when data returns below the held stage, relaxing still waits relax-after-runs runs (persistence is never skipped)', () => {
    const gone = run(monthsOnly, braceIssued).nextHistory;
    const back = run([...monthsOnly, prob('r1', 'weeks', 2, 0.05)], gone);
    const d = back.decisions.find((x) => x.region === 'r1' && x.tier === 'weeks');
    expect(d).toMatchObject({ rawStageId: 'quiet', stageId: 'mindful' });
    expect(d?.missing).toBeUndefined();
    // runsBelow was 1 before the data vanished and is kept: the second run below relaxes to the highest raw stage seen.
    expect(d?.reasons).toContain('relaxed to mindful after 2 runs below brace');
    expect(back.nextHistory.tracks[key].missingRuns).toBeUndefined();
  });

  it('no earlier stage (fresh ledger), or hold-missing-runs 0: "no forecast available" at once, never the lowest stage', () => {
    const fresh = run(monthsOnly, { version: 1, tracks: {} });
    expect(fresh.decisions.find((d) => d.region === 'r1' && d.tier === 'weeks')).toMatchObject({
      stageId: NO_FORECAST_ID,
      missing: { held: false },
    });
    expect(fresh.regionStages.find((r) => r.region === 'r2')?.stageId).toBe(NO_FORECAST_ID);
    const noHold = run(monthsOnly, braceIssued, 0);
    expect(noHold.decisions.find((d) => d.region === 'r1' && d.tier === 'weeks')?.stageId).toBe(NO_FORECAST_ID);
  });
});
