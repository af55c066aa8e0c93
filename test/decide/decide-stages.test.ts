/**
 * Decide stage: rule firing, skill gate, tier caps, persistence (escalate after N runs, relax after M),
 * top stage at once, highest wins, cost/loss thresholds. Expected stages follow from the rules in
 * helpers.ts by hand; the ladder semantics are this project's design (documented in persistence.ts).
 */
import { describe, expect, it } from 'vitest';
import { combineRegionStages, decideStages } from '../../src/decide/decide-stages.ts';
import { parseStageHistory } from '../../src/decide/history.ts';
import { trackKey, tunedKey, type TunedKey } from '../../src/core/keys.ts';
import { EMPTY_HISTORY, NO_FORECAST_ID, type StageHistory } from '../../src/decide/types.ts';
import type { LeadProbability } from '../../src/probability-types.ts';
import { makeConfig, prob } from './helpers.ts';
import { skillSummary } from '../support/skill-summary.ts';

const config = makeConfig();
const issued = (stageId: string): StageHistory => ({
  version: 1,
  tracks: { [trackKey('r1', 'heat', 'weeks')]: { stageId, runsAbove: 0, lowestAboveId: null, runsBelow: 0, highestBelowId: null } },
});

function run(probabilities: LeadProbability[], history: StageHistory = EMPTY_HISTORY, cfg = config, tuned?: Map<TunedKey, number>) {
  return decideStages({ config: cfg, probabilities, history, thresholdsFromCostLoss: tuned });
}

describe('decideStages', () => {
  it('fires the highest rule met and holds it for the first of 2 runs, escalates on the second', () => {
    const probs = [prob('r1', 'weeks', 1, 0.9), prob('r1', 'weeks', 2, 0.64), prob('r1', 'weeks', 3, 0.5)];
    const first = run(probs);
    const d = first.decisions[0];
    expect(d).toMatchObject({
      region: 'r1',
      indicator: 'heat',
      tier: 'weeks',
      rawStageId: 'brace',
      stageId: 'quiet',
      ruleId: 'heat-weeks-brace',
    });
    expect(d.lead?.lead.index).toBe(2); // week 1 (P 0.9) is not a lead of these rules
    expect(d.reasons).toEqual([
      'P(week 2) = 0.64 ≥ 0.4 (rule heat-weeks-mindful) → mindful',
      'P(week 2) = 0.64 ≥ 0.6 (rule heat-weeks-brace) → brace',
      'held at quiet: 1 of 2 runs needed to escalate',
      'issued: quiet',
    ]);
    expect(first.nextHistory.tracks[trackKey('r1', 'heat', 'weeks')]).toEqual({
      stageId: 'quiet',
      runsAbove: 1,
      lowestAboveId: 'brace',
      runsBelow: 0,
      highestBelowId: null,
    });
    const second = run(probs, first.nextHistory);
    expect(second.decisions[0].stageId).toBe('brace');
    expect(second.decisions[0].reasons).toContain('escalated to brace after 2 runs at or above it');
  });

  it('escalates to the lowest raw stage seen in the runs that justified it', () => {
    const a = run([prob('r1', 'weeks', 2, 0.7)]);
    const b = run([prob('r1', 'weeks', 2, 0.45)], a.nextHistory);
    expect(b.decisions[0]).toMatchObject({ rawStageId: 'mindful', stageId: 'mindful' });
  });

  it('a probability exactly at the rule threshold fires (P ≥ p, with 6/10 = 0.6)', () => {
    expect(run([prob('r1', 'weeks', 2, 6 / 10)]).decisions[0].rawStageId).toBe('brace');
    expect(run([prob('r1', 'weeks', 2, 0.59)]).decisions[0].rawStageId).toBe('mindful');
  });

  it('skill gate: a lead whose fair-BSS interval does not lie above 0 cannot raise a stage and is listed (say-no-skill)', () => {
    const probs = [prob('r1', 'weeks', 2, 0.9, -0.05), prob('r1', 'weeks', 3, 0.45, 0.2)];
    const d = run(probs, issued('quiet')).decisions[0];
    expect(d.rawStageId).toBe('mindful');
    expect(d.withheldLeads).toEqual([probs[0].lead]);
    expect(d.reasons[0]).toBe(
      'week 2 withheld: week 2: fair Brier skill score 0.10, 90 % interval -0.05 to 0.25 does not lie above 0 (12 events in 20 years) — no demonstrated skill, treat as normal conditions',
    );
    const noSkill = run([prob('r1', 'weeks', 2, 0.9, null)]).decisions[0];
    expect(noSkill.rawStageId).toBe('quiet');
    expect(noSkill.reasons[0]).toBe('week 2 withheld: no hindcast skill available — no demonstrated skill, treat as normal conditions');
    const silent = run(probs, EMPTY_HISTORY, makeConfig({ skillGate: { ...makeConfig().decision.skillGate, action: 'withhold' } }))
      .decisions[0];
    expect(silent.withheldLeads).toEqual([]);
    expect(silent.rawStageId).toBe('mindful');
  });

  it('a perfect-model ("potential") estimate never raises a stage, however high; too few events neither', () => {
    const potential = { ...prob('r1', 'weeks', 2, 0.9), skill: skillSummary(0.5, { basis: 'potential' }) };
    const d = run([potential]).decisions[0];
    expect(d.rawStageId).toBe('quiet');
    expect(d.reasons[0]).toContain('perfect-model estimate only');
    const few = { ...prob('r1', 'weeks', 2, 0.9), skill: skillSummary(0.5, { events: 3 }) };
    expect(run([few]).decisions[0].rawStageId).toBe('quiet');
    expect(run([{ ...few, skill: skillSummary(0.5, { events: 5 }) }]).decisions[0].rawStageId).toBe('brace');
  });

  it('caps the months tier at mindful', () => {
    const d = run([prob('r1', 'months', 1, 0.9)]).decisions[0];
    expect(d.rawStageId).toBe('mindful');
    expect(d.reasons).toContain('capped at mindful for tier months (rule heat-months-brace gives brace)');
  });

  it('hysteresis: relaxes only after 2 runs below, to the highest stage seen below', () => {
    const a = run([prob('r1', 'weeks', 2, 0.1)], issued('brace'));
    expect(a.decisions[0]).toMatchObject({ rawStageId: 'quiet', stageId: 'brace' });
    expect(a.decisions[0].reasons).toContain('held at brace: 1 of 2 runs below needed to relax');
    const b = run([prob('r1', 'weeks', 3, 0.5)], a.nextHistory);
    expect(b.decisions[0]).toMatchObject({ rawStageId: 'mindful', stageId: 'mindful' });
    expect(b.decisions[0].reasons).toContain('relaxed to mindful after 2 runs below brace');
  });

  it('a run back at the issued stage resets the counters', () => {
    const a = run([prob('r1', 'weeks', 2, 0.1)], issued('brace'));
    const b = run([prob('r1', 'weeks', 2, 0.7)], a.nextHistory);
    expect(b.nextHistory.tracks[trackKey('r1', 'heat', 'weeks')]).toEqual({
      stageId: 'brace',
      runsAbove: 0,
      lowestAboveId: null,
      runsBelow: 0,
      highestBelowId: null,
    });
    const c = run([prob('r1', 'weeks', 2, 0.1)], b.nextHistory);
    expect(c.decisions[0].stageId).toBe('brace');
  });

  it('top stage is issued at once when configured, held otherwise', () => {
    const now = run([prob('r1', 'days', 2, 0.85)]).decisions[0];
    expect(now).toMatchObject({ rawStageId: 'act-now', stageId: 'act-now' });
    expect(now.reasons).toContain('act-now issued at once (top stage, no persistence wait)');
    const waits = run([prob('r1', 'days', 2, 0.85)], EMPTY_HISTORY, makeConfig({ topStageImmediate: false })).decisions[0];
    expect(waits.stageId).toBe('quiet');
  });

  it('combines indicators and tiers per region: highest wins; a region without data is "no forecast available", never the lowest stage', () => {
    const history: StageHistory = {
      version: 1,
      tracks: {
        ...issued('brace').tracks,
        [trackKey('r1', 'heat', 'months')]: { stageId: 'mindful', runsAbove: 0, lowestAboveId: null, runsBelow: 0, highestBelowId: null },
      },
    };
    const result = run([prob('r1', 'months', 1, 0.9), prob('r1', 'weeks', 2, 0.7)], history);
    expect(result.regionStages).toEqual([
      { region: 'r1', stageId: 'brace', fromDecision: { region: 'r1', indicator: 'heat', tier: 'weeks' } },
      { region: 'r2', stageId: NO_FORECAST_ID, fromDecision: null },
    ]);
  });

  it('combines through a matrix: heat (rows) × malaria (columns) → table entry; indicators on no axis still count', () => {
    // Invented matrix: mindful heat with mindful malaria together make brace.
    const table = [
      ['quiet', 'mindful', 'brace', 'act-now'],
      ['mindful', 'brace', 'brace', 'act-now'],
      ['brace', 'brace', 'act-now', 'act-now'],
      ['act-now', 'act-now', 'act-now', 'act-now'],
    ];
    const matrixConfig = makeConfig({ combine: { matrix: { rows: ['heat'], columns: ['malaria'], table } } });
    const decision = (region: string, indicator: string, stageId: string) => ({
      region,
      indicator,
      tier: 'months' as const,
      stageId,
      rawStageId: stageId,
      ruleId: null,
      lead: null,
      withheldLeads: [],
      reasons: [],
    });
    expect(combineRegionStages(matrixConfig, [decision('r1', 'heat', 'mindful'), decision('r1', 'malaria', 'mindful')])).toEqual([
      { region: 'r1', stageId: 'brace', fromDecision: { region: 'r1', indicator: 'heat', tier: 'months' } },
      { region: 'r2', stageId: NO_FORECAST_ID, fromDecision: null },
    ]);
    expect(combineRegionStages(matrixConfig, [decision('r1', 'malaria', 'mindful')])[0].stageId).toBe('mindful');
    // With highest-wins the same inputs give mindful: the matrix is what raises it.
    expect(combineRegionStages(makeConfig(), [decision('r1', 'heat', 'mindful'), decision('r1', 'malaria', 'mindful')])[0].stageId).toBe(
      'mindful',
    );
    const onlyRows = makeConfig({ combine: { matrix: { rows: ['heat'], columns: [], table } } });
    expect(combineRegionStages(onlyRows, [decision('r1', 'malaria', 'brace')])[0]).toMatchObject({
      stageId: 'brace',
      fromDecision: { indicator: 'malaria' },
    });
  });

  it('cost/loss rule: skipped when not tuned, uses the tuned threshold when given', () => {
    const probs = [prob('r1', 'days', 1, 0.35)];
    const untuned = run(probs).decisions[0];
    expect(untuned.rawStageId).toBe('quiet');
    expect(untuned.reasons[0]).toBe(
      'rule heat-days-mindful-cl not tuned (cost/loss 0.2 needs a probability tuned on the hindcasts) — skipped',
    );
    const tuned = run(probs, EMPTY_HISTORY, config, new Map([[tunedKey('r1', 'heat-days-mindful-cl'), 0.3]])).decisions[0];
    expect(tuned.rawStageId).toBe('mindful');
    expect(tuned.reasons[0]).toBe('P(day 1) = 0.35 ≥ 0.3 (rule heat-days-mindful-cl, tuned for cost/loss 0.2) → mindful');
  });

  it('cost/loss thresholds are tuned per region: the same P fires where the tuned threshold is lower only', () => {
    const probs = [prob('r1', 'days', 1, 0.35), prob('r2', 'days', 1, 0.35)];
    const tuned = new Map([
      [tunedKey('r1', 'heat-days-mindful-cl'), 0.3],
      [tunedKey('r2', 'heat-days-mindful-cl'), 0.5],
    ]);
    const decisions = run(probs, EMPTY_HISTORY, config, tuned).decisions;
    expect(decisions.map((d) => [d.region, d.rawStageId])).toEqual([
      ['r1', 'mindful'],
      ['r2', 'quiet'],
    ]);
    expect(decisions[1].reasons[0]).toBe('P(day 1) = 0.35 < 0.5 (rule heat-days-mindful-cl, tuned for cost/loss 0.2) — not fired');
  });

  it('no probabilities: no decision, history track carried over unchanged; history is plain JSON', () => {
    const history = issued('brace');
    const result = run([prob('r2', 'weeks', 2, 0.1)], history);
    expect(result.decisions.map((d) => d.region)).toEqual(['r2']);
    expect(result.nextHistory.tracks[trackKey('r1', 'heat', 'weeks')]).toEqual(history.tracks[trackKey('r1', 'heat', 'weeks')]);
    expect(JSON.parse(JSON.stringify(result.nextHistory))).toEqual(result.nextHistory);
  });
});

describe('parseStageHistory', () => {
  it('round-trips the JSON the ledger stores and rejects foreign shapes', () => {
    const h = run([prob('r1', 'weeks', 2, 0.7)]).nextHistory;
    expect(parseStageHistory(JSON.stringify(h))).toEqual(h);
    expect(parseStageHistory(null)).toEqual(EMPTY_HISTORY);
    expect(() => parseStageHistory('{"v":"a"}')).toThrow('stored stage history is unusable: expected { version: 1, tracks: {...} }');
    expect(() => parseStageHistory('{"version":1,"tracks":[]}')).toThrow(
      'stored stage history is unusable: expected { version: 1, tracks: {...} }',
    );
    expect(() =>
      parseStageHistory(
        '{"version":1,"tracks":{"r1|heat|weeks":{"stageId":"quiet","runsAbove":1.5,"runsBelow":0,"lowestAboveId":null,"highestBelowId":null}}}',
      ),
    ).toThrow(/track "r1\|heat\|weeks" lacks/);
    expect(() => parseStageHistory('{"version":1,"tracks":{"r1|heat|weeks":{"stageId":"quiet"}}}')).toThrow(
      /track "r1\|heat\|weeks" lacks/,
    );
  });
});
