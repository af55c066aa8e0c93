/**
 * The technical note of a range ("How this was worked out"): how its threshold was set, the skill figures, tercile
 * and trend lines, leads beyond a formula's published table, and how the region's value was formed.
 */
import { basename } from 'node:path';
import type { IndicatorConfig, RegionConfig, ThresholdSpec } from '../config/types.ts';
import { regionClock } from '../core/local-clock.ts';
import { indicatorDefinition } from '../indicators/registry.ts';
import type { LeadProbability } from '../probability-types.ts';
import type { Translate } from './catalogue.ts';
import { formatNumber, formatThreshold } from './locale-format.ts';
import type { RenderConfig, TierOutcome } from './model.ts';
import { tercileLines } from './tercile-words.ts';
import { pastYearsShare, rangeWords, thresholdNumber } from './threshold-words.ts';
import { trendLine } from './trend-words.ts';
import type { LeadView } from './view-model.ts';

/** A lead with members beyond the formula's published table (flag of calibrate/probability.ts). */
export function isBeyondTable(lead: LeadView): boolean {
  return lead.flags.some((f) => f.startsWith('beyond-table:'));
}

/** Lowest and highest threshold over a tier's leads. */
export function thresholdRangeOf(probabilities: readonly LeadProbability[]): { low: number; high: number } {
  const values = probabilities.map((p) => p.threshold.value).filter(Number.isFinite);
  return values.length === 0 ? { low: NaN, high: NaN } : { low: Math.min(...values), high: Math.max(...values) };
}

/** The technical note's lines for one range. */
export function methodLines(
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

/** How the region's value of an indicator was formed (config region-value), for the technical note. */
export function regionValueLine(
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
