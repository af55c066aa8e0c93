/**
 * Monthly malaria climate suitability from daily ensemble series, with the rain → transmission lag.
 * Per member and calendar month of the forecast ("data month"):
 *   T = mean of the daily mean temperatures of the month's forecast days;
 *   R = mean daily rate (mm/day) × days in that month (checks.json row monthly_total_from_mean_rate);
 *   index = min(temperature term, f_R Craig 1999)   (fuzzy AND, as Craig et al. 1999 combine memberships)
 * The temperature term is ONE of (params.temperatureModel), never two at once, so warmth is counted once:
 *   'craig-1999' (default) = f_T of Craig et al. 1999;
 *   'martens-detinova' = p^n (Martens 1997 p, Detinova 1962 n for params.species) divided by its maximum over
 *     temperature; 'mordecai-2013' = relative R0 (P. falciparum only). Each replaces f_T; none is combined with it.
 * The index speaks for targetMonth = dataMonth + params.lagMonths (1 or 2): rain and warmth in month m shape
 * transmission in month m + lag, so a forecast reaching month 2 informs months 2 + lag.
 * A data month with forecast days for less than `minMonthCoverage` (default 0.5, common practice, no source) of
 * its calendar days gets NaN. Categories: unsuitable < marginalAt (0.25) ≤ marginal < suitableAt (0.75) ≤ suitable
 * (defaults are common practice, no source).
 */
import { badParam } from './kind-inputs.ts';
import { daysInCalendarMonth } from '../core/calendar-days.ts';
import type { IsoDate, ModelDays } from '../types.ts';
import { daysInMonth, addMonths, monthOf } from '../core/iso-dates.ts';
import { relativeR0Mordecai2013 } from './relative-r0-mordecai-2013.ts';
import { DETINOVA_1962, type PlasmodiumSpecies } from './sporogony-detinova-1962.ts';
import { craigRainfallMembership1999, craigTemperatureMembership1999 } from './suitability-craig-1999.ts';
import { maxSurvivalThroughSporogony, relativeSurvivalThroughSporogony } from './survival-martens-1997.ts';

export const MALARIA_TEMPERATURE_MODELS = ['craig-1999', 'martens-detinova', 'mordecai-2013'] as const;
export type MalariaTemperatureModel = (typeof MALARIA_TEMPERATURE_MODELS)[number];

export interface MalariaParams {
  readonly species: PlasmodiumSpecies;
  readonly temperatureModel: MalariaTemperatureModel;
  readonly lagMonths: 1 | 2;
  readonly minMonthCoverage: number;
  readonly marginalAt: number;
  readonly suitableAt: number;
}

export interface MonthlySuitability {
  /** `YYYY-MM` whose forecast weather was used. */
  readonly dataMonth: string;
  /** `YYYY-MM` the index speaks for (dataMonth + lagMonths). */
  readonly targetMonth: string;
  readonly forecastDays: number;
  readonly daysInMonth: number;
  /** Per member: monthly mean temperature °C, monthly rain total mm, index 0..1 (NaN when unknown). */
  readonly tempMeanC: Float64Array;
  readonly rainTotalMm: Float64Array;
  readonly index: Float64Array;
}

export type SuitabilityCategory = 'unsuitable' | 'marginal' | 'suitable';

/** Validates `params` of a malaria-suitability indicator and fills the defaults. */
export function parseMalariaParams(ind: { readonly id: string; readonly params: Readonly<Record<string, unknown>> }): MalariaParams {
  const p = ind.params;
  const speciesRaw = p.species ?? 'falciparum';
  const species =
    speciesRaw === 'falciparum' || speciesRaw === 'P. falciparum'
      ? 'falciparum'
      : speciesRaw === 'vivax' || speciesRaw === 'P. vivax'
        ? 'vivax'
        : null;
  if (!species) throw badParam(ind, `params.species is "${String(speciesRaw)}"`, 'use falciparum or vivax');
  const temperatureModel = MALARIA_TEMPERATURE_MODELS.find((m) => m === (p.temperatureModel ?? 'craig-1999'));
  if (!temperatureModel) {
    throw badParam(
      ind,
      `params.temperatureModel is "${String(p.temperatureModel)}"`,
      `use one of ${MALARIA_TEMPERATURE_MODELS.join(', ')}`,
    );
  }
  if (temperatureModel === 'mordecai-2013' && species !== 'falciparum') {
    throw badParam(
      ind,
      'params.temperatureModel mordecai-2013 is fitted for P. falciparum only',
      'use species falciparum, or the craig-1999 or martens-detinova model',
    );
  }
  const lagMonths = p.lagMonths ?? 1;
  if (lagMonths !== 1 && lagMonths !== 2) throw badParam(ind, `params.lagMonths is ${String(lagMonths)}`, 'use 1 or 2');
  const num = (key: string, dflt: number): number => {
    const v = p[key] ?? dflt;
    if (typeof v !== 'number' || !(v >= 0 && v <= 1)) throw badParam(ind, `params.${key} is ${String(v)}`, 'use a number from 0 to 1');
    return v;
  };
  const marginalAt = num('marginalAt', 0.25);
  const suitableAt = num('suitableAt', 0.75);
  if (!(marginalAt < suitableAt))
    throw badParam(ind, `params.marginalAt ${marginalAt} is not below params.suitableAt ${suitableAt}`, 'make marginalAt < suitableAt');
  return { species, temperatureModel, lagMonths, minMonthCoverage: num('minMonthCoverage', 0.5), marginalAt, suitableAt };
}

/** Category of an index value (NaN → null). */
export function suitabilityCategory(index: number, p: Pick<MalariaParams, 'marginalAt' | 'suitableAt'>): SuitabilityCategory | null {
  if (Number.isNaN(index)) return null;
  if (index < p.marginalAt) return 'unsuitable';
  return index < p.suitableAt ? 'marginal' : 'suitable';
}

/** Maximum of p^n per species, computed once (grid scan). */
const MAX_SURVIVAL = new Map<PlasmodiumSpecies, number>();

/** The one temperature term of the index (0..1). */
function temperatureModel(p: MalariaParams): (tC: number) => number {
  if (p.temperatureModel === 'craig-1999') return craigTemperatureMembership1999;
  if (p.temperatureModel === 'mordecai-2013') return relativeR0Mordecai2013;
  const k = DETINOVA_1962[p.species];
  if (!MAX_SURVIVAL.has(p.species)) MAX_SURVIVAL.set(p.species, maxSurvivalThroughSporogony(k).value);
  const max = MAX_SURVIVAL.get(p.species) as number;
  return (tC) => relativeSurvivalThroughSporogony(tC, k, max);
}

/**
 * Monthly index per member and calendar month. `tMeanC` (°C) and `precipMmPerDay` are member-major over `days`.
 * With `modelCalendar` (daily data of a model calendar) the months are the model's, their lengths the model's
 * (a 360_day month has 30 days; src/read/DECISIONS.md §3). Negative rain down to the packing tolerance is counted
 * as 0 (Math.max keeps NaN as NaN).
 */
export function monthlySuitability(
  days: readonly IsoDate[],
  members: number,
  tMeanC: Float64Array,
  precipMmPerDay: Float64Array,
  p: MalariaParams,
  { modelCalendar }: { readonly modelCalendar?: ModelDays } = {},
): MonthlySuitability[] {
  const monthAt = (i: number) => monthOf(modelCalendar ? modelCalendar.days[i] : days[i]);
  const lengthOf = (month: string) => {
    const [y, m] = [Number(month.slice(0, 4)), Number(month.slice(5, 7))];
    return modelCalendar ? daysInCalendarMonth(modelCalendar.calendar, y, m) : daysInMonth(y, m);
  };
  const steps = days.length;
  const model = temperatureModel(p);
  const result: MonthlySuitability[] = [];
  let start = 0;
  while (start < steps) {
    const month = monthAt(start);
    let end = start;
    while (end < steps && monthAt(end) === month) end++;
    const nDays = lengthOf(month);
    const covered = (end - start) / nDays >= p.minMonthCoverage;
    const tempMeanC = new Float64Array(members);
    const rainTotalMm = new Float64Array(members);
    const index = new Float64Array(members);
    for (let m = 0; m < members; m++) {
      let tSum = 0;
      let rSum = 0;
      for (let i = start; i < end; i++) {
        tSum += tMeanC[m * steps + i];
        rSum += Math.max(0, precipMmPerDay[m * steps + i]);
      }
      tempMeanC[m] = tSum / (end - start);
      rainTotalMm[m] = (rSum / (end - start)) * nDays;
      index[m] = covered ? Math.min(model(tempMeanC[m]), craigRainfallMembership1999(rainTotalMm[m])) : NaN;
    }
    result.push({
      dataMonth: month,
      targetMonth: addMonths(month, p.lagMonths),
      forecastDays: end - start,
      daysInMonth: nDays,
      tempMeanC,
      rainTotalMm,
      index,
    });
    start = end;
  }
  return result;
}
