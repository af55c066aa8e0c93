/**
 * backtestRules on a hand-made sequence (one region, heat × weeks, rules mindful P ≥ 0.4 and brace P ≥ 0.6
 * on weeks 2-3, escalate after 2 runs, relax after 2). Expected counts worked out by hand below.
 */
import { describe, expect, it } from 'vitest';
import { eventKey } from '../../src/core/keys.ts';
import { backtestRules, formatBacktest, type BacktestCase } from '../../src/decide/backtest.ts';
import { makeConfig, prob, RULES } from './helpers.ts';

const config = makeConfig(
  {},
  RULES.filter((r) => r.tier === 'weeks'),
);
const week = (year: number, p1: number, p2: number, p3: number, events: Record<number, boolean>): BacktestCase => ({
  startDate: `${year}-11-26`,
  // Skill null: the gate would withhold every lead, but backtests ignore it by default.
  probabilities: [prob('r1', 'weeks', 1, p1, null), prob('r1', 'weeks', 2, p2, null), prob('r1', 'weeks', 3, p3, null)],
  observedEvents: new Map(Object.entries(events).map(([lead, v]) => [eventKey('r1', 'heat', 'weeks', Number(lead)), v])),
});

// year  P(w1,w2,w3)      raw      persistence                      issued   event (weeks 2-3 only)  outcome
// 2001  0.9 0.7 0.5      brace    1 of 2 runs to escalate          quiet    w2 yes                  miss
// 2002  0.0 0.65 0.0     brace    2 runs ≥ brace → escalate        brace    w3 yes                  hit
// 2003  0.1 0.1 0.2      quiet    1 of 2 runs to relax             brace    none                    false alarm
// 2004  0.0 0.0 0.45     mindful  2 runs below, highest mindful    mindful  w1 yes (not covered)    false alarm
// 2005  0.0 0.0 0.0      quiet    1 of 2 runs to relax             mindful  no observation          unverified
// 2006  0.0 0.0 0.0      quiet    2 runs below → relax to quiet    quiet    none                    correct negative
// Stages: quiet 2, mindful 2, brace 2, act-now 0; hits 1, misses 1, false alarms 2, correct negatives 1, unverified 1.
const CASES: BacktestCase[] = [
  week(2004, 0, 0, 0.45, { 1: true, 2: false, 3: false }),
  week(2001, 0.9, 0.7, 0.5, { 2: true, 3: false }),
  week(2006, 0, 0, 0, { 2: false, 3: false }),
  week(2003, 0.1, 0.1, 0.2, { 2: false, 3: false }),
  week(2002, 0, 0.65, 0, { 2: false, 3: true }),
  week(2005, 0, 0, 0, {}),
];

describe('backtestRules', () => {
  const rows = backtestRules(config, CASES);

  it('replays with persistence in start-date order and counts stages and outcomes', () => {
    expect(rows).toEqual([
      {
        region: 'r1',
        indicator: 'heat',
        tier: 'weeks',
        cases: 6,
        stageCounts: { quiet: 2, mindful: 2, brace: 2, 'act-now': 0 },
        hits: 1,
        misses: 1,
        falseAlarms: 2,
        correctNegatives: 1,
        unverified: 1,
      },
    ]);
  });

  it('applying the skill gate withholds every lead without skill (all quiet)', () => {
    const gated = backtestRules(config, CASES, { skillGate: 'apply' });
    expect(gated[0].stageCounts).toEqual({ quiet: 6, mindful: 0, brace: 0, 'act-now': 0 });
  });

  it('formats as CSV and aligned text', () => {
    expect(formatBacktest(rows, 'csv')).toBe(
      'region,indicator,tier,cases,quiet,mindful,brace,act-now,hits,misses,false_alarms,correct_negatives,unverified\n' +
        'r1,heat,weeks,6,2,2,2,0,1,1,2,1,1\n',
    );
    const text = formatBacktest(rows, 'text').split('\n');
    expect(text[0]).toBe(
      'region  indicator  tier   cases  quiet  mindful  brace  act-now  hits  misses  false_alarms  correct_negatives  unverified',
    );
    expect(text[1]).toBe(
      'r1      heat       weeks      6      2        2      2        0     1       1             2                  1           1',
    );
  });
});
