/**
 * Semantic checks on the stage ladder and trigger rules: one threshold form per rule, monotonic
 * probabilities up the ladder, rules that cannot raise anything, tier caps, and CAP severity order.
 */
import { ids, list, num, obj, text, type RawObject } from './raw-access.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';

const SEVERITY_ORDER = ['Minor', 'Moderate', 'Severe', 'Extreme'];

interface RuleView {
  readonly index: number;
  readonly id: string;
  readonly indicator?: string;
  readonly tier?: string;
  readonly leads: readonly number[];
  readonly stageRank: number;
  readonly stage?: string;
  readonly probability?: number;
}

function leadsOverlap(a: readonly number[], b: readonly number[]): boolean {
  return a.length === 0 || b.length === 0 || a.some((l) => b.includes(l));
}

export function checkRules(raw: RawObject): ConfigProblem[] {
  const out: ConfigProblem[] = [];
  const stageIds = ids(raw['stage-ladder']);
  const rank = (s: string | undefined) => (s === undefined ? -1 : stageIds.indexOf(s));
  const caps = obj(obj(raw.escalation)['tier-caps']);

  const rules: RuleView[] = list(raw['trigger-rules']).map((r, index) => {
    const o = obj(r);
    const hasP = o.probability !== undefined;
    const hasCL = o['cost-loss'] !== undefined;
    const at = pointerOf('trigger-rules', index);
    if (hasP === hasCL) {
      out.push(
        problem(
          at,
          hasP ? 'rule gives both probability and cost-loss' : 'rule gives neither probability nor cost-loss',
          'keep exactly one: probability (fixed) or cost-loss (tuned on the hindcasts)',
        ),
      );
    }
    const stage = text(o.stage);
    const tier = text(o.tier);
    const stageRank = rank(stage);
    if (stageRank === 0)
      out.push(
        problem(
          pointerOf('trigger-rules', index, 'stage'),
          `rule raises the lowest stage "${stage}", which is never raised`,
          'name a higher stage or delete the rule',
        ),
      );
    const cap = tier !== undefined ? text(caps[tier]) : undefined;
    if (cap !== undefined && stageRank > rank(cap) && rank(cap) >= 0) {
      out.push(
        problem(
          pointerOf('trigger-rules', index, 'stage'),
          `rule raises ${stage} but tier ${tier} is capped at ${cap}`,
          `lower the rule's stage to ${cap} or raise the cap in escalation.tier-caps`,
        ),
      );
    }
    return {
      index,
      id: text(o.id) ?? `#${index + 1}`,
      indicator: text(o.indicator),
      tier,
      leads: list(o.leads).filter((l): l is number => typeof l === 'number'),
      stageRank,
      stage,
      probability: hasCL ? undefined : num(o.probability),
    };
  });

  // Monotonic thresholds: on the same indicator × tier with overlapping leads, a higher stage must need a
  // strictly higher probability; otherwise the lower stage is never issued alone (or the ladder is inverted).
  for (const hi of rules) {
    for (const lo of rules) {
      if (hi.stageRank <= lo.stageRank || lo.stageRank < 0 || hi.probability === undefined || lo.probability === undefined) continue;
      if (hi.indicator !== lo.indicator || hi.tier !== lo.tier || !leadsOverlap(hi.leads, lo.leads)) continue;
      if (hi.probability <= lo.probability) {
        out.push(
          problem(
            pointerOf('trigger-rules', hi.index, 'probability'),
            `rule ${hi.id} raises ${hi.stage} at P ≥ ${hi.probability}, not above rule ${lo.id} (${lo.stage}) at P ≥ ${lo.probability} on the same indicator, tier and leads`,
            `give the higher stage a higher probability than ${lo.probability}`,
          ),
        );
      }
    }
  }

  let highest = -1;
  let highestStage = '';
  list(raw['stage-ladder']).forEach((s, i) => {
    const sev = text(obj(obj(s).cap).severity);
    const r = sev === undefined ? -1 : SEVERITY_ORDER.indexOf(sev);
    if (r < 0) return;
    if (r < highest) {
      out.push(
        problem(
          pointerOf('stage-ladder', i, 'cap', 'severity'),
          `CAP severity ${sev} is lower than ${SEVERITY_ORDER[highest]} of the lower stage ${highestStage}`,
          'order stages lowest first and give higher stages an equal or higher severity',
        ),
      );
    } else {
      highest = r;
      highestStage = text(obj(s).id) ?? `#${i + 1}`;
    }
  });

  return out;
}
