/**
 * Plain-text explanation of one decision: inputs → threshold → probability and base rate → skill → rule →
 * persistence → stage, with the numbers. Reads only the decision, the probabilities and the ladder.
 */
import type { StageDecision } from '../decision-types.ts';
import type { LeadProbability } from '../probability-types.ts';
import { leadName } from '../calibrate/lead-tiers.ts';
import { stageTitle, type DecideConfig, type StageTrack } from './types.ts';

/** Summary of the ensemble values at one lead, as computed by the caller. */
export interface EnsembleSummary {
  readonly min: number;
  readonly median: number;
  readonly max: number;
  readonly units: string;
}

export interface ExplainInput {
  readonly config: DecideConfig;
  readonly decision: StageDecision;
  /** Probabilities of this run; those of other region × indicator × tier are ignored. */
  readonly probabilities: readonly LeadProbability[];
  /** Persistence track before this run (undefined: no history). */
  readonly previous?: StageTrack;
  /** Lead index → ensemble values summary. */
  readonly values?: ReadonlyMap<number, EnsembleSummary>;
}

const n = (v: number) => (Number.isFinite(v) ? String(+v.toFixed(2)) : 'n/a');

function trackText(t: StageTrack | undefined): string {
  if (!t) return 'no previous run recorded (starts from the lowest stage)';
  const parts = [`issued ${t.stageId}`];
  if (t.runsAbove > 0) parts.push(`${t.runsAbove} run(s) above, lowest ${t.lowestAboveId}`);
  if (t.runsBelow > 0) parts.push(`${t.runsBelow} run(s) below, highest ${t.highestBelowId}`);
  return parts.join('; ');
}

export function explainDecision(input: ExplainInput): string[] {
  const { config, decision: d } = input;
  const label = (id: string) => `${stageTitle(config.stages, id)} (${id})`;
  const region = config.regions.find((r) => r.id === d.region)?.name ?? d.region;
  const indicator = config.indicators.find((i) => i.id === d.indicator)?.name ?? d.indicator;
  const lines = [`${region} · ${indicator} · ${d.tier}`];
  const probs = input.probabilities
    .filter((p) => p.region === d.region && p.indicator === d.indicator && p.lead.tier === d.tier)
    .sort((a, b) => a.lead.index - b.lead.index);
  const first = probs[0];
  if (first)
    lines.push(
      `threshold: ${n(first.threshold.value)} ${first.threshold.units} — ${first.threshold.origin}${first.calibrated ? '' : ' (not calibrated on hindcasts)'}`,
    );
  for (const p of probs) {
    const v = input.values?.get(p.lead.index);
    const values = v ? `values min ${n(v.min)} / median ${n(v.median)} / max ${n(v.max)} ${v.units}; ` : '';
    const skill = p.skill
      ? `skill BSS ${n(p.skill.brierSkillScore)}, fair BSS ${n(p.skill.fairBrierSkillScore)}, ROC area ${n(p.skill.rocArea)} (${p.skill.basis}, ${p.skill.events} events in ${p.skill.years} years); gate ${p.skill.gate.text}`
      : 'skill unknown';
    const gated = !p.skill?.skilful ? ' — skill not demonstrated, cannot raise a stage' : '';
    const flags = p.flags.length > 0 ? `; flags: ${p.flags.join(', ')}` : '';
    lines.push(
      `${leadName(p.lead.tier, p.lead.index)} (${p.lead.start}..${p.lead.end}): ${values}P(> threshold) = ${n(p.probability)} from ${p.validMembers}/${p.members} members, base rate ${n(p.baseRate)}; ${skill}${gated}${flags}`,
    );
  }
  if (probs.length === 0) lines.push('no probabilities for this region, indicator and tier');
  lines.push(`persistence before this run: ${trackText(input.previous)}`);
  for (const r of d.reasons) lines.push(`· ${r}`);
  lines.push(`raw stage ${label(d.rawStageId)}${d.ruleId ? ` from rule ${d.ruleId}` : ''}; issued stage ${label(d.stageId)}`);
  return lines;
}
