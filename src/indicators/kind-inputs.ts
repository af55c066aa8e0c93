/**
 * Inputs several indicator kinds share: the daily mean temperature, the running-mean window, a daily threshold
 * from params or the climatology, and the typed errors for a bad parameter or a missing climatology.
 */
import { ForelightError } from '../core/errors.ts';
import type { IsoDate, Quantity, RegionSeries } from '../types.ts';
import type { AntecedentQuantity, IndicatorContext, IndicatorSpec } from './definition.ts';
import { checkAligned, requireQuantity } from './series-checks.ts';

export function badParam(ind: Pick<IndicatorSpec<string, unknown>, 'id'>, what: string, fix: string): ForelightError {
  return new ForelightError('indicators', 'bad-param', `indicator "${ind.id}": ${what}`, fix);
}

export function missingClimatology(ind: IndicatorSpec<string, unknown>, region: string, what: string): ForelightError {
  return new ForelightError(
    'indicators',
    'missing-climatology',
    `indicator "${ind.id}", region ${region}: no ${what} in the climatology`,
    'configure hindcasts or observations for this source so the climatology can be computed',
  );
}

export function windowDays(ind: IndicatorSpec<string, unknown>): number {
  if (!(Number.isInteger(ind.windowDays) && ind.windowDays >= 1))
    throw badParam(ind, `windowDays is ${ind.windowDays}`, 'use a whole number of days ≥ 1');
  return ind.windowDays;
}

/** Daily mean temperature: the tmean series, else (tmax + tmin)/2 (with a note). */
export function meanTemperature(
  ind: IndicatorSpec<string, unknown>,
  inputs: ReadonlyMap<Quantity, RegionSeries>,
  notes: string[],
): RegionSeries {
  if (inputs.has('tmean') || !inputs.has('tmax') || !inputs.has('tmin'))
    return requireQuantity(inputs, 'tmean', ind.id, 'daily mean temperature');
  const tmax = requireQuantity(inputs, 'tmax', ind.id, 'daily mean temperature as (tmax + tmin)/2');
  const tmin = requireQuantity(inputs, 'tmin', ind.id, 'daily mean temperature as (tmax + tmin)/2');
  checkAligned([tmax, tmin]);
  const data = new Float64Array(tmax.data.length);
  for (let i = 0; i < data.length; i++) data[i] = (tmax.data[i] + tmin.data[i]) / 2;
  notes.push('daily mean temperature taken as (tmax + tmin)/2');
  return { ...tmax, quantity: 'tmean', data };
}

/** params of the kinds that count or sum days above a daily threshold. */
export type DailyThresholdParams = { readonly quantity?: AntecedentQuantity; readonly dayThresholdC?: number };

/** The daily threshold: params.dayThresholdC, else the climatology's day-of-year or fixed threshold. */
export function dayThreshold(
  ind: IndicatorSpec<string, DailyThresholdParams>,
  region: string,
  context: IndicatorContext,
): (date: IsoDate) => number {
  const fixed = ind.params.dayThresholdC;
  if (fixed !== undefined) {
    if (typeof fixed !== 'number' || !Number.isFinite(fixed))
      throw badParam(ind, `params.dayThresholdC is "${String(fixed)}"`, 'give a number in degC, or leave it out to use the climatology');
    return () => fixed;
  }
  const c = context.climatology;
  if (c?.dayOfYearThresholdC) return c.dayOfYearThresholdC;
  const value = c?.thresholdC;
  if (value !== undefined) return () => value;
  throw missingClimatology(ind, region, 'daily threshold (and no params.dayThresholdC)');
}

/** The temperature series named by params.quantity (default `fallback`). */
export function temperatureInput(
  ind: IndicatorSpec<string, DailyThresholdParams>,
  inputs: ReadonlyMap<Quantity, RegionSeries>,
  fallback: AntecedentQuantity,
  notes: string[],
): RegionSeries {
  const q = ind.params.quantity ?? fallback;
  if (q !== 'tmax' && q !== 'tmin' && q !== 'tmean') throw badParam(ind, `params.quantity is "${String(q)}"`, 'use tmax, tmin or tmean');
  return q === 'tmean' ? meanTemperature(ind, inputs, notes) : requireQuantity(inputs, q, ind.id, `${ind.kind} on ${q}`);
}

/** Schema of the daily-threshold params (YAML keys). */
export const DAILY_THRESHOLD_PARAMS = {
  quantity: { enum: ['tmax', 'tmin', 'tmean'], default: 'tmax', description: 'Daily temperature compared with the threshold.' },
  'day-threshold-c': { type: 'number', description: "Fixed daily threshold in degC; default: the climatology's day-of-year threshold." },
} as const;
