/**
 * The calibration of one region of one source, the second unit of a first-time climate build: from the reduced
 * hindcast starts (lead values of the region's indicators), its model climates stacked, verified (skill per lead,
 * bootstrap intervals) and its cost/loss triggers tuned. A `RegionJob` holds everything that needs (plain data, so
 * a cluster's worker can do it); the regions of a source are independent, and their results in region order are
 * exactly the model climates of the source (`cachedClimates`).
 */
import type { SourceConfig } from '../config/types.ts';
import type { Diagnostic } from '../core/diagnostics.ts';
import { pairKey, type PairKey } from '../core/keys.ts';
import type { IsoDate } from '../types.ts';
import { buildIndicatorClimate, type CalibrateConfig, type RegionCalibrator, type RegionJob } from './model-climate.ts';
import { isSeries, tierPairs, type ObservedContext, type StartReduction } from './start-reduction.ts';
import { toStored, type StoredClimate } from './stored-climate.ts';

/** One job per region of the source's tier, in region order. */
export function regionJobs(
  config: CalibrateConfig,
  source: SourceConfig,
  starts: readonly StartReduction[],
  observed: ObservedContext,
  forecastLeadOne: (region: string, indicator: string) => IsoDate | null,
): RegionJob[] {
  return config.regions.map((region) => {
    const pairs = tierPairs({ regions: [region], indicators: config.indicators }, source.tier);
    const keys = new Set(pairs.map(({ ind }) => pairKey(region.id, ind.id)));
    const observedProblems = pairs.flatMap(({ ind }): [PairKey, Diagnostic][] => {
      const o = observed.observedIndicator(ind, region);
      return o && !isSeries(o) ? [[pairKey(region.id, ind.id), o]] : [];
    });
    return {
      config: { ...config, regions: [region] },
      source,
      starts: starts.map((s) => ({ ...s, pairs: new Map([...s.pairs].filter(([k]) => keys.has(k))) })),
      observedProblems,
      forecastLeadOne: pairs.map(({ ind }) => [pairKey(region.id, ind.id), forecastLeadOne(region.id, ind.id)] as const),
    };
  });
}

/** The model climates of the job's region, one per indicator of the tier, as the cache stores them. */
export function calibrateRegion(job: RegionJob): StoredClimate[] {
  const problems = new Map(job.observedProblems);
  const leadOne = new Map(job.forecastLeadOne);
  return tierPairs(job.config, job.source.tier).map(({ region, ind }): StoredClimate => {
    const key = pairKey(region.id, ind.id);
    const c = buildIndicatorClimate(job.config, job.source, region, ind, job.starts, problems.get(key) ?? null, leadOne.get(key) ?? null);
    return { ...c, region: region.id, indicator: ind.id, hindcast: toStored(c.hindcast), observed: toStored(c.observed) };
  });
}

/** The calibrator of this process. */
export const localCalibrator: RegionCalibrator = async (job) => calibrateRegion(job);
