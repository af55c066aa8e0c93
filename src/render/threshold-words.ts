/**
 * A lead's threshold in an officer's words: the value in its units (a malaria index as a fraction 0–1 with its
 * category word), and for a percentile of the model climate how rarely the past years went above it ("higher than
 * in 9 of 10 past years") instead of the raw percentile. run.json and the CAP parameters keep the numbers.
 */
import type { IndicatorConfig, ThresholdSpec } from '../config/types.ts';
import { parseMalariaParams, suitabilityCategory } from '../indicators/malaria-monthly.ts';
import type { LeadProbability } from '../probability-types.ts';
import type { Translate } from './catalogue.ts';
import { formatNumber, formatThreshold } from './locale-format.ts';

/** Denominators tried, smallest first, for "n of N past years" (a percentile with more digits falls back to 1000). */
const DENOMINATORS = [10, 20, 100, 200, 1000] as const;

/** The percentile as "n of N": 90 → 9 of 10, 75 → 15 of 20, 99 → 99 of 100, 99.5 → 199 of 200. */
export function pastYearsShare(percentile: number): { readonly n: number; readonly of: number } {
  for (const of of DENOMINATORS) {
    const n = (percentile * of) / 100;
    if (Math.abs(n - Math.round(n)) < 1e-9) return { n: Math.round(n), of };
  }
  return { n: Math.round(percentile * 10), of: 1000 };
}

/**
 * An index 0..1 with two decimals, never rounded up to the scale's end: 0.995 is "0.995" and 0.9996 "0.999",
 * not "1.00" (a threshold printed as 1 reads as "above the whole scale").
 */
export function formatIndex(locale: string, value: number): string {
  const nearEnd = value < 1 && Math.round(value * 100) >= 100;
  return formatNumber(locale, nearEnd ? Math.floor(value * 1000) / 1000 : value, nearEnd ? 3 : 2, 2);
}

/** A threshold number with its unit; a dimensionless index (units "1") by {@link formatIndex}. */
export function thresholdNumber(locale: string, value: number, units: string): string {
  return units === '1' ? formatIndex(locale, value) : formatThreshold(locale, value, units);
}

function valueWords(t: Translate, locale: string, ind: IndicatorConfig | undefined, p: LeadProbability): string {
  if (ind?.kind === 'excess-heat-factor')
    return p.threshold.value === 0 ? t('threshold.ehfAny') : t('threshold.ehf', { value: formatNumber(locale, p.threshold.value, 1) });
  if (ind?.kind === 'malaria-suitability') {
    const category = suitabilityCategory(p.threshold.value, parseMalariaParams(ind)) ?? 'unsuitable';
    return t('threshold.index', { value: formatIndex(locale, p.threshold.value), category });
  }
  return thresholdNumber(locale, p.threshold.value, p.threshold.units);
}

/** Threshold in plain words for the e-mail body, the headline and the CAP description. */
export function thresholdWords(
  t: Translate,
  locale: string,
  ind: IndicatorConfig | undefined,
  spec: ThresholdSpec | undefined,
  p: LeadProbability | undefined,
): string {
  if (!p || !Number.isFinite(p.threshold.value)) return t('threshold.none');
  const value = valueWords(t, locale, ind, p);
  if (spec?.kind !== 'percentile') return value;
  return t('threshold.percentile', { value, ...pastYearsShare(spec.percentile) });
}

/** Several leads' thresholds in words: one value when they print alike, else "lowest to highest"; '' without any. */
export function rangeWords(t: Translate, probabilities: readonly LeadProbability[], words: (p: LeadProbability) => string): string {
  const finite = probabilities.filter((p) => Number.isFinite(p.threshold.value));
  if (finite.length === 0) return '';
  const low = finite.reduce((a, p) => (p.threshold.value < a.threshold.value ? p : a));
  const high = finite.reduce((a, p) => (p.threshold.value > a.threshold.value ? p : a));
  const [lo, hi] = [words(low), words(high)];
  return lo === hi ? lo : t('threshold.range', { low: lo, high: hi });
}

/** The thresholds of a range's leads as printed beside it: {@link thresholdWords} over the range of their values. */
export function thresholdRangeWords(
  t: Translate,
  locale: string,
  ind: IndicatorConfig | undefined,
  spec: ThresholdSpec | undefined,
  probabilities: readonly LeadProbability[],
): string {
  const value = rangeWords(t, probabilities, (p) => valueWords(t, locale, ind, p));
  if (value === '') return t('threshold.none');
  return spec?.kind === 'percentile' ? t('threshold.percentile', { value, ...pastYearsShare(spec.percentile) }) : value;
}
