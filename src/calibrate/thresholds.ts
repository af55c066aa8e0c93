/**
 * Exceedance thresholds per lead: percentiles of the model climate (hindcasts at the same lead, all years ×
 * members, starts within ±windowDays of the forecast's day of year — the caller passes the matching hindcasts),
 * a leave-one-year-out variant for verification, and absolute thresholds with empirical quantile mapping.
 */
import { UnitError } from '../core/errors.ts';
import type { IndicatorConfig, ThresholdSpec } from '../config/types.ts';
import type { LeadWindow } from '../types.ts';
import type { Threshold } from '../probability-types.ts';
import { leadSample, yearMembers, yearSpan } from './climate.ts';
import type { LeadClimate } from './lead-climate.ts';
import { leadLabel } from './lead-tiers.ts';
import { recentreNote } from './trend-climate.ts';
import { percentileLinear, percentileOfSortedWithout, percentRankOfSorted, sortValid } from '../core/percentile.ts';

/** The region's threshold spec: its override in `regionThresholds`, else the indicator's. */
export function resolveThresholdSpec(indicator: IndicatorConfig, region: string): ThresholdSpec {
  return indicator.regionThresholds[region] ?? indicator.threshold;
}

/** "90th", "1st", "2nd", "23rd", "11th", "97.5th". */
export function ordinal(q: number): string {
  if (!Number.isInteger(q)) return `${q}th`;
  const teen = q % 100 >= 11 && q % 100 <= 13;
  const suffix = teen ? 'th' : (['th', 'st', 'nd', 'rd'][q % 10] ?? 'th');
  return `${q}${suffix}`;
}

function fmt(x: number): string {
  return Number.isFinite(x) ? String(Math.round(x * 100) / 100) : 'NaN';
}

/** q-th percentile (Hyndman-Fan type 7) of the climate sample at lead position l, with its origin text. */
export function climatePercentileThreshold(
  c: LeadClimate,
  l: number,
  q: number,
  what: 'hindcasts' | 'observations',
  lead: LeadWindow,
): Threshold {
  const sample = leadSample(c, l);
  return {
    value: percentileLinear(sample, q),
    units: c.units,
    origin: `${ordinal(q)} percentile of ${what} ${yearSpan(c.years)} (${sample.length} values${recentreNote(c)}), ${leadLabel(lead)}`,
  };
}

/**
 * Leave-one-year-out thresholds at lead position l: entry y is the q-th percentile of all years except year y,
 * by the unbiased Weibull plotting position (type 6, see core/percentile.ts) so that the observed side (19
 * values) and the forecast side (19 × members values) define events of the same frequency, 1 − q/100.
 */
export function leaveOneYearOutThresholds(c: LeadClimate, l: number, q: number): Float64Array {
  const out = new Float64Array(c.years.length);
  if (c.recentreOn !== undefined) {
    // Trend-aware: each held-out year has its own re-centred sample (trend fitted without it), trend-climate.ts.
    c.years.forEach((year, y) => (out[y] = percentileLinear(leadSample(c, l, year), q, 'weibull')));
    return out;
  }
  const all = leadSample(c, l);
  for (let y = 0; y < c.years.length; y++) {
    const removed: number[] = [];
    for (let k = 0; k < c.years.length; k++) if (c.years[k] === c.years[y]) removed.push(...yearMembers(c, k, l));
    out[y] = percentileOfSortedWithout(all, sortValid(removed), q, 'weibull');
  }
  return out;
}

function requireUnits(spec: { value: number; units: string }, units: string): void {
  if (spec.units !== units) {
    throw new UnitError(
      `threshold ${spec.value} ${spec.units} cannot be compared with indicator values in ${units}`,
      `write the threshold in ${units} in the YAML`,
    );
  }
}

/** Absolute threshold as configured; throws when its units are not the indicator's. */
export function absoluteThreshold(spec: { value: number; units: string }, units: string, lead: LeadWindow, note: string): Threshold {
  requireUnits(spec, units);
  return { value: spec.value, units, origin: `absolute ${fmt(spec.value)} ${units}, ${leadLabel(lead)}${note ? ` (${note})` : ''}` };
}

/**
 * Empirical quantile mapping of an absolute threshold (common practice in bias adjustment; e.g. Déqué 2007,
 * "Frequency of precipitation and temperature extremes over France in an anthropogenic scenario: model results
 * and statistical correction according to observed values", Global and Planetary Change 57:16-26): the observed
 * climatology's non-exceedance percent of the value (inverse of the type-7 percentile, linear between order
 * statistics) is mapped to the model climate's percentile at the same lead. Identical climates return the value
 * unchanged. A value outside the observed range maps to the model's extreme and `clipped` is set (no
 * extrapolation). `excludeYear` leaves one year out of both climates (verification).
 */
export function quantileMappedThreshold(
  value: number,
  observed: LeadClimate,
  model: LeadClimate,
  l: number,
  excludeYear?: number,
): { value: number; percent: number; clipped: boolean; observedValues: number; modelValues: number } {
  const obs = leadSample(observed, l, excludeYear);
  const mod = leadSample(model, l, excludeYear);
  const { percent, clipped } = percentRankOfSorted(obs, value);
  const mapped = Number.isNaN(percent) ? Number.NaN : percentileLinear(mod, percent);
  return { value: mapped, percent, clipped, observedValues: obs.length, modelValues: mod.length };
}

/** The quantile-mapped threshold as a Threshold with its origin text. */
export function quantileMappedThresholdObject(
  spec: { value: number; units: string },
  observed: LeadClimate,
  model: LeadClimate,
  l: number,
  lead: LeadWindow,
): { threshold: Threshold; clipped: boolean } {
  requireUnits(spec, model.units);
  requireUnits({ value: spec.value, units: observed.units }, model.units);
  const m = quantileMappedThreshold(spec.value, observed, model, l);
  const origin =
    `absolute ${fmt(spec.value)} ${model.units} quantile-mapped to ${fmt(m.value)} ${model.units} ` +
    `(percent rank ${fmt(m.percent)} in observations ${yearSpan(observed.years)}, ${m.observedValues} values → same percentile of ` +
    `hindcasts ${yearSpan(model.years)}, ${m.modelValues} values${recentreNote(model)}), ${leadLabel(lead)}`;
  return { threshold: { value: m.value, units: model.units, origin }, clipped: m.clipped };
}
