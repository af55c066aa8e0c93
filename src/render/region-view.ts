/**
 * Everything templates print about one region for one locale and audience: the first screen (stage, hazard,
 * dates, how likely, how sure, action, what changed), the outlook strip (hazard × days/weeks/months), short
 * per-tier tables, the full per-lead tables (archive) and the technical note ("How this was worked out").
 */
import type { IndicatorConfig } from '../config/types.ts';
import type { LeadProbability } from '../probability-types.ts';
import type { Translate } from './catalogue.ts';
import { NO_FORECAST_ID } from '../decide/types.ts';
import { USABLE, headlineOf, type Headline } from './headline.ts';
import { thresholdRangeWords, thresholdWords } from './threshold-words.ts';
import type { RegionOutcome, RenderConfig } from './model.ts';
import { tierNote, whyText } from './region-why.ts';
import type { TierView } from './tier-view.ts';
import { methodLines, regionValueLine, thresholdRangeOf } from './tier-method.ts';
import { TIERS, groupLeads, leadView, tierLeadUses, type LeadView } from './view-model.ts';
import { noForecastView, stageIndex, toStageView, type StageView } from './stage-view.ts';

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

/** The lead an outlook cell shows: the deciding one, else the likeliest one the rules use. */
function cellLead(tv: TierView): LeadView | null {
  return (
    tv.deciding ??
    tv.leads
      .filter((l) => USABLE.has(l.use) && Number.isFinite(l.probability))
      .reduce<LeadView | null>((a, l) => (a === null || l.probability > a.probability ? l : a), null)
  );
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
    why: whyText({ t, config, region: outcome, tiers, stage, byRank }),
    headline: headlineOf(t, locale, tiers, stage),
    outlook,
    tiers,
    indicators,
  };
}
