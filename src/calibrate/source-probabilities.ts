/**
 * Exceedance probabilities of one source's forecast: per region × indicator of its tier, the indicator computed on
 * the forecast, aggregated to leads and calibrated against that pair's model climate (see model-climate.ts).
 */
import type { SourceConfig } from '../config/types.ts';
import { within, type Diagnostic } from '../core/diagnostics.ts';
import { diagnosticOf } from '../core/errors.ts';
import { pairKey, type PairKey } from '../core/keys.ts';
import { indicatorInputs, regionIndicator } from './region-indicator.ts';
import type { IndicatorSeries, IsoDate, RegionQuantities } from '../types.ts';
import type { LeadProbability } from '../probability-types.ts';
import { indicatorContext } from './indicator-context.ts';
import { aggregateToLeads, type LeadValues } from './lead-tiers.ts';
import type { CalibrateContext } from './model-climate.ts';
import type { IndicatorClimate } from './stored-climate.ts';
import { tierPairs } from './start-reduction.ts';
import { leadProbabilities } from './probability.ts';
import { skillByLead } from './skill.ts';
import { withTerciles } from './terciles.ts';
import { resolveThresholdSpec } from './thresholds.ts';

export interface SourceOutcome {
  readonly source: string;
  readonly probabilities: readonly LeadProbability[];
  /** pairKey(region, indicator) → climate and skill. */
  readonly climates: ReadonlyMap<PairKey, IndicatorClimate>;
  /** pairKey(region, indicator) → the forecast's values per member and lead (for explain). */
  readonly forecastLeads: ReadonlyMap<PairKey, LeadValues>;
  readonly fromCache: boolean;
  /** Set when the model-climate cache could not be read or kept (the run went on without it). */
  readonly cacheNote: string;
  /** Region × indicator combinations that were skipped, with the reason. */
  readonly problems: readonly Diagnostic[];
}

/** One source's forecast as read: the file and its series per region and quantity. */
export interface SourceForecast {
  readonly source: Pick<SourceConfig, 'id' | 'tier'>;
  readonly path: string;
  readonly series: RegionQuantities;
}

/** Why a region × indicator of the forecast was skipped. */
function skipped(read: SourceForecast, region: string, indicator: string, err: unknown): Diagnostic {
  const place = { file: read.path, source: read.source.id, region, indicator };
  return within(diagnosticOf(err, 'indicator-skipped'), `${read.source.id} forecast, region ${region}, indicator ${indicator}`, place);
}

/** The forecast's indicator per region × indicator of its tier, with its leads, or why it could not be computed. */
export type ForecastIndicators = ReadonlyMap<PairKey, { series: IndicatorSeries; leads: LeadValues } | Diagnostic>;

/** The indicator computed on the forecast and aggregated to the tier's leads, for every region × indicator it has inputs for. */
export function forecastIndicators(ctx: CalibrateContext, read: SourceForecast): ForecastIndicators {
  const out = new Map<PairKey, { series: IndicatorSeries; leads: LeadValues } | Diagnostic>();
  for (const { region, ind } of tierPairs(ctx.config, read.source.tier)) {
    const inputs = indicatorInputs(read.series, region.id, ind);
    if (!inputs) continue; // the read stage already reported why
    try {
      const first = [...inputs.values()][0]?.days[0];
      const series = regionIndicator(
        ind,
        inputs,
        region.id,
        indicatorContext(ctx.climatology.get(region.id) ?? {}, ctx.observed?.get(region.id), first),
      );
      out.set(pairKey(region.id, ind.id), { series, leads: aggregateToLeads(series, read.source.tier, ind.aggregate) });
    } catch (err) {
      out.set(pairKey(region.id, ind.id), skipped(read, region.id, ind.id, err));
    }
  }
  return out;
}

/**
 * Start of the forecast's lead 1 for a region × indicator (it decides which hindcast months are pooled), or null;
 * for a month lead of a model calendar, the model date of its first day (its model month is what is pooled).
 */
export function forecastLeadOne(forecast: ForecastIndicators, region: string, indicator: string): IsoDate | null {
  const f = forecast.get(pairKey(region, indicator));
  const lead = f && 'leads' in f ? f.leads.leads[0] : undefined;
  return lead ? (lead.modelMonth !== undefined ? `${lead.modelMonth}-01` : lead.start) : null;
}

/** Probabilities of every region × indicator of one source (the source's tier), with the climates behind them. */
export function sourceProbabilities(
  ctx: CalibrateContext,
  read: SourceForecast,
  model: { climates: ReadonlyMap<PairKey, IndicatorClimate>; fromCache: boolean; cacheNote: string },
  computed: ForecastIndicators,
): SourceOutcome {
  const { config } = ctx;
  const { climates, fromCache, cacheNote } = model;
  const probabilities: LeadProbability[] = [];
  const forecastLeads = new Map<PairKey, LeadValues>();
  const problems: Diagnostic[] = [];
  for (const { region, ind } of tierPairs(config, read.source.tier)) {
    const computedPair = computed.get(pairKey(region.id, ind.id));
    if (!computedPair) continue;
    const climate = climates.get(pairKey(region.id, ind.id));
    if (climate) problems.push(...climate.problems);
    if (!('leads' in computedPair)) {
      problems.push(computedPair);
      continue;
    }
    const { series, leads: forecast } = computedPair;
    try {
      forecastLeads.set(pairKey(region.id, ind.id), forecast);
      const leads = leadProbabilities({
        source: read.source.id,
        region: region.id,
        indicator: ind.id,
        units: series.units,
        forecast,
        hindcast: climate?.hindcast ?? null,
        observed: climate?.observed ?? null,
        threshold: resolveThresholdSpec(ind, region.id),
        calibration: config.calibration,
        skill: climate ? skillByLead(climate.skill) : undefined,
      });
      probabilities.push(
        ...withTerciles(leads, {
          forecast,
          hindcast: climate?.hindcast ?? null,
          observed: climate?.observed ?? null,
          units: series.units,
          aggregate: ind.aggregate,
          bootstrap: config.decision.skillGate,
        }),
      );
    } catch (err) {
      problems.push(skipped(read, region.id, ind.id, err));
    }
  }
  return { source: read.source.id, probabilities, climates, forecastLeads, fromCache, cacheNote, problems };
}
