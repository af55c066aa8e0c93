/**
 * Exceedance probability per lead: P(X > threshold) = members with x > threshold / valid members (strictly
 * greater, checks.json row ens-exc-gt; no plotting-position correction), with the hindcast base rate, the
 * threshold's origin and flags. Flags are one line each and start with a code word:
 *   "uncalibrated: …"              hindcasts do not cover the lead (threshold not from the model climate)
 *   "thresholds unstable: only N hindcast years …"   fewer than minHindcastYears
 *   "few-members: …"               valid members < minMembers; with N members p moves in steps of 1/N
 *   "missing-members: k of N …"    members without a value at this lead
 *   "quantile-map-clipped: …"      the absolute threshold lies outside the observed climatology
 *   "beyond-table: k of N …"       members whose value at this lead lies beyond the formula's published table
 *                                  (heat index: capped at the table's top, not extrapolated)
 *   "threshold-degenerate: …"      the climate's threshold cannot be exceeded, or every past value and member
 *                                  exceed it (degenerate-threshold.ts): the probability is NaN (lead held; the
 *                                  bulletin says why, lead use `no-contrast`)
 *   "hindcast-members: …"          hindcasts have another ensemble size than the forecast. Operational hindcasts
 *                                  usually do (e.g. 11 against 51): thresholds and base rates pool all years ×
 *                                  members, so they stay calibrated, but skill was measured with the hindcast size.
 */
import type { ThresholdSpec } from '../config/types.ts';
import type { CalibrationConfig } from '../config/service-config.ts';
import type { LeadWindow } from '../types.ts';
import type { LeadProbability, SkillSummary, Threshold } from '../probability-types.ts';
import { distinctYears, leadSample } from './climate.ts';
import type { LeadClimate } from './lead-climate.ts';
import { leadLabel, leadMonth, type LeadValues } from './lead-tiers.ts';
import { absoluteThreshold, climatePercentileThreshold, quantileMappedThresholdObject } from './thresholds.ts';
import { percentileLinear } from '../core/percentile.ts';
import { degenerateThreshold } from './degenerate-threshold.ts';
import { climateTrendAt } from './trend-climate.ts';

/** Origin note of an absolute threshold applied to raw model values (no observations to map it through). */
const RAW_MODEL_NOTE = 'not quantile-mapped: no observations, raw model values';

/** Fraction of valid members above (or, with '>=', at or above) the threshold; NaN without valid members. */
export function exceedanceFraction(
  members: ArrayLike<number>,
  threshold: number,
  rule: '>' | '>=' = '>',
): { probability: number; valid: number; missing: number } {
  let valid = 0;
  let above = 0;
  for (let i = 0; i < members.length; i++) {
    const x = members[i];
    if (Number.isNaN(x)) continue;
    valid++;
    if (rule === '>' ? x > threshold : x >= threshold) above++;
  }
  return { probability: valid === 0 || Number.isNaN(threshold) ? Number.NaN : above / valid, valid, missing: members.length - valid };
}

export interface ProbabilityRequest {
  readonly source: string;
  readonly region: string;
  readonly indicator: string;
  readonly units: string;
  /** Forecast lead values (aggregateToLeads of the forecast's IndicatorSeries). */
  readonly forecast: LeadValues;
  /** Hindcasts of the same source/region/indicator/tier (stackYears), or null when the source has none. */
  readonly hindcast: LeadClimate | null;
  /** Observed lead values per hindcast year (members = 1), or null. */
  readonly observed: LeadClimate | null;
  /** resolveThresholdSpec(indicator, region). */
  readonly threshold: ThresholdSpec;
  readonly calibration: Pick<CalibrationConfig, 'minMembers' | 'minHindcastYears'>;
  /** Skill per lead index (1-based), from skill.ts; absent leads get null. */
  readonly skill?: ReadonlyMap<number, SkillSummary>;
}

/** Why the hindcasts cannot calibrate lead position l, or null when they can. */
function coverageProblem(req: ProbabilityRequest, l: number, lead: LeadWindow): string | null {
  const hc = req.hindcast;
  if (!hc) return `no hindcasts for source ${req.source} — configure sources[].hindcast-files to calibrate`;
  if (l >= hc.leads.length || leadSample(hc, l).length === 0) return `hindcasts of ${req.source} do not cover ${leadLabel(lead)}`;
  if (lead.tier === 'months' && leadMonth(hc.leads[l]) !== leadMonth(lead)) {
    return `hindcast ${leadLabel(lead)} starts ${hc.leads[l].start}, the forecast's ${lead.start} (different calendar month) — use hindcast starts in the forecast's month`;
  }
  return null;
}

function covers(c: LeadClimate | null, l: number): c is LeadClimate {
  return c !== null && l < c.leads.length && leadSample(c, l).length > 0;
}

/** Threshold for an uncalibrated lead: observed climatology percentile, the absolute value, or none. */
function fallbackThreshold(req: ProbabilityRequest, l: number, lead: LeadWindow): Threshold {
  const spec = req.threshold;
  if (spec.kind === 'absolute') return absoluteThreshold(spec, req.units, lead, 'not quantile-mapped: lead uncalibrated, raw model values');
  if (covers(req.observed, l)) {
    const t = climatePercentileThreshold(req.observed, l, spec.percentile, 'observations', lead);
    return { ...t, origin: `${t.origin} (not model climate)` };
  }
  return {
    value: Number.NaN,
    units: req.units,
    origin: `no threshold for the ${spec.percentile} percentile at ${leadLabel(lead)}: neither hindcasts nor observations cover it`,
  };
}

function fractionAbove(sorted: Float64Array, threshold: number): number {
  if (sorted.length === 0 || Number.isNaN(threshold)) return Number.NaN;
  let k = 0;
  while (k < sorted.length && sorted[k] <= threshold) k++;
  return (sorted.length - k) / sorted.length;
}

/**
 * The "normal year" frequency printed beside the probability: where observations cover the lead, the observed
 * frequency of the event (observations above the same percentile of the observations, or above the absolute
 * value), so a model bias never shows up as a normal-year rate; else the frequency in the lead's climate sample.
 */
function normalYearRate(req: ProbabilityRequest, l: number, climate: LeadClimate | null, threshold: number): number {
  if (covers(req.observed, l)) {
    const obs = leadSample(req.observed, l);
    const spec = req.threshold;
    return fractionAbove(obs, spec.kind === 'percentile' ? percentileLinear(obs, spec.percentile) : spec.value);
  }
  return climate ? fractionAbove(leadSample(climate, l), threshold) : Number.NaN;
}

/** degenerateThreshold for a threshold drawn from the climate at lead position l. */
function heldThreshold(
  req: ProbabilityRequest,
  hindcast: LeadClimate,
  l: number,
  lead: LeadWindow,
  threshold: Threshold,
  baseRate: number,
  probability: number,
): string | null {
  const spec = req.threshold;
  return degenerateThreshold({
    lead,
    threshold: threshold.value,
    units: threshold.units,
    modelFrequency: fractionAbove(leadSample(hindcast, l), threshold.value),
    normalYearRate: baseRate,
    intendedFrequency: spec.kind === 'percentile' ? 1 - spec.percentile / 100 : baseRate,
    probability,
  });
}

function countBeyond(mask: Uint8Array, members: number, nLeads: number, l: number): number {
  let n = 0;
  for (let m = 0; m < members; m++) n += mask[m * nLeads + l];
  return n;
}

/** Exceedance probabilities of one source × region × indicator × tier, one LeadProbability per forecast lead. */
export function leadProbabilities(req: ProbabilityRequest): LeadProbability[] {
  const { forecast, calibration, hindcast } = req;
  const nLeads = forecast.leads.length;
  const members = new Float64Array(forecast.members);
  return forecast.leads.map((lead, l) => {
    for (let m = 0; m < forecast.members; m++) members[m] = forecast.values[m * nLeads + l];
    const flags: string[] = [];
    const problem = coverageProblem(req, l, lead);
    let threshold: Threshold;
    let climate: LeadClimate | null = null;
    let fromClimate = false;
    if (problem !== null || hindcast === null) {
      flags.push(`uncalibrated: ${problem}`);
      threshold = fallbackThreshold(req, l, lead);
      if (covers(req.observed, l)) climate = req.observed;
    } else {
      climate = hindcast;
      const nYears = distinctYears(hindcast);
      if (nYears < calibration.minHindcastYears) {
        flags.push(`thresholds unstable: only ${nYears} hindcast years (minimum ${calibration.minHindcastYears})`);
      }
      const spec = req.threshold;
      if (spec.kind === 'percentile') {
        threshold = climatePercentileThreshold(hindcast, l, spec.percentile, 'hindcasts', lead);
        fromClimate = true;
      } else if (covers(req.observed, l)) {
        // Every tier (days, weeks, months) where observations cover the lead: DECISIONS.md "Bias correction".
        fromClimate = true;
        const qm = quantileMappedThresholdObject(spec, req.observed, hindcast, l, lead);
        threshold = qm.threshold;
        if (qm.clipped)
          flags.push(
            `quantile-map-clipped: ${spec.value} ${spec.units} lies outside the observed climatology at ${leadLabel(lead)}; mapped to the model climate's extreme`,
          );
      } else {
        threshold = absoluteThreshold(spec, req.units, lead, RAW_MODEL_NOTE);
      }
    }
    if (hindcast && hindcast.members !== forecast.members) {
      flags.push(
        `hindcast-members: hindcasts have ${hindcast.members} members per year, the forecast ${forecast.members}; thresholds pool all hindcast years × members, skill was measured with ${hindcast.members}-member ensembles`,
      );
    }
    const beyond = forecast.beyondTable ? countBeyond(forecast.beyondTable, forecast.members, nLeads, l) : 0;
    if (beyond > 0)
      flags.push(
        `beyond-table: ${beyond} of ${forecast.members} members lie beyond the published table at ${leadLabel(lead)}; their values are capped at its top, not extrapolated`,
      );
    const exc = exceedanceFraction(members, threshold.value);
    if (exc.missing > 0) flags.push(`missing-members: ${exc.missing} of ${forecast.members} members have no value at ${leadLabel(lead)}`);
    if (exc.valid < calibration.minMembers) {
      const step = exc.valid > 0 ? ` in steps of 1/${exc.valid} (${Math.round(1000 / exc.valid) / 10} %)` : '';
      flags.push(`few-members: ${exc.valid} valid members < ${calibration.minMembers}; the probability moves${step}`);
    }
    const baseRate = normalYearRate(req, l, climate, threshold.value);
    const held = fromClimate && hindcast ? heldThreshold(req, hindcast, l, lead, threshold, baseRate, exc.probability) : null;
    if (held) flags.push(`threshold-degenerate: ${held}`);
    const trend = problem === null ? climateTrendAt(hindcast, req.observed, l) : null;
    return {
      source: req.source,
      region: req.region,
      indicator: req.indicator,
      lead,
      probability: held ? Number.NaN : exc.probability,
      baseRate,
      members: forecast.members,
      validMembers: exc.valid,
      threshold,
      operator: '>',
      flags,
      skill: req.skill?.get(lead.index) ?? null,
      calibrated: problem === null,
      ...(trend ? { climateTrend: trend } : {}),
    };
  });
}
