/**
 * Turns a RegionOutcome into what templates print for one locale and audience: labels, dates and percentages
 * already formatted, confidence tied to the skill at each lead. No wording lives here — sentences are in
 * `templates/<locale>/phrases.njk`; this module only picks which sentence applies and supplies the numbers.
 */
import type { LeadProbability, Tier } from '../types.ts';
import type { Config, StageConfig } from '../config/types.ts';
import { ForelightError } from '../core/errors.ts';
import { formatDayRange, formatNumber, formatPercent } from './locale-format.ts';
import type { RegionOutcome, TierOutcome } from './model.ts';

export interface StageView {
  readonly id: string;
  readonly rank: number;
  readonly label: string;
  readonly glyph: string;
  readonly colour: string;
  /** Text colour readable on `colour` (black or white, by WCAG relative luminance). */
  readonly ink: string;
  readonly meaning: string;
  readonly actions: string;
}

/** Which confidence sentence applies at a lead. */
export type ConfidenceKind = 'observed' | 'potential' | 'no-skill' | 'unchecked';

export interface LeadView {
  readonly tier: Tier;
  readonly index: number;
  readonly dates: string;
  readonly chance: string;
  readonly normal: string;
  readonly word: string;
  readonly threshold: string;
  readonly thresholdOrigin: string;
  readonly confidence: ConfidenceKind;
  /** For 'no-skill': too few observed events to judge, or an interval that does not lie above the floor. */
  readonly noSkillWhy: 'few-events' | 'interval' | '';
  /**
   * Fair Brier skill score formatted for the locale ('' when there is none): of the skill gate's pooling window
   * when verified against observations, of the lead alone for a perfect-model estimate; with its 90 % interval.
   */
  readonly score: string;
  readonly low: string;
  readonly high: string;
  /** Independent past cases (hindcast years) and observed events behind the score. */
  readonly years: number;
  readonly events: number;
  readonly deciding: boolean;
  readonly withheld: boolean;
  readonly flags: readonly string[];
}

export interface TierView {
  readonly tier: Tier;
  readonly indicatorId: string;
  readonly indicator: string;
  readonly stage: StageView;
  readonly deciding: LeadView | null;
  readonly leads: readonly LeadView[];
  readonly reasons: readonly string[];
}

export interface IndicatorView {
  readonly id: string;
  readonly name: string;
  /** This indicator's tiers, days → weeks → months as given. */
  readonly tiers: readonly TierView[];
}

export interface RegionView {
  readonly id: string;
  readonly name: string;
  readonly stage: StageView;
  readonly previous: StageView | null;
  readonly change: 'new' | 'raised' | 'lowered' | 'held';
  readonly changeReason: string;
  readonly tiers: readonly TierView[];
  /** The same tiers grouped by indicator (first-seen order). */
  readonly indicators: readonly IndicatorView[];
}

/** Text of a per-locale record, or a one-line render error naming what is missing. */
export function pickLocale(record: Readonly<Record<string, string>> | undefined, locale: string, what: string): string {
  const text = record?.[locale];
  if (text === undefined || text.trim() === '') {
    throw new ForelightError('render', 'missing-translation', `${what} has no text for locale "${locale}"`, `add a "${locale}" entry for it in the config YAML`);
  }
  return text;
}

/** Stage ladder lookups for one config. */
export function stageIndex(config: Config): (id: string) => { stage: StageConfig; rank: number } {
  const byId = new Map(config.stages.map((stage, rank) => [stage.id, { stage, rank }]));
  return (id) => {
    const hit = byId.get(id);
    if (!hit) throw new ForelightError('render', 'unknown-stage', `stage "${id}" is not in the configured ladder (${[...byId.keys()].join(', ')})`, 'check the decide stage output against config stages');
    return hit;
  };
}

/** Label, glyph, meaning and the pre-agreed actions of `audience` (team id, else "default"). */
export function toStageView(stage: StageConfig, rank: number, locale: string, audience: string): StageView {
  const actions = stage.actions[audience]?.[locale] !== undefined ? stage.actions[audience] : stage.actions.default;
  return {
    id: stage.id,
    rank,
    label: pickLocale(stage.label, locale, `stage "${stage.id}" label`),
    glyph: stage.glyph,
    colour: stage.colour,
    ink: inkFor(stage.colour),
    meaning: pickLocale(stage.meaning, locale, `stage "${stage.id}" meaning`),
    actions: pickLocale(actions, locale, `stage "${stage.id}" actions for "${audience}" (or default)`),
  };
}

/** Word for a probability from `config.probabilityWords` (first band whose `below` exceeds p; else the last); '–' for NaN. */
export function probabilityWord(config: Config, p: number, locale: string): string {
  if (!Number.isFinite(p)) return '–';
  const bands = config.probabilityWords;
  if (bands.length === 0) throw new ForelightError('render', 'no-probability-words', 'probability-words is empty', 'add probability word bands under probability-words: in the config YAML');
  const band = bands.find((b) => p < b.below) ?? bands[bands.length - 1];
  return pickLocale(band.words, locale, `probability word band below ${band.below}`);
}

const UNIT_SYMBOLS: Readonly<Record<string, string>> = { degC: '°C', 'degC^2': '°C²', 'mm/day': 'mm/day', '%': '%', '1': '' };

/** Threshold as printed: "35 °C" from `{value: 35, units: 'degC'}`. */
export function formatThreshold(locale: string, value: number, units: string): string {
  const symbol = UNIT_SYMBOLS[units] ?? units;
  return `${formatNumber(locale, value, 1)}${symbol ? `\u00a0${symbol}` : ''}`;
}

function leadView(config: Config, p: LeadProbability, outcome: TierOutcome, locale: string): LeadView {
  const skill = p.skill;
  const confidence: ConfidenceKind = !skill ? 'unchecked' : skill.basis === 'potential' ? 'potential' : skill.skilful ? 'observed' : 'no-skill';
  const gate = skill?.gate;
  const pooled = skill !== null && skill.basis === 'observed';
  const num = (v: number | undefined) => (v !== undefined && Number.isFinite(v) ? formatNumber(locale, v, 2, 2) : '');
  const withheld = outcome.decision.withheldLeads.some((w) => w.index === p.lead.index && w.tier === p.lead.tier);
  const deciding = outcome.decision.lead !== null && outcome.decision.lead.lead.index === p.lead.index;
  return {
    tier: p.lead.tier,
    index: p.lead.index,
    dates: formatDayRange(locale, p.lead.start, p.lead.end),
    chance: formatPercent(locale, p.probability),
    normal: formatPercent(locale, p.baseRate),
    word: probabilityWord(config, p.probability, locale),
    threshold: formatThreshold(locale, p.threshold.value, p.threshold.units),
    thresholdOrigin: p.threshold.origin,
    confidence,
    noSkillWhy: confidence !== 'no-skill' ? '' : gate?.reason === 'few-events' ? 'few-events' : 'interval',
    score: num(pooled ? gate?.fairBrierSkillScore : skill?.fairBrierSkillScore),
    low: num(pooled ? gate?.low : undefined),
    high: num(pooled ? gate?.high : undefined),
    years: (pooled ? gate?.years : skill?.years) ?? 0,
    events: (pooled ? gate?.events : skill?.events) ?? 0,
    deciding,
    withheld,
    flags: p.flags,
  };
}

/** Everything the templates need about one region, for one locale and audience. */
export function buildRegionView(config: Config, outcome: RegionOutcome, locale: string, audience: string): RegionView {
  const lookup = stageIndex(config);
  const view = (id: string): StageView => {
    const { stage, rank } = lookup(id);
    return toStageView(stage, rank, locale, audience);
  };
  const stage = view(outcome.stage.id);
  const previous = outcome.previousStageId === null ? null : view(outcome.previousStageId);
  const change = previous === null ? 'new' : stage.rank > previous.rank ? 'raised' : stage.rank < previous.rank ? 'lowered' : 'held';
  const tiers = outcome.perTier.map((t): TierView => {
    const leads = t.probabilities.map((p) => leadView(config, p, t, locale));
    return {
      tier: t.tier,
      indicatorId: t.indicator.id,
      indicator: t.indicator.name,
      stage: view(t.decision.stageId),
      deciding: leads.find((l) => l.deciding) ?? null,
      leads,
      reasons: t.decision.reasons,
    };
  });
  const indicators = [...new Set(tiers.map((t) => t.indicatorId))].map((id): IndicatorView => {
    const own = tiers.filter((t) => t.indicatorId === id);
    return { id, name: own[0].indicator, tiers: own };
  });
  return { id: outcome.region.id, name: outcome.region.name, stage, previous, change, changeReason: outcome.changeReason, tiers, indicators };
}

/** Black or white, whichever contrasts more with a `#rrggbb` background (WCAG 2.1 relative luminance). */
export function inkFor(colour: string): string {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(colour);
  if (!m) return '#000000';
  const lin = (h: string): number => {
    const c = parseInt(h, 16) / 255;
    return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  const l = 0.2126 * lin(m[1]) + 0.7152 * lin(m[2]) + 0.0722 * lin(m[3]);
  return (1.05) / (l + 0.05) >= (l + 0.05) / 0.05 ? '#ffffff' : '#000000';
}
