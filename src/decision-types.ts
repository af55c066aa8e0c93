/**
 * Boundary types of the decide stage's output (decide → render, and the ledger): the stage of one region ×
 * indicator × tier, with its reasons and how each lead took part.
 */
import type { LeadWindow, Tier } from './types.ts';
import type { LeadProbability } from './probability-types.ts';

/** Output of the decide stage: the stage for one region × indicator × tier, with the reasons. */
export interface StageDecision {
  readonly region: string;
  readonly indicator: string;
  readonly tier: Tier;
  /** Stage id from the ladder. */
  readonly stageId: string;
  /** Stage that the probabilities alone would give before persistence/hysteresis. */
  readonly rawStageId: string;
  readonly ruleId: string | null;
  /** The lead that set the stage (highest), if any. */
  readonly lead: LeadProbability | null;
  /** Leads withheld by the skill gate. */
  readonly withheldLeads: readonly LeadWindow[];
  /**
   * Per usable lead of the rules, the highest stage its probability reaches by the rules alone (before the tier cap
   * and persistence); leads that no rule looks at, or the skill gate withheld, are absent. Lets the bulletin say why
   * a high chance did not raise the stage.
   */
  readonly leadStages?: readonly { readonly index: number; readonly stageId: string }[];
  /** Human-readable chain of reasons, in order. */
  readonly reasons: readonly string[];
  /**
   * Set when this region × indicator × tier had no usable data this run: why, how many runs in a row, and whether
   * the last issued stage is held (`stageId` is then that stage) or the hold expired (`stageId` is "no-forecast").
   */
  readonly missing?: { readonly reason: string; readonly runs: number; readonly held: boolean };
  /** Set when the rules' stage was above the tier cap: the cap applied and the stage the rules gave. */
  readonly cap?: { readonly stageId: string; readonly uncappedId: string };
  /**
   * Set when persistence issued another stage than the (capped) rules gave: waiting to raise towards `towardsId`
   * or to lower, after `runs` of the `needed` bulletins in a row.
   */
  readonly wait?: PersistenceWait;
  /** How each lead of the tier took part in the stage, lead 1 first (decide/lead-use.ts). */
  readonly leadUses?: readonly LeadUse[];
}

/** Persistence holding the issued stage against the rules (decide/persistence.ts). */
export interface PersistenceWait {
  readonly direction: 'raise' | 'lower';
  /** The stage the rules point to. */
  readonly towardsId: string;
  /** Consecutive runs so far (this one included) and runs needed before the stage moves. */
  readonly runs: number;
  readonly needed: number;
  /** Set when persistence raised the issued stage in this run, from this stage; the rest of the way still waits. */
  readonly raisedFromId?: string;
}

/**
 * How one lead took part in its tier's stage: `sets-stage` = its probability set the issued stage; `counted` = used
 * by the rules, pointing to no stage above the issued one; `no-skill` = withheld by the skill gate (no demonstrated
 * skill); `no-rule` = no trigger rule of the tier looks at this lead; `no-value` = no probability; `no-contrast` = held because its threshold cannot tell the forecast
 * from a normal year (flag threshold-degenerate, src/calibrate/degenerate-threshold.ts); `capped` = the rules
 * give a stage above the tier cap; `awaiting` = it points above the issued stage, which waits for confirmation in the
 * next run(s) (persistence).
 */
export type LeadUseKind = 'sets-stage' | 'counted' | 'no-skill' | 'no-rule' | 'no-value' | 'no-contrast' | 'capped' | 'awaiting';

export interface LeadUse {
  readonly index: number;
  readonly kind: LeadUseKind;
  /** Stage its probability reaches by the rules alone (before cap and persistence); lowest when not used. */
  readonly reachedId: string;
  /** The stage it supports after the tier cap (= reachedId without a cap). */
  readonly supportsId: string;
}
