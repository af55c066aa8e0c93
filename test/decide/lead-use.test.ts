/**
 * How each lead took part in its stage (decide/lead-use.ts through decideStages): the typed reasons the bulletin
 * words from. Expected uses follow by hand from the rules of helpers.ts (weeks rules look at weeks 2–3; weeks capped
 * at brace, months at mindful; escalate and relax after 2 runs; top stage at once) — this project's design, no source.
 */
import { describe, expect, it } from 'vitest';
import { decideStages } from '../../src/decide/decide-stages.ts';
import { trackKey } from '../../src/core/keys.ts';
import { EMPTY_HISTORY, NO_FORECAST_ID, type StageHistory } from '../../src/decide/types.ts';
import type { Tier } from '../../src/types.ts';
import type { LeadProbability } from '../../src/probability-types.ts';
import { makeConfig, prob } from './helpers.ts';

const config = makeConfig();
const issued = (tier: Tier, stageId: string): StageHistory => ({
  version: 1,
  tracks: { [trackKey('r1', 'heat', tier)]: { stageId, runsAbove: 0, lowestAboveId: null, runsBelow: 0, highestBelowId: null } },
});
const decide = (probabilities: LeadProbability[], history: StageHistory = EMPTY_HISTORY) =>
  decideStages({ config, probabilities, history }).decisions[0];
const kinds = (d: ReturnType<typeof decide>) => d.leadUses?.map((u) => [u.index, u.kind, u.reachedId, u.supportsId]);

describe('leadUses', () => {
  const weeks = [
    prob('r1', 'weeks', 1, 0.9), // no weeks rule looks at week 1
    prob('r1', 'weeks', 2, 0.64), // brace by the rules
    prob('r1', 'weeks', 3, 0.5, -0.05), // skill interval not above 0
    prob('r1', 'weeks', 4, Number.NaN),
  ];

  it('names the lead no rule looks at, the one awaiting confirmation, the one without skill and the one without value', () => {
    const d = decide(weeks);
    expect(d.stageId).toBe('quiet');
    expect(d.wait).toEqual({ direction: 'raise', towardsId: 'brace', runs: 1, needed: 2 });
    expect(kinds(d)).toEqual([
      [1, 'no-rule', 'quiet', 'quiet'],
      [2, 'awaiting', 'brace', 'brace'],
      [3, 'no-skill', 'quiet', 'quiet'],
      [4, 'no-value', 'quiet', 'quiet'],
    ]);
  });

  it('persistence raising the stage one step names the stage it came from, the higher stage still waiting', () => {
    // Last run already pointed to mindful (1 of 2 runs); this run's week 2 points to brace: escalated to mindful,
    // the lowest stage both runs supported, brace counting again from 0 (decide/persistence.ts).
    const history: StageHistory = {
      version: 1,
      tracks: {
        [trackKey('r1', 'heat', 'weeks')]: { stageId: 'quiet', runsAbove: 1, lowestAboveId: 'mindful', runsBelow: 0, highestBelowId: null },
      },
    };
    const d = decide(weeks, history);
    expect(d.stageId).toBe('mindful');
    expect(d.wait).toEqual({ direction: 'raise', towardsId: 'brace', runs: 0, needed: 2, raisedFromId: 'quiet' });
    expect(kinds(d)?.[1]).toEqual([2, 'awaiting', 'brace', 'brace']);
  });

  it('a lead held for a degenerate threshold is named as such, not as a missing value', () => {
    const held = { ...prob('r1', 'months', 1, Number.NaN), flags: ['threshold-degenerate: lead month 1: threshold 1 1 …'] };
    const d = decide([held, prob('r1', 'months', 2, Number.NaN)]);
    // No lead of the range has a usable chance: missing data (held or "no forecast available"), never the lowest stage.
    expect(d.stageId).toBe(NO_FORECAST_ID);
    expect(d.missing?.reason).toMatch(/every past year gives the same answer/);
    expect(kinds(d)).toEqual([
      [1, 'no-contrast', 'quiet', 'quiet'],
      [2, 'no-value', 'quiet', 'quiet'],
    ]);
  });

  it('a range whose every lead is held keeps the last issued stage, as for missing data', () => {
    const held = { ...prob('r1', 'months', 1, Number.NaN), flags: ['threshold-degenerate: lead month 1: threshold 1 1 …'] };
    const d = decide([held], issued('months', 'mindful'));
    expect(d.stageId).toBe('mindful');
    expect(d.missing).toMatchObject({ runs: 1, held: true });
  });

  it('the lead sets the stage once persistence confirmed it', () => {
    const first = decideStages({ config, probabilities: weeks, history: EMPTY_HISTORY });
    const d = decide(weeks, first.nextHistory);
    expect(d.stageId).toBe('brace');
    expect(d.wait).toBeUndefined();
    expect(kinds(d)?.[1]).toEqual([2, 'sets-stage', 'brace', 'brace']);
  });

  it('a lead above the tier cap is capped, with the cap and the uncapped stage typed', () => {
    const d = decide([prob('r1', 'months', 1, 0.7), prob('r1', 'months', 2, 0.2)], issued('months', 'mindful'));
    expect(d.stageId).toBe('mindful');
    expect(d.cap).toEqual({ stageId: 'mindful', uncappedId: 'brace' });
    expect(kinds(d)).toEqual([
      [1, 'capped', 'brace', 'mindful'],
      [2, 'counted', 'quiet', 'quiet'],
    ]);
  });

  it('a stage kept above the rules waits to be lowered (typed, both runs counted)', () => {
    const d = decide([prob('r1', 'weeks', 2, 0.1)], issued('weeks', 'brace'));
    expect(d.stageId).toBe('brace');
    expect(d.wait).toEqual({ direction: 'lower', towardsId: 'quiet', runs: 1, needed: 2 });
    expect(kinds(d)).toEqual([[2, 'counted', 'quiet', 'quiet']]);
  });

  it('the top stage at once: the lead sets it in the first run', () => {
    const d = decide([prob('r1', 'days', 1, 0.85), prob('r1', 'days', 2, 0.65)]);
    expect(d.stageId).toBe('act-now');
    expect(kinds(d)).toEqual([
      [1, 'sets-stage', 'act-now', 'act-now'],
      [2, 'counted', 'brace', 'brace'],
    ]);
  });
});
