/**
 * The stage a single lead's probability reaches under the configured probability rules — what a chart marker,
 * an outlook cell or a row of the short table shows for that lead. Display only: the issued stage of a tier is
 * the decide stage's, after skill gate, caps and persistence. A lead that decided its tier (also through a
 * cost/loss rule, whose probability is tuned at run time) reaches at least the tier's raw stage.
 */
import type { LeadProbability } from '../probability-types.ts';
import type { TierOutcome, RenderConfig } from './model.ts';

/** Ladder rank (0 = lowest) reached by `p` at its lead. NaN probabilities reach the lowest rank. */
export function reachedRank(config: RenderConfig, tier: TierOutcome, p: LeadProbability): number {
  let rank = 0;
  if (Number.isFinite(p.probability)) {
    config.stages.forEach((s, r) => {
      const fires = config.rules.some(
        (rule) =>
          rule.indicator === tier.indicator.id &&
          rule.tier === tier.tier &&
          rule.stage === s.id &&
          rule.probability !== undefined &&
          p.probability >= rule.probability &&
          (rule.leads.length === 0 || rule.leads.includes(p.lead.index)),
      );
      if (fires && r > rank) rank = r;
    });
  }
  const decided = tier.decision.lead;
  if (decided && decided.lead.index === p.lead.index) {
    rank = Math.max(
      rank,
      config.stages.findIndex((s) => s.id === tier.decision.rawStageId),
    );
  }
  return rank;
}

/** Rules with a fixed probability for one indicator × tier, each with the leads it applies to (empty = all). */
export function probabilityLines(
  config: RenderConfig,
  indicator: string,
  tierName: TierOutcome['tier'],
): { probability: number; rank: number; leads: readonly number[] }[] {
  return config.rules
    .filter((r) => r.indicator === indicator && r.tier === tierName)
    .flatMap((r) =>
      r.probability === undefined
        ? []
        : [{ probability: r.probability, rank: config.stages.findIndex((s) => s.id === r.stage), leads: r.leads }],
    );
}
