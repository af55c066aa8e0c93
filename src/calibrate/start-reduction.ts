/**
 * The reduction of one hindcast start, the unit of a first-time climate build: for every region × indicator of the
 * source's tier, the indicator computed on that start's region series and aggregated to the tier's leads, beside the
 * observations on the same days (or why the start could not be used). It needs only this start's series and the
 * observations, so the starts of a source are reduced independently (in this process or by a cluster's workers)
 * and `buildIndicatorClimate` stacks them; what it keeps is small (lead values, not daily series).
 */
import type { Config, IndicatorConfig, RegionConfig } from '../config/types.ts';
import type { Diagnostic } from '../core/diagnostics.ts';
import { diagnosticOf } from '../core/errors.ts';
import { pairKey, type PairKey } from '../core/keys.ts';
import type { IndicatorClimatology } from '../indicators/compute.ts';
import type { HindcastRead, IndicatorSeries, IsoDate, RegionQuantities, Tier } from '../types.ts';
import { indicatorContext, valuesOnDays } from './indicator-context.ts';
import { aggregateToLeads, type LeadValues } from './lead-tiers.ts';
import { indicatorInputs, regionIndicator } from './region-indicator.ts';

/** One region × indicator of one start: its lead values (and the observed ones on the same days), or why not. */
export type PairReduction =
  { readonly units: string; readonly hindcast: LeadValues; readonly observed: LeadValues | null } | { readonly failure: Diagnostic };

export interface StartReduction {
  readonly year: number;
  readonly start: IsoDate;
  readonly path: string;
  /** Region × indicator → its reduction; a pair without inputs in this start is absent. */
  readonly pairs: ReadonlyMap<PairKey, PairReduction>;
}

/** What reducing a start takes besides the start: the observations, their climatology per region and the observed indicators. */
export interface ObservedContext {
  readonly observed: RegionQuantities | null;
  readonly climatology: ReadonlyMap<string, IndicatorClimatology>;
  /** Observed indicator over the whole record of a region × indicator (computed once, see model-climate.ts). */
  observedIndicator(ind: IndicatorConfig, region: RegionConfig): IndicatorSeries | Diagnostic | null;
}

export const isSeries = (v: IndicatorSeries | Diagnostic | null): v is IndicatorSeries => v !== null && 'data' in v;

/** The observed series on the days of a hindcast's series (and its model calendar, so that month leads match). */
function onDays(series: IndicatorSeries, like: IndicatorSeries): IndicatorSeries {
  const data = valuesOnDays(series, like.days);
  const model = like.modelCalendar ? { modelCalendar: like.modelCalendar } : {};
  return { ...series, days: like.days, members: 1, data, missing: data.filter(Number.isNaN).length, ...model };
}

/** The region × indicator pairs of a tier (every region, each indicator computed on that tier). */
export function tierPairs(config: Pick<Config, 'regions' | 'indicators'>, tier: Tier): { region: RegionConfig; ind: IndicatorConfig }[] {
  return config.regions.flatMap((region) =>
    config.indicators.filter((ind) => ind.tiers.some((t) => t === tier)).map((ind) => ({ region, ind })),
  );
}

/** Every region × indicator of `tier` on one hindcast start (see module comment). */
export function reduceStart(
  config: Pick<Config, 'regions' | 'indicators'>,
  tier: Tier,
  start: HindcastRead,
  context: ObservedContext,
): StartReduction {
  const pairs = new Map<PairKey, PairReduction>();
  for (const { region, ind } of tierPairs(config, tier)) {
    const inputs = indicatorInputs(start.series, region.id, ind);
    if (!inputs) continue;
    const climatology = context.climatology.get(region.id) ?? {};
    try {
      const first = [...inputs.values()][0]?.days[0];
      const result = regionIndicator(ind, inputs, region.id, indicatorContext(climatology, context.observed?.get(region.id), first));
      const obsSeries = context.observedIndicator(ind, region);
      pairs.set(pairKey(region.id, ind.id), {
        units: result.units,
        hindcast: aggregateToLeads(result, tier, ind.aggregate),
        observed: isSeries(obsSeries) ? aggregateToLeads(onDays(obsSeries, result), tier, ind.aggregate) : null,
      });
    } catch (err) {
      pairs.set(pairKey(region.id, ind.id), { failure: diagnosticOf(err, 'hindcast-skipped') });
    }
  }
  return { year: start.year, start: start.start, path: start.path, pairs };
}
