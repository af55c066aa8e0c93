/**
 * Indicators and calibrated probabilities of one source: the model climate (hindcasts, observations, skill)
 * comes from the cache when the hindcast and observation files are unchanged (sha256), else the hindcasts are
 * read and everything is recomputed and stored; then the forecast's indicators become exceedance probabilities.
 */
import type { Config, IndicatorConfig, RegionConfig } from '../config/types.ts';
import type { LeadClimate } from '../calibrate/climate.ts';
import { aggregateToLeads, type LeadValues } from '../calibrate/lead-tiers.ts';
import { leadProbabilities } from '../calibrate/probability.ts';
import { skillByLead } from '../calibrate/skill.ts';
import type { Extractor } from '../read/extract.ts';
import type { ChecksumMemo } from '../core/file-checksums.ts';
import { pairKey, type PairKey } from '../core/keys.ts';
import { cachedSkill, fingerprint, skillCacheKey } from '../calibrate/skill-cache.ts';
import { resolveThresholdSpec } from '../calibrate/thresholds.ts';
import { within, type Diagnostic } from '../core/diagnostics.ts';
import { diagnosticOf, type ForelightError } from '../core/errors.ts';
import { computeIndicator, type IndicatorClimatology } from '../indicators/compute.ts';
import type { LeadProbability } from '../types.ts';
import { buildIndicatorClimate, type IndicatorClimate, type ObservedIndicators } from './climate-stage.ts';
import { indicatorContext } from './indicator-context.ts';
import type { SourceInputs } from './inputs.ts';
import { regionCells, type RegionQuantities, type SourceRead } from './read-file.ts';
import { readHindcasts } from './read-stage.ts';

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

export interface SharedContext {
  readonly config: Config;
  readonly observed: RegionQuantities | null;
  readonly observationsPath: string | null;
  /** region id → climatology from observations. */
  readonly climatology: ReadonlyMap<string, IndicatorClimatology>;
  readonly observedMemo: ObservedIndicators;
  /** Checksums of input files remembered across runs (cache keys). */
  readonly checksums: ChecksumMemo;
  /** How files are read: in this process, or by a cluster's workers. */
  readonly extract: Extractor;
}

type StoredClimate = Omit<IndicatorClimate, 'hindcast' | 'observed'> & {
  region: string;
  indicator: string;
  hindcast: StoredLeadClimate | null;
  observed: StoredLeadClimate | null;
};
type StoredLeadClimate = Omit<LeadClimate, 'values'> & { values: number[] };

const toStored = (c: LeadClimate | null): StoredLeadClimate | null => (c ? { ...c, values: Array.from(c.values) } : null);
const fromStored = (c: StoredLeadClimate | null): LeadClimate | null => (c ? { ...c, values: Float64Array.from(c.values) } : null);

function pairs(config: Config, tier: string): { region: RegionConfig; ind: IndicatorConfig }[] {
  return config.regions.flatMap((region) =>
    config.indicators.filter((ind) => ind.tiers.some((t) => t === tier)).map((ind) => ({ region, ind })),
  );
}

async function loadClimates(
  ctx: SharedContext,
  input: SourceInputs,
  read: SourceRead,
  problems: ForelightError[],
): Promise<{ climates: Map<PairKey, IndicatorClimate>; fromCache: boolean; cacheNote: string }> {
  const { config } = ctx;
  const source = input.source;
  if (input.hindcasts.length === 0) return { climates: new Map(), fromCache: false, cacheNote: '' };
  const key = await skillCacheKey({
    hindcastFiles: input.hindcasts.map((h) => h.path),
    observationsFile: ctx.observationsPath,
    configFingerprint: fingerprint({
      source: { id: source.id, tier: source.tier, hindcast: source.hindcast, variables: source.variables },
      regions: config.regions,
      indicators: config.indicators,
      rules: config.rules,
      gate: config.decision.skillGate,
      calibration: config.calibration,
    }),
    memo: ctx.checksums,
  });
  const cached = await cachedSkill<StoredClimate[]>(config.calibration.cacheDir, key, async () => {
    const hindcasts = await readHindcasts(
      source,
      input.hindcasts,
      config.regions,
      problems,
      regionCells(read.series),
      ctx.extract,
      config.calibration.cacheDir,
    );
    return pairs(config, source.tier).map(({ region, ind }): StoredClimate => {
      const c = buildIndicatorClimate(
        config,
        source,
        region,
        ind,
        hindcasts,
        ctx.observed,
        ctx.climatology.get(region.id) ?? {},
        ctx.observedMemo,
      );
      return { ...c, region: region.id, indicator: ind.id, hindcast: toStored(c.hindcast), observed: toStored(c.observed) };
    });
  });
  const climates = new Map(
    cached.value.map(({ region, indicator, ...c }) => [
      pairKey(region, indicator),
      { ...c, hindcast: fromStored(c.hindcast), observed: fromStored(c.observed) },
    ]),
  );
  return { climates, fromCache: cached.fromCache, cacheNote: cached.note };
}

/** Probabilities of every region × indicator of one source (the source's tier), with the climates behind them. */
export async function calibrateSource(
  ctx: SharedContext,
  read: SourceRead,
  input: SourceInputs,
  fileProblems: ForelightError[],
): Promise<SourceOutcome> {
  const { config } = ctx;
  const { climates, fromCache, cacheNote } = await loadClimates(ctx, input, read, fileProblems);
  const probabilities: LeadProbability[] = [];
  const forecastLeads = new Map<PairKey, LeadValues>();
  const problems: Diagnostic[] = [];
  for (const { region, ind } of pairs(config, read.source.tier)) {
    const inputs = read.series.get(region.id);
    if (!inputs) continue; // the read stage already reported why
    const climate = climates.get(pairKey(region.id, ind.id));
    if (climate) problems.push(...climate.problems);
    try {
      const first = [...inputs.values()][0]?.days[0];
      const series = computeIndicator(
        ind,
        inputs,
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
