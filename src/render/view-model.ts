/**
 * Building blocks of what templates print for one locale and audience: leads and their short groups,
 * labels, dates and percentages already formatted. Sentences come from the message catalogue (`t`); this module
 * picks which message applies and supplies the numbers. Stages are in `stage-view.ts`, region assembly in `region-view.ts`.
 */
import type { Tier } from '../types.ts';
import type { LeadUse, LeadUseKind } from '../decision-types.ts';
import type { LeadProbability, SkillSummary } from '../probability-types.ts';
import { ForelightError } from '../core/errors.ts';
import type { Translate } from './catalogue.ts';
import { formatDayRange, formatNumber, formatPercent } from './locale-format.ts';
import type { RenderConfig, TierOutcome } from './model.ts';
import { reachedRank } from './reached-stage.ts';
import { pickLocale, type StageView } from './stage-view.ts';
import { leadUses } from '../decide/lead-use.ts';

export const TIERS: readonly Tier[] = ['days', 'weeks', 'months'];

/**
 * How sure a lead is, from its skill figures (message `sure.<level>`): 'few' = too few observed events to judge;
 * 'none' = skill not shown (or a perfect-model estimate only).
 */
export type SureLevel = 'high' | 'medium' | 'low' | 'none' | 'few' | 'unchecked';

export interface LeadView {
  readonly tier: Tier;
  readonly index: number;
  readonly start: string;
  readonly end: string;
  readonly dates: string;
  /** Exceedance probability 0..1 (NaN when missing), for ordering; printed as `chance`. */
  readonly probability: number;
  readonly chance: string;
  readonly normal: string;
  readonly word: string;
  /** Stage this lead's probability reaches under the probability rules (lowest for a withheld lead). */
  readonly reached: StageView;
  readonly sure: SureLevel;
  readonly potential: boolean;
  /**
   * Fair Brier skill score formatted for the locale ('' when there is none), with its 90 % interval: of the skill
   * gate's pooling window when verified against observations, of the lead alone (no interval) for a
   * perfect-model estimate.
   */
  readonly score: string;
  readonly low: string;
  readonly high: string;
  /** Independent past cases (hindcast years) and observed events behind the score. */
  readonly years: number;
  readonly events: number;
  readonly deciding: boolean;
  readonly withheld: boolean;
  /** How the lead took part in its tier's stage (decide's LeadUse), and in words why when it did not set it ('' when it counts). */
  readonly use: LeadUseKind;
  readonly note: string;
  /** The threshold of this lead in plain words, and its value in the indicator's units. */
  readonly threshold: string;
  readonly thresholdValue: number;
  readonly flags: readonly string[];
}

/** Consecutive leads that reach the same stage with the same confidence, merged into one row. */
export interface LeadGroup {
  readonly dates: string;
  readonly reached: StageView;
  readonly chance: string;
  readonly normal: string;
  readonly noSkill: boolean;
  readonly deciding: boolean;
  /** Why these leads did not set the stage ('' when they count towards it). */
  readonly note: string;
}

/** Word for a probability from `config.probabilityWords` (first band whose `below` exceeds p; else the last); '–' for NaN. */
export function probabilityWord(config: RenderConfig, p: number, locale: string): string {
  if (!Number.isFinite(p)) return '–';
  const bands = config.probabilityWords;
  if (bands.length === 0)
    throw new ForelightError(
      'render',
      'no-probability-words',
      'probability-words is empty',
      'add probability word bands under probability-words: in the config YAML',
    );
  const band = bands.find((b) => p < b.below) ?? bands[bands.length - 1];
  return pickLocale(band.words, locale, `probability word band below ${band.below}`);
}

/**
 * Confidence level from the skill gate's verdict (calibrate/skill-gate.ts): only a passed gate (observed skill,
 * enough events, 90 % interval of the fair BSS above the floor) gives high/medium/low, by the pooled fair BSS with
 * cut points 0.3 and 0.1 (common practice, no source; 0 = no better than the normal-year frequency).
 */
export function sureLevel(skill: SkillSummary | null): SureLevel {
  if (!skill) return 'unchecked';
  if (!skill.skilful) return skill.gate.reason === 'few-events' ? 'few' : 'none';
  const score = skill.gate.fairBrierSkillScore;
  return score >= 0.3 ? 'high' : score >= 0.1 ? 'medium' : 'low';
}

/** One plain sentence on how sure a lead is (message `sure.<level>`, plus `sure.potential` for model-only skill). */
export function sureSentence(
  t: Translate,
  lead: Pick<LeadView, 'sure' | 'years' | 'events' | 'score' | 'low' | 'high' | 'potential'>,
): string {
  const main = t(`sure.${lead.sure}`, { years: lead.years, events: lead.events, score: lead.score, low: lead.low, high: lead.high });
  return lead.potential ? `${main} ${t('sure.potential', { score: lead.score, years: lead.years })}` : main;
}

/**
 * How each lead of a tier took part in its stage: the decision's own leadUses, or — for a decision built without them
 * (hand-made, or stored before they existed) — decide's rule applied to what the decision does carry.
 */
export function tierLeadUses(config: RenderConfig, outcome: TierOutcome): readonly LeadUse[] {
  const d = outcome.decision;
  if (d.leadUses) return d.leadUses;
  const withheld = new Set(d.withheldLeads.filter((w) => w.tier === outcome.tier).map((w) => w.index));
  const finite = outcome.probabilities.filter((p) => Number.isFinite(p.probability));
  return leadUses(config.stages, {
    probabilities: outcome.probabilities,
    leadStages: d.leadStages ?? finite.map((p) => ({ index: p.lead.index, stageId: config.stages[reachedRank(config, outcome, p)].id })),
    skilfulLeads: finite.filter((p) => !withheld.has(p.lead.index)).map((p) => p.lead.index),
    capId: d.cap?.stageId ?? null,
    decidingIndex: d.lead?.lead.index ?? null,
    issuedId: d.stageId,
    wait: d.wait,
  });
}

/** Why a lead did not set its tier's stage, in words ('' when it counts towards the stage). */
function useNote(t: Translate, use: LeadUse, outcome: TierOutcome, stageOf: (id: string) => StageView): string {
  switch (use.kind) {
    case 'no-skill':
      return t('use.noSkill');
    case 'no-rule':
      return t('use.noRule');
    case 'no-value':
      return t('use.noValue');
    case 'no-contrast':
      return t('use.noContrast');
    case 'capped': {
      const cap = stageOf(use.supportsId);
      return t('use.capped', { glyph: cap.glyph, label: cap.label });
    }
    case 'awaiting': {
      const [runs, needed] = [outcome.decision.wait?.runs ?? 0, outcome.decision.wait?.needed ?? 0];
      const to = stageOf(use.supportsId);
      const left = Math.max(1, needed - runs);
      // Persistence raised the stage on these rows this run: they were used, only the higher stage waits.
      if (outcome.decision.wait?.raisedFromId === undefined)
        return t('use.awaiting', { glyph: to.glyph, label: to.label, runs, needed, left });
      const issued = stageOf(outcome.decision.stageId);
      return t('use.raisedAwaiting', { glyph: issued.glyph, label: issued.label, toGlyph: to.glyph, toLabel: to.label, left });
    }
    default:
      return '';
  }
}

export function leadView(
  config: RenderConfig,
  p: LeadProbability,
  outcome: TierOutcome,
  locale: string,
  stageAt: (rank: number) => StageView,
  use: LeadUse,
  words: { readonly t: Translate; readonly threshold: (p: LeadProbability) => string },
): LeadView {
  const rankOf = (id: string) =>
    Math.max(
      0,
      config.stages.findIndex((s) => s.id === id),
    );
  const stageOf = (id: string) => stageAt(rankOf(id));
  const deciding = outcome.decision.lead !== null && outcome.decision.lead.lead.index === p.lead.index;
  const skill = p.skill;
  const pooled = skill !== null && skill.basis === 'observed';
  const num = (v: number | undefined) => (v !== undefined && Number.isFinite(v) ? formatNumber(locale, v, 2, 2) : '');
  return {
    tier: p.lead.tier,
    index: p.lead.index,
    start: p.lead.start,
    end: p.lead.end,
    dates: formatDayRange(locale, p.lead.start, p.lead.end),
    probability: p.probability,
    chance: formatPercent(locale, p.probability),
    normal: formatPercent(locale, p.baseRate),
    word: probabilityWord(config, p.probability, locale),
    reached: stageOf(use.reachedId),
    sure: sureLevel(skill),
    potential: skill?.basis === 'potential',
    score: num(pooled ? skill?.gate.fairBrierSkillScore : skill?.fairBrierSkillScore),
    low: num(pooled ? skill?.gate.low : undefined),
    high: num(pooled ? skill?.gate.high : undefined),
    years: (pooled ? skill?.gate.years : skill?.years) ?? 0,
    events: (pooled ? skill?.gate.events : skill?.events) ?? 0,
    deciding,
    withheld: use.kind === 'no-skill',
    use: use.kind,
    note: useNote(words.t, use, outcome, stageOf),
    threshold: words.threshold(p),
    thresholdValue: p.threshold.value,
    flags: p.flags,
  };
}

/** "17–30%" for a set of percentages, one value when they agree. */
function percentRange(locale: string, values: readonly number[]): string {
  const finite = values.filter(Number.isFinite);
  if (finite.length === 0) return '–';
  const lo = Math.min(...finite);
  const hi = Math.max(...finite);
  if (formatPercent(locale, lo) === formatPercent(locale, hi)) return formatPercent(locale, hi);
  return `${formatNumber(locale, Math.round(lo * 100), 0)}–${formatPercent(locale, hi)}`;
}

/** Leads merged where consecutive ones reach the same stage with the same skill verdict (the e-mail's short table). */
export function groupLeads(locale: string, leads: readonly LeadView[], probabilities: readonly LeadProbability[]): LeadGroup[] {
  const groups: { first: number; last: number }[] = [];
  const key = (l: LeadView): string => `${l.reached.id}|${l.note}`;
  leads.forEach((l, i) => {
    const g = groups.at(-1);
    if (g && key(leads[g.last]) === key(l)) g.last = i;
    else groups.push({ first: i, last: i });
  });
  return groups.map(({ first, last }) => {
    const span = leads.slice(first, last + 1);
    const probs = probabilities.slice(first, last + 1);
    return {
      dates: formatDayRange(locale, leads[first].start, leads[last].end),
      reached: leads[first].reached,
      chance: percentRange(
        locale,
        probs.map((p) => p.probability),
      ),
      normal: percentRange(
        locale,
        probs.map((p) => p.baseRate),
      ),
      noSkill: leads[first].withheld,
      deciding: span.some((l) => l.deciding),
      note: leads[first].note,
    };
  });
}
