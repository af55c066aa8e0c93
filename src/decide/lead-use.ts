/**
 * How each lead of a region × indicator × tier took part in its issued stage (pure), so that the bulletin can say
 * in words why a row with a high chance did not set the stage: no demonstrated skill (skill gate), no trigger rule
 * looks at it, capped for this lead range (tier cap), or waiting for confirmation in the next run (persistence).
 * Built from the typed results of the rules and of persistence, never from their texts.
 */
import type { StageConfig } from '../config/decision-config.ts';
import type { LeadUse, LeadUseKind, PersistenceWait } from '../decision-types.ts';
import type { LeadProbability } from '../probability-types.ts';
import { stageRank } from './types.ts';

export interface LeadUseInput {
  /** The tier's lead probabilities (any order). */
  readonly probabilities: readonly LeadProbability[];
  /** Per lead, the highest stage its probability reaches by the rules (RawStage.leadStages). */
  readonly leadStages: readonly { readonly index: number; readonly stageId: string }[];
  /** Leads the skill gate let through. */
  readonly skilfulLeads: readonly number[];
  /** The tier cap that applied, if any. */
  readonly capId: string | null;
  /** The lead that set the rules' stage, if any. */
  readonly decidingIndex: number | null;
  /** The stage issued after persistence, and persistence's wait when it differs from the rules. */
  readonly issuedId: string;
  readonly wait?: PersistenceWait;
}

/** One LeadUse per lead, lead 1 first. */
export function leadUses(stages: readonly StageConfig[], input: LeadUseInput): LeadUse[] {
  const rank = (id: string) => stageRank(stages, id);
  const lowest = stages[0].id;
  const issued = rank(input.issuedId);
  const skilful = new Set(input.skilfulLeads);
  const reachedBy = new Map(input.leadStages.map((l) => [l.index, l.stageId]));
  return [...input.probabilities]
    .sort((a, b) => a.lead.index - b.lead.index)
    .map((p): LeadUse => {
      const index = p.lead.index;
      const unused = (kind: LeadUseKind): LeadUse => ({ index, kind, reachedId: lowest, supportsId: lowest });
      // Flags start with their code word (src/calibrate/probability.ts).
      if (p.flags.some((f) => f.startsWith('threshold-degenerate:'))) return unused('no-contrast');
      if (!Number.isFinite(p.probability)) return unused('no-value');
      if (!skilful.has(index)) return unused('no-skill');
      const reachedId = reachedBy.get(index);
      if (reachedId === undefined) return unused('no-rule');
      const capped = input.capId !== null && rank(reachedId) > rank(input.capId);
      const supportsId = capped && input.capId !== null ? input.capId : reachedId;
      const supports = rank(supportsId);
      const kind: LeadUseKind =
        supports > issued && input.wait?.direction === 'raise'
          ? 'awaiting'
          : capped
            ? 'capped'
            : index === input.decidingIndex && supports === issued
              ? 'sets-stage'
              : 'counted';
      return { index, kind, reachedId, supportsId };
    });
}
