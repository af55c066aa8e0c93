/**
 * The technical note's sentence on a trend-aware climate (calibrate/trend-climate.ts): "normal year" then means a
 * normal year for the issue year, allowing for the trend of the hindcast years, and the note gives that trend per
 * decade (the range over the tier's leads; observed beside the model's where observations cover the leads).
 */
import type { LeadProbability } from '../types.ts';
import type { Translate } from './catalogue.ts';
import { formatNumber } from './locale-format.ts';
import { UNIT_SYMBOLS } from './view-model.ts';

function span(locale: string, values: readonly number[], units: string): string {
  const lo = Math.min(...values);
  const hi = Math.max(...values);
  const symbol = UNIT_SYMBOLS[units] ?? units;
  const f = (v: number) => `${v > 0 ? '+' : ''}${formatNumber(locale, v, 2, 2)}${symbol ? `\u00a0${symbol}` : ''}`;
  return Math.abs(hi - lo) < 0.005 ? f((lo + hi) / 2) : `${f(lo)} … ${f(hi)}`;
}

/** One line for the technical note, or null when no lead of the tier has a trend-aware climate. */
export function trendLine(t: Translate, locale: string, probabilities: readonly LeadProbability[]): string | null {
  const trends = probabilities.flatMap((p) => (p.climateTrend ? [p.climateTrend] : []));
  if (trends.length === 0) return null;
  const first = trends[0];
  const model = trends.flatMap((c) => (c.hindcastPerDecade === null ? [] : [c.hindcastPerDecade]));
  const observed = trends.flatMap((c) => (c.observedPerDecade === null ? [] : [c.observedPerDecade]));
  // The normal-year rate is the observed frequency where observations exist, so their trend names the direction.
  const lead = observed.length > 0 ? observed : model;
  const mean = lead.reduce((a, b) => a + b, 0) / Math.max(lead.length, 1);
  return t('method.trend', {
    year: first.onYear,
    years: first.lastYear - first.firstYear + 1,
    first: first.firstYear,
    last: first.lastYear,
    direction: mean > 0 ? 'warming' : mean < 0 ? 'cooling' : 'flat',
    model: model.length > 0 ? span(locale, model, first.units) : '–',
    observed: observed.length > 0 ? span(locale, observed, first.units) : 'none',
  });
}
