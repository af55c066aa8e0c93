/**
 * Model climate and skill of one source × region × indicator: the indicator computed on every hindcast start
 * and on the observations for the same days, aggregated to the source's tier (one start at a time,
 * start-reduction.ts), then stacked, verified (skill per lead) and, for rules that give a cost/loss ratio, the
 * trigger of maximum economic value judged out of sample.
 */
import type { Config, IndicatorConfig, RegionConfig, SourceConfig } from '../config/types.ts';
import { formatDiagnostic, within, type Diagnostic } from '../core/diagnostics.ts';
import { diagnosticOf } from '../core/errors.ts';
import type { ChecksumMemo } from '../core/file-checksums.ts';
import { pairKey, type PairKey } from '../core/keys.ts';
import type { IndicatorClimatology } from '../indicators/compute.ts';
import { indicatorInputs, regionIndicator } from './region-indicator.ts';
import type { IndicatorSeries, IsoDate, RegionQuantities } from '../types.ts';
import { stackYears } from './climate.ts';
import type { LeadClimate } from './lead-climate.ts';
import { sameLeadMonths } from './month-true.ts';
import { atForecastStart } from './start-anomalies.ts';
import { indicatorContext } from './indicator-context.ts';
import type { LeadValues } from './lead-tiers.ts';
import { skillReports } from './skill.ts';
import { leadCases } from './verification-cases.ts';
import type { StoredClimate, IndicatorClimate } from './stored-climate.ts';
import type { ObservedContext, StartReduction } from './start-reduction.ts';
import { resolveThresholdSpec } from './thresholds.ts';
import { tuneTrigger, type TunedTrigger } from './trigger-tuning.ts';

/** The part of the configuration the calibrate stage reads. */
export type CalibrateConfig = Pick<Config, 'regions' | 'indicators' | 'rules' | 'decision' | 'calibration' | 'population'>;

export interface RegionJob {
  /** The calibration configuration with only this region in `regions`. */
  readonly config: CalibrateConfig;
  readonly source: SourceConfig;
  /** Every start's reduction, with only this region's pairs. */
  readonly starts: readonly StartReduction[];
  /** Per pair of the region, why the observations gave no indicator (pairs whose observations are usable are absent). */
  readonly observedProblems: readonly (readonly [PairKey, Diagnostic])[];
  /** Per pair of the region, the first day of the forecast's lead 1 (null without one). */
  readonly forecastLeadOne: readonly (readonly [PairKey, IsoDate | null])[];
}

/** Calibrates one region (in this process, or by a cluster's workers); `parallel`: regions in flight (1 when absent). */
export interface RegionCalibrator {
  (job: RegionJob): Promise<StoredClimate[]>;
  readonly parallel?: number;
}

/** The observed indicator of a region over the whole observation record (one member), or why there is none. */
export type ObservedIndicators = Map<PairKey, IndicatorSeries | Diagnostic>;

/** What calibrating every source of one run shares: the observations, their climatology and the cache's checksums. */
export interface CalibrateContext {
  readonly config: CalibrateConfig;
  readonly observed: RegionQuantities | null;
  readonly observationsPath: string | null;
  /** region id → climatology from observations. */
  readonly climatology: ReadonlyMap<string, IndicatorClimatology>;
  readonly observedMemo: ObservedIndicators;
  /** Checksums of input files remembered across runs (cache keys). */
  readonly checksums: ChecksumMemo;
  /** How each region of a first-time build is calibrated (default: in this process; a cluster's workers). */
  readonly calibrateRegion?: RegionCalibrator;
}

export function observedIndicator(
  ind: IndicatorConfig,
  region: RegionConfig,
  observed: RegionQuantities | null,
  climatology: IndicatorClimatology,
  memo: ObservedIndicators,
): IndicatorSeries | Diagnostic | null {
  const obs = observed ? indicatorInputs(observed, region.id, ind) : undefined;
  if (!obs) return null;
  const key = pairKey(region.id, ind.id);
  let result = memo.get(key);
  if (result === undefined) {
    try {
      result = regionIndicator(ind, obs, region.id, indicatorContext(climatology, undefined, undefined));
    } catch (err) {
      result = within(diagnosticOf(err, 'observations-skipped'), `observations of ${region.id}`, { region: region.id, indicator: ind.id });
    }
    memo.set(key, result);
  }
  return result;
}

/** The observations of a run as the reduction of a hindcast start uses them (observed indicators computed once per pair). */
export function observedContext(ctx: Pick<CalibrateContext, 'observed' | 'climatology' | 'observedMemo'>): ObservedContext {
  return {
    observed: ctx.observed,
    climatology: ctx.climatology,
    observedIndicator: (ind, region) =>
      observedIndicator(ind, region, ctx.observed, ctx.climatology.get(region.id) ?? {}, ctx.observedMemo),
  };
}

/** Stage probabilities of the rules on this indicator × tier (for hit and false-alarm rates). */
function ruleProbabilities(config: CalibrateConfig, ind: IndicatorConfig, tier: SourceConfig['tier']): number[] {
  return config.rules
    .filter((r) => r.indicator === ind.id && r.tier === tier)
    .flatMap((r) => (r.probability === undefined ? [] : [r.probability]));
}

/** Each cost/loss rule of this indicator × tier tuned on its leads' cases, judged leave-one-year-out (trigger-tuning.ts). */
function tuneCostLoss(
  config: CalibrateConfig,
  ind: IndicatorConfig,
  source: SourceConfig,
  region: RegionConfig,
  hc: LeadClimate,
  obs: LeadClimate | null,
): Record<string, TunedTrigger> {
  const tuned: Record<string, TunedTrigger> = {};
  const rules = config.rules.filter(
    (r): r is typeof r & { costLoss: number } => r.indicator === ind.id && r.tier === source.tier && r.costLoss !== undefined,
  );
  if (rules.length === 0) return tuned;
  const leads = leadCases(hc, obs, resolveThresholdSpec(ind, region.id)).map((l) => ({
    index: l.lead.index,
    basis: l.basis,
    cases: l.cases,
  }));
  const { resamples, seed } = config.decision.skillGate;
  for (const rule of rules) {
    const own = leads.filter((l) => rule.leads.length === 0 || rule.leads.includes(l.index));
    const trigger = tuneTrigger(own, rule.costLoss, { resamples, seed });
    if (trigger) tuned[rule.id] = trigger;
  }
  return tuned;
}

/**
 * The hindcast year that stands for the forecast (the year a trend-aware climate is re-centred on): the year of the
 * forecast's lead day 1, less the gap a hindcast start shows between its year and its own lead day 1 (a start in
 * late December whose lead 1 is in January). Without a forecast date, the last hindcast year.
 */
function issueYearOf(entries: readonly { year: number; leads: LeadValues }[], forecastLeadOne: IsoDate | null): number {
  const last = Math.max(...entries.map((e) => e.year));
  const first = entries[0].leads.leads[0]?.start;
  if (forecastLeadOne === null || first === undefined) return last;
  return Number(forecastLeadOne.slice(0, 4)) - (Number(first.slice(0, 4)) - entries[0].year);
}

/**
 * Hindcast and observed lead climates, skill per lead and tuned thresholds of one source × region × indicator from
 * its hindcast starts' reductions (start-reduction.ts, in start order) and why the observations gave no indicator
 * (null when they did or are not configured), for a forecast whose lead 1 begins on
 * `forecastLeadOne` (it decides the months pooled, and the start day and week climates are moved to; null when the
 * forecast has none).
 */
export function buildIndicatorClimate(
  config: CalibrateConfig,
  source: SourceConfig,
  region: RegionConfig,
  ind: IndicatorConfig,
  starts: readonly StartReduction[],
  observedProblem: Diagnostic | null,
  forecastLeadOne: IsoDate | null,
): IndicatorClimate {
  const problems: Diagnostic[] = observedProblem ? [observedProblem] : [];
  const tier = source.tier;
  const place = { source: source.id, region: region.id, indicator: ind.id };
  const failures = new Map<string, { first: Diagnostic; files: number }>();
  const hcYears: { year: number; leads: LeadValues }[] = [];
  const obsYears: { year: number; leads: LeadValues }[] = [];
  let units = '';
  for (const start of starts) {
    const pair = start.pairs.get(pairKey(region.id, ind.id));
    if (!pair) continue;
    if ('failure' in pair) {
      const text = formatDiagnostic(pair.failure);
      failures.set(text, { first: failures.get(text)?.first ?? pair.failure, files: (failures.get(text)?.files ?? 0) + 1 });
      continue;
    }
    units = pair.units;
    hcYears.push({ year: start.year, leads: pair.hindcast });
    if (pair.observed) obsYears.push({ year: start.year, leads: pair.observed });
  }
  for (const { first, files } of failures.values())
    problems.push(within(first, `${files} hindcast file(s) of ${source.id}, region ${region.id}`, place));
  if (hcYears.length === 0) return { hindcast: null, observed: null, skill: [], tuned: {}, problems };
  const what = `${source.id} hindcasts for ${region.id} (${ind.id})`;
  const pooled =
    tier === 'months'
      ? sameLeadMonths(what, hcYears, forecastLeadOne?.slice(5, 7) ?? '', config.calibration.minHindcastYears, place)
      : null;
  if (pooled) problems.push(...pooled.problems);
  const keep = new Set(pooled?.kept ?? hcYears);
  // Days and weeks: values moved from each start's own model climate to the forecast's start (start-anomalies.ts).
  const atStart = <T extends { leads: LeadValues }>(e: T[]): T[] => (tier === 'months' ? e : atForecastStart(e, forecastLeadOne));
  const hc = stackYears(what, units, atStart(pooled?.kept ?? hcYears), place);
  // Observed entries were pushed beside the hindcast ones (same positions): keep the same starts.
  const obsKept = obsYears.filter((_, i) => keep.has(hcYears[i]));
  const obs =
    obsKept.length > 0
      ? stackYears(`observations for ${region.id} (${ind.id})`, units, atStart(obsKept), place)
      : { climate: null, problems: [] };
  problems.push(...hc.problems, ...obs.problems);
  if (!hc.climate) return { hindcast: null, observed: null, skill: [], tuned: {}, problems };
  // One re-centred climate for thresholds, probabilities, quantile mapping, terciles and skill (trend-climate.ts).
  const onYear = ind.trendClimate ? issueYearOf(hcYears, forecastLeadOne) : undefined;
  const hindcast = onYear === undefined ? hc.climate : { ...hc.climate, recentreOn: onYear };
  const observedClimate = onYear === undefined || !obs.climate ? obs.climate : { ...obs.climate, recentreOn: onYear };
  const skill = skillReports({
    hindcast,
    observed: observedClimate,
    threshold: resolveThresholdSpec(ind, region.id),
    stageProbabilities: ruleProbabilities(config, ind, tier),
    gate: config.decision.skillGate,
    minHindcastYears: config.calibration.minHindcastYears,
    outOfSampleValue: true,
  });
  const tuned = tuneCostLoss(config, ind, source, region, hindcast, observedClimate);
  return { hindcast, observed: observedClimate, skill, tuned, problems };
}
