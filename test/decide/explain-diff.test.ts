/** explainDecision (numbers, no secrets) and diffStages (changes between runs). */
import { afterEach, describe, expect, it } from 'vitest';
import { decideStages } from '../../src/decide/decide-stages.ts';
import { diffStages } from '../../src/decide/diff.ts';
import { explainDecision } from '../../src/decide/explain.ts';
import { EMPTY_HISTORY } from '../../src/decide/types.ts';
import { makeConfig, prob } from './helpers.ts';

const config = makeConfig();

describe('explainDecision', () => {
  afterEach(() => {
    delete process.env.FORELIGHT_TEST_SMTP_PASSWORD;
  });

  it('shows values, threshold, probability, base rate, skill, rule, persistence and stage', () => {
    const probabilities = [prob('r1', 'weeks', 2, 0.64), prob('r1', 'weeks', 3, 0.3, -0.1)];
    const { decisions } = decideStages({ config, probabilities, history: EMPTY_HISTORY });
    const lines = explainDecision({
      config,
      decision: decisions[0],
      probabilities,
      values: new Map([[2, { min: 36.1, median: 39.6, max: 42.25, units: 'degC' }]]),
    });
    expect(lines).toEqual([
      'Region One · Heat · weeks',
      'threshold: 39 degC — absolute threshold from the configuration',
      'week 2 (2026-12-02..2026-12-02): values min 36.1 / median 39.6 / max 42.25 degC; P(> threshold) = 0.64 from 10/10 members, base rate 0.1; skill BSS 0.23, fair BSS 0.25, ROC area 0.8 (observed, 12 events in 20 years); gate week 2: fair Brier skill score 0.25, 90 % interval 0.10 to 0.40 above 0 (12 events in 20 years)',
      'week 3 (2026-12-03..2026-12-03): P(> threshold) = 0.3 from 10/10 members, base rate 0.1; skill BSS 0.03, fair BSS 0.05, ROC area 0.8 (observed, 12 events in 20 years); gate week 3: fair Brier skill score 0.05, 90 % interval -0.10 to 0.20 does not lie above 0 (12 events in 20 years) — skill not demonstrated, cannot raise a stage',
      'persistence before this run: no previous run recorded (starts from the lowest stage)',
      '· week 3 withheld: week 3: fair Brier skill score 0.05, 90 % interval -0.10 to 0.20 does not lie above 0 (12 events in 20 years) — no demonstrated skill, treat as normal conditions',
      '· P(week 2) = 0.64 ≥ 0.4 (rule heat-weeks-mindful) → mindful',
      '· P(week 2) = 0.64 ≥ 0.6 (rule heat-weeks-brace) → brace',
      '· held at quiet: 1 of 2 runs needed to escalate',
      '· issued: quiet',
      'raw stage ◑ brace (brace) from rule heat-weeks-brace; issued stage ○ quiet (quiet)',
    ]);
  });

  it('never contains the SMTP password or its variable name', () => {
    process.env.FORELIGHT_TEST_SMTP_PASSWORD = 'hunter2-very-secret';
    const probabilities = [prob('r1', 'days', 1, 0.9)];
    const { decisions } = decideStages({ config, probabilities, history: EMPTY_HISTORY });
    const text = explainDecision({ config, decision: decisions[0], probabilities }).join('\n');
    expect(text).toContain('act-now');
    expect(text).not.toContain('hunter2');
    expect(text).not.toContain('FORELIGHT_TEST_SMTP_PASSWORD');
  });
});

describe('diffStages', () => {
  it('lists regions whose stage changed with the deciding reasons, and regions that disappeared', () => {
    const probabilities = [prob('r1', 'days', 2, 0.85), prob('r2', 'weeks', 2, 0.1)];
    const { decisions, regionStages } = decideStages({ config, probabilities, history: EMPTY_HISTORY });
    const changes = diffStages(
      [
        { region: 'r1', stageId: 'mindful' },
        { region: 'r2', stageId: 'quiet' },
        { region: 'gone', stageId: 'brace' },
      ],
      regionStages,
      decisions,
    );
    expect(changes).toEqual([
      {
        region: 'r1',
        from: 'mindful',
        to: 'act-now',
        why: 'heat days; P(day 2) = 0.85 ≥ 0.6 (rule heat-days-brace) → brace; P(day 2) = 0.85 ≥ 0.8 (rule heat-days-act-now) → act-now; act-now issued at once (top stage, no persistence wait)',
      },
      { region: 'gone', from: 'brace', to: null, why: 'region not in this run' },
    ]);
  });
});
