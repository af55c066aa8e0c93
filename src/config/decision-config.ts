/**
 * How stages are set (YAML `stage-ladder`, `trigger-rules`, `escalation`): the ladder, the rules that raise a
 * stage, how indicators combine for a region, persistence and the skill gate. Part of `Config` (types.ts).
 */
import type { Tier } from '../types.ts';

export interface StageConfig {
  readonly id: string;
  readonly label: Readonly<Record<string, string>>;
  readonly colour: string;
  readonly glyph: string;
  /** What the stage means, per locale. */
  readonly meaning: Readonly<Record<string, string>>;
  /** Pre-agreed actions: audience (team id or "default") → locale → text. */
  readonly actions: Readonly<Record<string, Readonly<Record<string, string>>>>;
  /** CAP 1.2 severity and urgency for this stage. */
  readonly cap: {
    readonly severity: 'Extreme' | 'Severe' | 'Moderate' | 'Minor' | 'Unknown';
    readonly urgency: 'Immediate' | 'Expected' | 'Future' | 'Unknown';
  };
}

export interface TriggerRule {
  readonly id: string;
  readonly indicator: string;
  readonly tier: Tier;
  /** Lead indices the rule looks at (e.g. weeks [2, 3]); empty = all. */
  readonly leads: readonly number[];
  /** Stage reached when the rule fires. */
  readonly stage: string;
  /** Fire when P(exceed) >= this; or derive it from costLoss on the hindcasts. */
  readonly probability?: number;
  readonly costLoss?: number;
}

/**
 * A combination matrix: the region's stage is `table[row][column]`, where row is the rank of the highest stage
 * among the `rows` indicators and column the rank of the highest among the `columns` indicators (ranks in the
 * ladder, lowest = 0). Indicators on neither axis still count: the region gets at least their highest stage.
 */
export interface CombineMatrix {
  readonly rows: readonly string[];
  readonly columns: readonly string[];
  readonly table: readonly (readonly string[])[];
}

export interface DecisionConfig {
  /** Highest stage each tier may raise (e.g. months may only reach the second stage). */
  readonly tierCaps: Readonly<Partial<Record<Tier, string>>>;
  /** Runs in a row a higher stage must be seen before escalating. */
  readonly escalateAfterRuns: number;
  /** Runs in a row below before de-escalating. */
  readonly relaxAfterRuns: number;
  /**
   * Runs in a row a region × indicator × tier without usable data keeps its last issued stage (its contribution is
   * held, never relaxed, while data is missing); after that it shows "no forecast available".
   */
  readonly holdMissingRuns: number;
  /** Top stage escalates at once, skipping persistence. */
  readonly topStageImmediate: boolean;
  /** How indicators and tiers combine for a region: the highest stage wins, or a matrix (see CombineMatrix). */
  readonly combine: 'highest' | { readonly matrix: CombineMatrix };
  /** Skill gate (calibrate/skill-gate.ts): a lead may raise a stage only when its pooled window shows skill. */
  readonly skillGate: {
    /** The lower end of the 90 % interval of the fair Brier skill score must exceed this (default 0). */
    readonly floor: number;
    /** Fewest observed events in the pooling window for skill to be judged at all. */
    readonly minEvents: number;
    /** Leads pooled per window, per tier (consecutive blocks: 7 → days 1–7, 8–14, …). */
    readonly poolLeads: Readonly<Record<Tier, number>>;
    /** Year-block bootstrap resamples (at least 1000) and the seed that makes intervals reproducible. */
    readonly resamples: number;
    readonly seed: number;
    readonly action: 'withhold' | 'say-no-skill';
  };
}
