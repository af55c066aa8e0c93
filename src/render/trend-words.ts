/**
 * The technical note's sentence on a trend-aware climate (calibrate/trend-climate.ts): "normal year" then means a
 * normal year for the issue year, allowing for the trend of the hindcast years, and the note gives that trend per
 * decade (the range over the tier's leads; observed beside the model's where observations cover the leads). A trend
 * the data do not tell from zero is not applied, and the note says "no clear trend" with the fitted rates.
 */
import type { LeadProbability, TrendFit } from '../probability-types.ts';
import type { Translate } from './catalogue.ts';
import { formatNumber, UNIT_SYMBOLS } from './locale-format.ts';

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
  const model = trends.flatMap((c) => (c.hindcast ? [c.hindcast] : []));
  const observed = trends.flatMap((c) => (c.observed ? [c.observed] : []));
  const rates = (fits: readonly TrendFit[]) =>
    fits.length > 0
      ? span(
          locale,
          fits.map((f) => f.perDecade),
          first.units,
        )
      : 'none';
  const years = { years: first.lastYear - first.firstYear + 1, first: first.firstYear, last: first.lastYear };
  const [modelUsed, observedUsed] = [model.filter((f) => f.applied), observed.filter((f) => f.applied)];
  // No trend told from zero (calibrate/trend-climate.ts): the climate is used as it is, and the note says so.
  if (modelUsed.length === 0 && observedUsed.length === 0)
    return t('method.noTrend', { ...years, model: rates(model), observed: rates(observed) });
  // Named only when every applied fit, past forecasts and observations alike, points the same way: a "warming"
  // beside a falling rate would contradict itself. "Warming/cooling" only for temperatures; other units rise or fall.
  const used = [...modelUsed, ...observedUsed];
  const sign = used.every((f) => f.perDecade > 0) ? 1 : used.every((f) => f.perDecade < 0) ? -1 : 0;
  const temperature = /^(degC|K)(2|\^2)?$/.test(first.units);
  const direction = sign === 0 ? 'mixed' : temperature ? (sign > 0 ? 'warming' : 'cooling') : sign > 0 ? 'rising' : 'falling';
  const unclear = (all: readonly TrendFit[], used: readonly TrendFit[]) => all.length > 0 && used.length === 0;
  return t('method.trend', {
    ...years,
    year: first.onYear,
    direction,
    model: rates(modelUsed),
    observed: rates(observedUsed),
    unclear: unclear(model, modelUsed) ? 'model' : unclear(observed, observedUsed) ? 'observed' : 'none',
  });
}
