/**
 * Everything templates print about one region for one locale and audience: the first screen (stage, hazard,
 * dates, how likely, how sure, action, what changed), the outlook strip (hazard × days/weeks/months), short
 * per-tier tables, the full per-lead tables (archive) and the technical note ("How this was worked out").
 */
import type { IndicatorConfig, RegionConfig, ThresholdSpec } from '../config/types.ts';
import { basename } from 'node:path';
import { indicatorDefinition } from '../indicators/registry.ts';
import type { LeadProbability, Tier } from '../types.ts';
import { regionClock } from '../core/local-clock.ts';
import type { Translate } from './catalogue.ts';
import { NO_FORECAST_ID } from '../decide/types.ts';
import { formatNumber } from './locale-format.ts';
import { USABLE, headlineOf, type Headline } from './headline.ts';
import { tercileLines } from './tercile-words.ts';
import { trendLine } from './trend-words.ts';
import { pastYearsShare, rangeWords, thresholdNumber, thresholdRangeWords, thresholdWords } from './threshold-words.ts';
import type { RegionOutcome, TierOutcome, RenderConfig } from './model.ts';
import {
  TIERS,
  formatThreshold,
  groupLeads,
  leadView,
  noForecastView,
  stageIndex,
  tierLeadUses,
  toStageView,
  type LeadGroup,
  type LeadView,
  type StageView,
} from './view-model.ts';

export interface TierView {
  readonly tier: Tier;
  readonly tierName: string;
  readonly indicatorId: string;
  readonly hazard: string;
  readonly stage: StageView;
  readonly deciding: LeadView | null;
  readonly leads: readonly LeadView[];
  readonly groups: readonly LeadGroup[];
  /** Threshold in plain words ("34.2 °C", "heatwave conditions"), as a range when the leads shown differ. */
  readonly threshold: string;
  /** Lowest and highest threshold value over the leads (NaN without leads). */
  readonly thresholdRange: { readonly low: number; readonly high: number };
  /** Why the stage of this range is not the one its rows point to ('' when it is): kept higher, or data missing. */
  readonly note: string;
  /** Technical note: how the threshold was set and the skill figures of this tier. */
  readonly method: readonly string[];
}

export interface IndicatorView {
  readonly id: string;
  readonly hazard: string;
  /** Technical name and method of the indicator (technical note only). */
  readonly method: string;
  /** How the region's value was formed: area or population mean, or share above a level (ends `method`; PDF note). */
  readonly regionValue: string;
  readonly tiers: readonly TierView[];
}

export interface OutlookCell {
  readonly stage: StageView;
  readonly chance: string;
  readonly dates: string;
  readonly noSkill: boolean;
  /** The lead whose chance the cell shows (null: none usable). */
  readonly lead: LeadView | null;
  /** Printed after the chance: "*" no proven skill, "+" it points above the cell's stage (waiting or capped), else "". */
  readonly mark: string;
}
export interface OutlookRow {
  readonly hazard: string;
  readonly cells: readonly (OutlookCell | null)[];
}

export interface RegionView {
  readonly id: string;
  readonly name: string;
  readonly stage: StageView;
  readonly previous: StageView | null;
  readonly change: 'new' | 'raised' | 'lowered' | 'held';
  readonly changeText: string;
  readonly why: string;
  readonly headline: Headline | null;
  readonly outlook: readonly OutlookRow[];
  readonly tiers: readonly TierView[];
  /** The same tiers grouped by indicator (first-seen order). */
  readonly indicators: readonly IndicatorView[];
}

/** Officer's name of an indicator (message `hazard.<kind>`), from its kind and window. */
export function hazardName(t: Translate, ind: IndicatorConfig | undefined, fallback: string): string {
  return ind ? t(`hazard.${ind.kind}`, { days: ind.windowDays }) : fallback;
}

/** A lead with members beyond the formula's published table (flag of calibrate/probability.ts). */
function isBeyondTable(lead: LeadView): boolean {
  return lead.flags.some((f) => f.startsWith('beyond-table:'));
}

/** Lowest and highest threshold over a tier's leads. */
function thresholdRangeOf(probabilities: readonly LeadProbability[]): { low: number; high: number } {
  const values = probabilities.map((p) => p.threshold.value).filter(Number.isFinite);
  return values.length === 0 ? { low: NaN, high: NaN } : { low: Math.min(...values), high: Math.max(...values) };
}

/** Why a range's stage is not what its rows point to: kept higher by persistence, or no usable data. */
function tierNote(t: Translate, tier: TierOutcome, stage: StageView): string {
  const { missing, wait } = tier.decision;
  if (missing) return t('tier.missing', { reason: missing.reason, held: missing.held ? 'yes' : 'no' });
  if (wait?.direction === 'lower')
    return t('tier.heldHigher', { glyph: stage.glyph, label: stage.label, runs: wait.runs, needed: wait.needed });
  return '';
}

function methodLines(
  t: Translate,
  locale: string,
  config: RenderConfig,
  spec: ThresholdSpec | undefined,
  outcome: TierOutcome,
  leads: readonly LeadView[],
): string[] {
  const lines: string[] = [];
  const range = thresholdRangeOf(outcome.probabilities);
  const value = rangeWords(t, outcome.probabilities, (p) => thresholdNumber(locale, p.threshold.value, p.threshold.units)) || '–';
  if (spec?.kind === 'percentile')
    lines.push(t('method.thresholdPercentile', { percentile: spec.percentile, value, ...pastYearsShare(spec.percentile) }));
  else if (spec?.kind === 'absolute') {
    const mapped = Number.isFinite(range.low) && (Math.abs(range.low - spec.value) > 1e-9 || Math.abs(range.high - spec.value) > 1e-9);
    lines.push(
      t('method.thresholdAbsolute', { fixed: thresholdNumber(locale, spec.value, spec.units), value, mapped: mapped ? 'yes' : 'no' }),
    );
  }
  const scored = outcome.probabilities.filter((q) => q.skill);
  if (scored.length > 0) {
    const gate = config.decision.skillGate;
    const values = scored
      .map((q) => (q.skill!.basis === 'observed' ? q.skill!.gate.fairBrierSkillScore : q.skill!.fairBrierSkillScore))
      .filter(Number.isFinite);
    const fmt = (v: number) => (Number.isFinite(v) ? formatNumber(locale, v, 2, 2) : '–');
    lines.push(
      t('method.skill', {
        min: fmt(Math.min(...values)),
        max: fmt(Math.max(...values)),
        years: Math.max(...scored.map((q) => q.skill!.years)),
        potential: scored.some((q) => q.skill!.basis === 'potential') ? 'yes' : 'no',
        floor: formatNumber(locale, gate.floor, 2, 2),
        minEvents: gate.minEvents,
        withheld: leads.filter((l) => l.withheld).length,
      }),
    );
  } else lines.push(t('method.noSkill'));
  lines.push(...tercileLines(t, locale, outcome.probabilities));
  const trend = trendLine(t, locale, outcome.probabilities);
  if (trend) lines.push(trend);
  const beyond = leads.filter(isBeyondTable).length;
  if (beyond > 0) lines.push(t('method.beyondTable', { leads: beyond }));
  return lines;
}

/**
 * The parts without usable data, each in plain words with the reason and whether the last stage is kept (issue:
 * a missing tier is said, never silently left out); one sentence per tier range, indicators of one range merged.
 */
function missingText(t: Translate, region: RegionOutcome, tiers: readonly TierView[]): string {
  const said = new Map<string, string>();
  region.perTier.forEach((tier, i) => {
    const m = tier.decision.missing;
    if (!m || said.has(tier.tier)) return;
    said.set(
      tier.tier,
      t('why.missing', {
        range: tier.tier,
        reason: m.reason,
        held: m.held ? 'yes' : 'no',
        glyph: tiers[i].stage.glyph,
        label: tiers[i].stage.label,
      }),
    );
  });
  return [...said.values()].join(' ');
}

/** Why the region has its stage: the evidence that drives it, a stage held back by persistence, and any part without data. */
function whyText(
  t: Translate,
  config: RenderConfig,
  region: RegionOutcome,
  tiers: readonly TierView[],
  stage: StageView,
  byRank: readonly StageView[],
): string {
  const beyond = tiers.filter((tv) => tv.leads.some(isBeyondTable)).map((tv) => tv.hazard);
  const beyondText = beyond.length > 0 ? t('why.beyondTable', { hazards: [...new Set(beyond)].join(', ') }) : '';
  return [evidenceText(t, config, region, tiers, stage, byRank), beyondText, missingText(t, region, tiers)].filter(Boolean).join(' ');
}

function evidenceText(
  t: Translate,
  config: RenderConfig,
  region: RegionOutcome,
  tiers: readonly TierView[],
  stage: StageView,
  byRank: readonly StageView[],
): string {
  if (stage.id === NO_FORECAST_ID) return '';
  const rank = (id: string): number => config.stages.findIndex((s) => s.id === id);
  const [driver] = tiers
    .map((tv, i) => ({ tv, d: region.perTier[i].decision }))
    .filter((x) => !x.d.missing)
    .sort((a, b) => rank(b.d.rawStageId) - rank(a.d.rawStageId) || rank(b.d.stageId) - rank(a.d.stageId));
  if (!driver && region.perTier.some((x) => x.decision.missing)) return '';
  if (!driver || !driver.tv.deciding) return t('why.none');
  const lead = driver.tv.deciding;
  const evidence = t('why.evidence', {
    hazard: driver.tv.hazard,
    range: driver.tv.tier,
    chance: lead.chance,
    dates: lead.dates,
    normal: lead.normal,
  });
  const raw = rank(driver.d.rawStageId);
  if (raw === stage.rank) return evidence;
  const up = raw > stage.rank;
  const held = t(up ? 'why.heldUp' : 'why.heldDown', {
    glyph: byRank[raw].glyph,
    label: byRank[raw].label,
    runs: up ? config.decision.escalateAfterRuns : config.decision.relaxAfterRuns,
  });
  return `${evidence} ${held}`;
}

/** The lead an outlook cell shows: the deciding one, else the likeliest one the rules use. */
function cellLead(tv: TierView): LeadView | null {
  return (
    tv.deciding ??
    tv.leads
      .filter((l) => USABLE.has(l.use) && Number.isFinite(l.probability))
      .reduce<LeadView | null>((a, l) => (a === null || l.probability > a.probability ? l : a), null)
  );
}

/** How the region's value of an indicator was formed (config region-value), for the technical note. */
function regionValueLine(
  t: Translate,
  locale: string,
  region: RegionConfig,
  ind: IndicatorConfig | undefined,
  raster: string | undefined,
): string {
  const value = ind?.regionValue ?? { weights: 'area' as const };
  const args = {
    rule: region.cellRule ?? 'overlap',
    clock: regionClock(region).key,
    weights: value.weights,
    raster: raster ? basename(raster) : '',
  };
  if (value.shareAbove === undefined || !ind) return t('method.region', args);
  return t('method.share', { ...args, level: formatThreshold(locale, value.shareAbove, indicatorDefinition(ind.kind).units) });
}

/** Everything the templates need about one region, for one locale and audience. */
export function buildRegionView(config: RenderConfig, outcome: RegionOutcome, locale: string, audience: string, t: Translate): RegionView {
  const lookup = stageIndex(config);
  const byRank = config.stages.map((s, r) => toStageView(s, r, locale, audience));
  const none = noForecastView(t);
  const view = (id: string): StageView => (id === NO_FORECAST_ID ? none : byRank[lookup(id).rank]);
  const stage = view(outcome.stage?.id ?? NO_FORECAST_ID);
  const previous = outcome.previousStageId === null ? null : view(outcome.previousStageId);
  const change = previous === null ? 'new' : stage.rank > previous.rank ? 'raised' : stage.rank < previous.rank ? 'lowered' : 'held';
  const indicatorOf = (id: string) => config.indicators.find((i) => i.id === id);
  const tiers = outcome.perTier.map((tier): TierView => {
    const ind = indicatorOf(tier.indicator.id);
    const spec = ind ? (ind.regionThresholds[outcome.region.id] ?? ind.threshold) : undefined;
    const words = { t, threshold: (p: LeadProbability) => thresholdWords(t, locale, ind, spec, p) };
    const uses = tierLeadUses(config, tier);
    const lowest = config.stages[0].id;
    const useOf = (index: number) =>
      uses.find((u) => u.index === index) ?? { index, kind: 'no-value' as const, reachedId: lowest, supportsId: lowest };
    const leads = tier.probabilities.map((p) => leadView(config, p, tier, locale, (r) => byRank[r], useOf(p.lead.index), words));
    const stageView = view(tier.decision.stageId);
    return {
      tier: tier.tier,
      tierName: t(`tier.${tier.tier}`),
      indicatorId: tier.indicator.id,
      hazard: hazardName(t, ind, tier.indicator.name),
      stage: stageView,
      deciding: leads.find((l) => l.deciding) ?? null,
      leads,
      groups: groupLeads(locale, leads, tier.probabilities),
      threshold: thresholdRangeWords(t, locale, ind, spec, tier.probabilities),
      thresholdRange: thresholdRangeOf(tier.probabilities),
      note: tierNote(t, tier, stageView),
      method: methodLines(t, locale, config, spec, tier, leads),
    };
  });
  const ids = [...new Set(tiers.map((tv) => tv.indicatorId))];
  const indicators = ids.map((id): IndicatorView => {
    const own = tiers.filter((tv) => tv.indicatorId === id);
    const ind = indicatorOf(id);
    const averaged = regionValueLine(t, locale, outcome.region, ind, config.population?.file);
    return {
      id,
      hazard: own[0].hazard,
      method: `${ind ? t(`method.${ind.kind}`, { days: ind.windowDays }) : own[0].hazard} ${averaged}`,
      regionValue: averaged,
      tiers: own,
    };
  });
  const outlook = indicators.map((ind): OutlookRow => ({
    hazard: ind.hazard,
    cells: TIERS.map((tierName) => {
      const tv = ind.tiers.find((x) => x.tier === tierName);
      if (!tv) return null;
      const pick = cellLead(tv);
      const noSkill = tv.leads.length > 0 && tv.leads.every((l) => l.withheld);
      const above = pick !== null && pick.reached.rank > tv.stage.rank;
      return {
        stage: tv.stage,
        chance: pick?.chance ?? '–',
        dates: pick?.dates ?? '',
        noSkill,
        lead: pick,
        mark: above ? '+' : noSkill ? '*' : '',
      };
    }),
  }));
  const changeText =
    change === 'new'
      ? t('change.new')
      : t(`change.${change}`, { fromGlyph: previous?.glyph ?? '', from: previous?.label ?? '', toGlyph: stage.glyph, to: stage.label });
  return {
    id: outcome.region.id,
    name: outcome.region.name,
    stage,
    previous,
    change,
    changeText,
    why: whyText(t, config, outcome, tiers, stage, byRank),
    headline: headlineOf(t, locale, tiers, stage),
    outlook,
    tiers,
    indicators,
  };
}
