/**
 * Raw stage of one region × indicator × tier from its lead probabilities: skill gate, trigger rules
 * (P ≥ probability at a listed lead; cost/loss rules use the threshold tuned on the hindcasts), tier cap.
 */
import type { Config } from '../config/types.ts';
import type { LeadWindow, Tier } from '../types.ts';
import type { LeadProbability } from '../probability-types.ts';
import { tunedKey, type TunedKey } from '../core/keys.ts';
import { leadName } from '../calibrate/lead-tiers.ts';
import { stageRank } from './types.ts';

/** Probabilities are counts/members; a tolerance keeps 0.6 from failing "≥ 0.6" through rounding. */
const P_TOLERANCE = 1e-9;

export interface RawStage {
  readonly rawStageId: string;
  readonly ruleId: string | null;
  readonly lead: LeadProbability | null;
  readonly withheldLeads: readonly LeadWindow[];
  /** See StageDecision.leadStages. */
  readonly leadStages: readonly { readonly index: number; readonly stageId: string }[];
  /** Leads the skill gate let through (all leads with a probability when the gate is ignored). */
  readonly skilfulLeads: readonly number[];
  /** Set when the tier cap lowered the rules' stage. */
  readonly cap: { readonly stageId: string; readonly uncappedId: string } | null;
  readonly reasons: readonly string[];
}

const fmt = (v: number) => String(+v.toFixed(3));

/** The parts of the configuration the rules read. */
export type RulesConfig = Pick<Config, 'stages' | 'rules'> & { readonly decision: Pick<Config['decision'], 'skillGate' | 'tierCaps'> };

export interface RuleTrack {
  readonly region: string;
  readonly indicator: string;
  readonly tier: Tier;
  /** The track's lead probabilities (any order). */
  readonly probabilities: readonly LeadProbability[];
  /** tunedKey(region, rule id) → probability threshold tuned for rules that give cost-loss. */
  readonly tuned: ReadonlyMap<TunedKey, number>;
  /** "ignore" only for backtests on the hindcasts the skill was measured on. */
  readonly skillGate: 'apply' | 'ignore';
}

/**
 * Leads that may raise a stage, and the reasons for those that may not: the skill gate's verdict on each lead's
 * pooling window (calibrate/skill-gate.ts: observed skill, enough events, 90 % interval of the fair Brier skill
 * score above the floor). A perfect-model estimate never passes.
 */
function applySkillGate(
  config: RulesConfig,
  probs: readonly LeadProbability[],
  reasons: string[],
): { usable: LeadProbability[]; withheld: LeadWindow[] } {
  const usable: LeadProbability[] = [];
  const withheld: LeadWindow[] = [];
  for (const p of probs) {
    if (p.skill?.skilful) {
      usable.push(p);
      continue;
    }
    const why = p.skill ? p.skill.gate.text : 'no hindcast skill available';
    reasons.push(`${leadName(p.lead.tier, p.lead.index)} withheld: ${why} — no demonstrated skill, treat as normal conditions`);
    if (config.decision.skillGate.action === 'say-no-skill') withheld.push(p.lead);
  }
  return { usable, withheld };
}

export function evaluateRules(config: RulesConfig, track: RuleTrack): RawStage {
  const { region, indicator, tier, probabilities, tuned, skillGate } = track;
  const rank = (id: string) => stageRank(config.stages, id);
  const reasons: string[] = [];
  const probs = [...probabilities].filter((p) => Number.isFinite(p.probability)).sort((a, b) => a.lead.index - b.lead.index);
  const { usable, withheld } = skillGate === 'apply' ? applySkillGate(config, probs, reasons) : { usable: probs, withheld: [] };

  let best: { rank: number; ruleId: string; lead: LeadProbability } | null = null;
  const perLead = new Map<number, number>(); // lead index → highest rank its probability reaches by the rules
  for (const rule of config.rules) {
    if (rule.indicator !== indicator || rule.tier !== tier) continue;
    const threshold = rule.probability ?? tuned.get(tunedKey(region, rule.id));
    if (threshold === undefined) {
      reasons.push(`rule ${rule.id} not tuned (cost/loss ${rule.costLoss} needs a probability tuned on the hindcasts) — skipped`);
      continue;
    }
    const origin = rule.probability === undefined ? `, tuned for cost/loss ${rule.costLoss}` : '';
    const leads = usable.filter((p) => rule.leads.length === 0 || rule.leads.includes(p.lead.index));
    for (const p of leads) {
      const reached = p.probability >= threshold - P_TOLERANCE ? rank(rule.stage) : 0;
      perLead.set(p.lead.index, Math.max(perLead.get(p.lead.index) ?? 0, reached));
    }
    if (leads.length === 0) {
      reasons.push(
        `rule ${rule.id}: no usable lead among ${rule.leads.length === 0 ? 'all leads' : rule.leads.map((l) => leadName(tier, l)).join(', ')}`,
      );
      continue;
    }
    // The lead with the highest probability speaks for the rule (earliest lead on ties).
    const top = leads.reduce((a, b) => (b.probability > a.probability ? b : a));
    const name = `P(${leadName(tier, top.lead.index)}) = ${fmt(top.probability)}`;
    if (top.probability >= threshold - P_TOLERANCE) {
      reasons.push(`${name} ≥ ${fmt(threshold)} (rule ${rule.id}${origin}) → ${rule.stage}`);
      const r = rank(rule.stage);
      if (!best || r > best.rank) best = { rank: r, ruleId: rule.id, lead: top };
    } else {
      reasons.push(`${name} < ${fmt(threshold)} (rule ${rule.id}${origin}) — not fired`);
    }
  }

  const lowest = config.stages[0].id;
  const leadStages = [...perLead].sort((a, b) => a[0] - b[0]).map(([index, r]) => ({ index, stageId: config.stages[r].id }));
  const common = { withheldLeads: withheld, leadStages, skilfulLeads: usable.map((p) => p.lead.index) };
  if (!best) {
    reasons.push(`no rule fired → ${lowest}`);
    return { rawStageId: lowest, ruleId: null, lead: null, ...common, cap: null, reasons };
  }
  const uncappedId = config.stages[best.rank].id;
  const cap = config.decision.tierCaps[tier];
  if (cap !== undefined && best.rank > rank(cap)) {
    reasons.push(`capped at ${cap} for tier ${tier} (rule ${best.ruleId} gives ${uncappedId})`);
    return { rawStageId: cap, ruleId: best.ruleId, lead: best.lead, ...common, cap: { stageId: cap, uncappedId }, reasons };
  }
  return { rawStageId: uncappedId, ruleId: best.ruleId, lead: best.lead, ...common, cap: null, reasons };
}
