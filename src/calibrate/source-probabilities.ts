/**
 * Exceedance probabilities of one source's forecast: per region × indicator of its tier, the indicator computed on
 * the forecast, aggregated to leads and calibrated against that pair's model climate (see model-climate.ts).
 */
import type { SourceConfig } from '../config/types.ts';
import { within, type Diagnostic } from '../core/diagnostics.ts';
import { diagnosticOf } from '../core/errors.ts';
import { pairKey, type PairKey } from '../core/keys.ts';
import { indicatorInputs, regionIndicator } from './region-indicator.ts';
import type { LeadProbability, RegionQuantities } from '../types.ts';
import { indicatorContext } from './indicator-context.ts';
import { aggregateToLeads, type LeadValues } from './lead-tiers.ts';
import { tierPairs, type CalibrateContext, type IndicatorClimate } from './model-climate.ts';
import { leadProbabilities } from './probability.ts';
import { skillByLead } from './skill.ts';
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

/** Probabilities of every region × indicator of one source (the source's tier), with the climates behind them. */
export function sourceProbabilities(
  ctx: CalibrateContext,
  read: SourceForecast,
  model: { climates: ReadonlyMap<PairKey, IndicatorClimate>; fromCache: boolean; cacheNote: string },
): SourceOutcome {
  const { config } = ctx;
  const { climates, fromCache, cacheNote } = model;
  const probabilities: LeadProbability[] = [];
  const forecastLeads = new Map<PairKey, LeadValues>();
  const problems: Diagnostic[] = [];
  for (const { region, ind } of tierPairs(config, read.source.tier)) {
    const inputs = indicatorInputs(read.series, region.id, ind);
    if (!inputs) continue; // the read stage already reported why
    const climate = climates.get(pairKey(region.id, ind.id));
    if (climate) problems.push(...climate.problems);
    try {
      const first = [...inputs.values()][0]?.days[0];
      const series = regionIndicator(
        ind,
        inputs,
        region.id,
        indicatorContext(ctx.climatology.get(region.id) ?? {}, ctx.observed?.get(region.id), first),
      );
      const forecast = aggregateToLeads(series, read.source.tier, ind.aggregate);
      forecastLeads.set(pairKey(region.id, ind.id), forecast);
      probabilities.push(
        ...leadProbabilities({
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
        }),
      );
    } catch (err) {
      const place = { file: read.path, source: read.source.id, region: region.id, indicator: ind.id };
      problems.push(
        within(diagnosticOf(err, 'indicator-skipped'), `${read.source.id} forecast, region ${region.id}, indicator ${ind.id}`, place),
      );
    }
  }
  return { source: read.source.id, probabilities, climates, forecastLeads, fromCache, cacheNote, problems };
}
