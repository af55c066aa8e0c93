/**
 * Series-level indicators: what the pipeline calls for one indicator × region. Pure computation.
 * Inputs are the read stage's RegionSeries in canonical units; the result is per member and day.
 * See DECISIONS.md for the choices made where the sources leave room.
 */
import type { IndicatorConfig } from '../config/types.ts';
import { ForelightError } from '../core/errors.ts';
import type { IndicatorSeries, IsoDate, Quantity, RegionSeries } from '../types.ts';
import { ehfSeverityRatio, excessHeatFactorSeries } from './excess-heat-factor-nairn-fawcett-2015.ts';
import { feelsLikeSeries } from './feels-like-series.ts';
import { datesOfMonth } from '../core/iso-dates.ts';
import { monthlySuitability, parseMalariaParams } from './malaria-monthly.ts';
import { checkAligned, countNaN, countOutOfRange, requireQuantity } from './series-checks.ts';
import { heatLoadSeries, hotDaysRunSeries, runningMeanSeries } from './threshold-series.ts';

// Helpers the pipeline needs around computeIndicator (climatology, monthly view, categories), one entry point.
export { ehfClimatology, type EhfClimatology } from './climatology.ts';
export { ehfSeverityCategory, ehfSeverityRatio, type EhfSeverity } from './excess-heat-factor-nairn-fawcett-2015.ts';
export { monthlySuitability, parseMalariaParams, suitabilityCategory, type MalariaParams, type MonthlySuitability, type SuitabilityCategory } from './malaria-monthly.ts';
export { dayOfYearPercentileThreshold } from './percentile.ts';

export type AntecedentQuantity = 'tmax' | 'tmin' | 'tmean';

/** Climatological values for one region (from hindcasts or observations, see the report to the pipeline). */
export interface IndicatorClimatology {
  /** T95: 95th percentile (numpy linear) of daily mean temperature DMT over the reference period, °C. */
  readonly dmtP95C?: number;
  /** EHF85: 85th percentile of the positive EHF values of the reference period, °C². */
  readonly ehf85?: number;
  /** Fixed daily threshold for hot-days-run / heat-load, °C. */
  readonly thresholdC?: number;
  /** Day-of-year threshold for hot-days-run / heat-load, °C (see dayOfYearPercentileThreshold); wins over thresholdC. */
  readonly dayOfYearThresholdC?: (date: IsoDate) => number;
}

export interface IndicatorContext {
  readonly climatology?: IndicatorClimatology;
  /** Analysed DMT of the (up to) 30 days before lead day 1, oldest first, °C. */
  readonly antecedentDmtC?: Float64Array;
  /** Analysed region values of the days right before lead day 1, oldest first, °C (same for all members). */
  readonly antecedent?: Readonly<Partial<Record<AntecedentQuantity, Float64Array>>>;
}

/** An IndicatorSeries plus plain-language notes on partial or assumed inputs (for the ledger and bulletins). */
export interface IndicatorResult extends IndicatorSeries {
  readonly notes: readonly string[];
}

const UNITS: Readonly<Record<IndicatorConfig['kind'], string>> = {
  'tmax-mean': 'degC', 'tmin-mean': 'degC', 'tmean-mean': 'degC', 'heat-index': 'degC', humidex: 'degC',
  'apparent-temperature': 'degC', 'wbgt-simplified': 'degC', 'excess-heat-factor': 'degC2', 'hot-days-run': 'days',
  'heat-load': 'degC day', 'malaria-suitability': '1',
};

const RUNNING_MEAN_OF: Readonly<Record<'tmax-mean' | 'tmin-mean' | 'tmean-mean', AntecedentQuantity>> = {
  'tmax-mean': 'tmax', 'tmin-mean': 'tmin', 'tmean-mean': 'tmean',
};

function badParam(ind: IndicatorConfig, what: string, fix: string): ForelightError {
  return new ForelightError('indicators', 'bad-param', `indicator "${ind.id}": ${what}`, fix);
}

function missingClimatology(ind: IndicatorConfig, region: string, what: string): ForelightError {
  return new ForelightError('indicators', 'missing-climatology', `indicator "${ind.id}", region ${region}: no ${what} in the climatology`, 'configure hindcasts or observations for this source so the climatology can be computed');
}

function windowDays(ind: IndicatorConfig): number {
  if (!(Number.isInteger(ind.windowDays) && ind.windowDays >= 1)) throw badParam(ind, `windowDays is ${ind.windowDays}`, 'use a whole number of days ≥ 1');
  return ind.windowDays;
}

/** Daily mean temperature: the tmean series, else (tmax + tmin)/2 (with a note). */
function meanTemperature(ind: IndicatorConfig, inputs: ReadonlyMap<Quantity, RegionSeries>, notes: string[]): RegionSeries {
  if (inputs.has('tmean') || !inputs.has('tmax') || !inputs.has('tmin')) return requireQuantity(inputs, 'tmean', ind.id, 'daily mean temperature');
  const tmax = requireQuantity(inputs, 'tmax', ind.id, 'daily mean temperature as (tmax + tmin)/2');
  const tmin = requireQuantity(inputs, 'tmin', ind.id, 'daily mean temperature as (tmax + tmin)/2');
  checkAligned([tmax, tmin]);
  const data = new Float64Array(tmax.data.length);
  for (let i = 0; i < data.length; i++) data[i] = (tmax.data[i] + tmin.data[i]) / 2;
  notes.push('daily mean temperature taken as (tmax + tmin)/2');
  return { ...tmax, quantity: 'tmean', data };
}

function dayThreshold(ind: IndicatorConfig, region: string, context: IndicatorContext): (date: IsoDate) => number {
  const fixed = ind.params.dayThresholdC;
  if (fixed !== undefined) {
    if (typeof fixed !== 'number' || !Number.isFinite(fixed)) throw badParam(ind, `params.dayThresholdC is "${String(fixed)}"`, 'give a number in degC, or leave it out to use the climatology');
    return () => fixed;
  }
  const c = context.climatology;
  if (c?.dayOfYearThresholdC) return c.dayOfYearThresholdC;
  const value = c?.thresholdC;
  if (value !== undefined) return () => value;
  throw missingClimatology(ind, region, 'daily threshold (and no params.dayThresholdC)');
}

function temperatureInput(ind: IndicatorConfig, inputs: ReadonlyMap<Quantity, RegionSeries>, fallback: AntecedentQuantity, notes: string[]): RegionSeries {
  const q = ind.params.quantity ?? fallback;
  if (q !== 'tmax' && q !== 'tmin' && q !== 'tmean') throw badParam(ind, `params.quantity is "${String(q)}"`, 'use tmax, tmin or tmean');
  return q === 'tmean' ? meanTemperature(ind, inputs, notes) : requireQuantity(inputs, q, ind.id, `${ind.kind} on ${q}`);
}

function finish(ind: IndicatorConfig, t: RegionSeries, data: Float64Array, outOfRange: number, notes: string[], days: readonly IsoDate[] = t.days): IndicatorResult {
  return { region: t.region, indicator: ind.id, units: UNITS[ind.kind], days, members: t.members, data, outOfRange, missing: countNaN(data), notes };
}

function excessHeatFactor(ind: IndicatorConfig, inputs: ReadonlyMap<Quantity, RegionSeries>, context: IndicatorContext, notes: string[]): IndicatorResult {
  const tmax = requireQuantity(inputs, 'tmax', ind.id, 'DMT = (Tmax_i + Tmin_i+1)/2');
  const tmin = requireQuantity(inputs, 'tmin', ind.id, 'DMT = (Tmax_i + Tmin_i+1)/2');
  checkAligned([tmax, tmin]);
  const t95 = context.climatology?.dmtP95C;
  if (t95 === undefined) throw missingClimatology(ind, tmax.region, 'T95 of daily mean temperature (dmtP95C)');
  const output = ind.params.output ?? 'ehf';
  if (output !== 'ehf' && output !== 'severity-ratio') throw badParam(ind, `params.output is "${String(output)}"`, 'use ehf or severity-ratio');
  const ehf85 = context.climatology?.ehf85;
  if (output === 'severity-ratio' && !(ehf85 !== undefined && ehf85 > 0)) throw missingClimatology(ind, tmax.region, 'positive EHF85');
  const data = new Float64Array(tmax.data.length);
  const { partialAcclimatisationDays } = excessHeatFactorSeries(tmax.data, tmin.data, tmax.members, tmax.days.length, t95, context.antecedentDmtC, data);
  if (partialAcclimatisationDays > 0) {
    notes.push(`EHF acclimatisation (30-day mean) rests on fewer than 30 analysed days for ${partialAcclimatisationDays / tmax.members} lead day(s): give antecedentDmtC`);
  }
  notes.push('EHF is NaN on the last 3 days (needs the next morning\'s Tmin and a 3-day forward window)');
  if (output === 'severity-ratio') for (let i = 0; i < data.length; i++) data[i] = ehfSeverityRatio(data[i], ehf85 as number);
  return finish(ind, tmax, data, 0, notes);
}

function malariaSuitability(ind: IndicatorConfig, inputs: ReadonlyMap<Quantity, RegionSeries>, notes: string[]): IndicatorResult {
  const p = parseMalariaParams(ind);
  const t = meanTemperature(ind, inputs, notes);
  const pr = requireQuantity(inputs, 'precip', ind.id, 'monthly rainfall for the Craig membership');
  checkAligned([t, pr]);
  const months = monthlySuitability(t.days, t.members, t.data, pr.data, p).filter((mo) => {
    const ok = mo.forecastDays / mo.daysInMonth >= p.minMonthCoverage;
    if (!ok) notes.push(`month ${mo.dataMonth} has forecast for ${mo.forecastDays} of ${mo.daysInMonth} days: no index for ${mo.targetMonth}`);
    return ok;
  });
  const days = months.flatMap((mo) => datesOfMonth(mo.targetMonth));
  const data = new Float64Array(t.members * days.length);
  let col = 0;
  for (const mo of months) {
    const n = datesOfMonth(mo.targetMonth).length;
    for (let m = 0; m < t.members; m++) data.fill(mo.index[m], m * days.length + col, m * days.length + col + n);
    col += n;
  }
  notes.push(`monthly index (month + ${p.lagMonths} lag) repeated on every day of the month it speaks for`);
  return finish(ind, t, data, 0, notes, days);
}

/**
 * Computes one indicator for one region, all members, at the daily step.
 * Throws ForelightError ('indicators') for a missing quantity, climatology or bad params; InputError/UnitError
 * for impossible input values or non-canonical units (naming region and quantity).
 */
export function computeIndicator(ind: IndicatorConfig, inputs: ReadonlyMap<Quantity, RegionSeries>, context: IndicatorContext = {}): IndicatorResult {
  const notes: string[] = [];
  switch (ind.kind) {
    case 'tmax-mean':
    case 'tmin-mean':
    case 'tmean-mean': {
      const q = RUNNING_MEAN_OF[ind.kind];
      const t = q === 'tmean' ? meanTemperature(ind, inputs, notes) : requireQuantity(inputs, q, ind.id, 'running mean');
      return finish(ind, t, runningMeanSeries(t, windowDays(ind), context.antecedent?.[q]), 0, notes);
    }
    case 'heat-index':
    case 'humidex':
    case 'apparent-temperature':
    case 'wbgt-simplified': {
      const r = feelsLikeSeries(ind.kind, inputs, ind.id, ind.params.basis);
      return finish(ind, r.template, r.data, countOutOfRange(r.data, r.raw), [...r.notes]);
    }
    case 'excess-heat-factor':
      return excessHeatFactor(ind, inputs, context, notes);
    case 'hot-days-run':
    case 'heat-load': {
      const t = temperatureInput(ind, inputs, 'tmax', notes);
      const thr = dayThreshold(ind, t.region, context);
      const ante = context.antecedent?.[t.quantity as AntecedentQuantity];
      const data = ind.kind === 'hot-days-run' ? hotDaysRunSeries(t, thr, ante) : heatLoadSeries(t, windowDays(ind), thr, ante);
      return finish(ind, t, data, 0, notes);
    }
    case 'malaria-suitability':
      return malariaSuitability(ind, inputs, notes);
  }
}
