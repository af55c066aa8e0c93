/**
 * What an indicator needs beyond the forecast itself, taken from the observations of the region: the Excess
 * Heat Factor climatology (T95, EHF85), a day-of-year threshold for hot-day counts, and the analysed days just
 * before lead day 1 (acclimatisation, running windows). Without observations configured, indicators that need a
 * climatology (EHF, hot-day counts without params.dayThresholdC) stop with an error naming what to configure.
 */
import { dayOfYearPercentileThreshold, ehfClimatology, type IndicatorClimatology, type IndicatorContext } from '../indicators/compute.ts';
import { addDays } from '../core/iso-dates.ts';
import type { IsoDate, Quantity, RegionSeries } from '../types.ts';

const ANTECEDENT_DAYS = 30;
/** Hot-day threshold: this percentile of the day-of-year climatology of Tmax, smoothed over this window (common practice, no source). */
const HOT_DAY_PERCENTILE = 90;
const HOT_DAY_WINDOW = 15;

/** Values of a one-member daily series on the given days (NaN where absent). */
export function valuesOnDays(
  series: { readonly days: readonly IsoDate[]; readonly data: Float64Array },
  days: readonly IsoDate[],
): Float64Array {
  const index = new Map(series.days.map((d, i) => [d, i]));
  const out = new Float64Array(days.length).fill(Number.NaN);
  days.forEach((d, i) => {
    const k = index.get(d);
    if (k !== undefined) out[i] = series.data[k];
  });
  return out;
}

function daysBefore(first: IsoDate, n: number): IsoDate[] {
  return Array.from({ length: n }, (_, i) => addDays(first, i - n));
}

/** EHF climatology and hot-day thresholds of one region from a one-member daily reference (observations). */
export function regionClimatology(reference: ReadonlyMap<Quantity, RegionSeries> | undefined): IndicatorClimatology {
  const tmax = reference?.get('tmax');
  const tmin = reference?.get('tmin');
  if (!tmax || tmax.members !== 1) return {};
  const byDate = new Map<IsoDate, number>(tmax.days.map((d, i) => [d, tmax.data[i]]));
  const out: { dmtP95C?: number; ehf85?: number; dayOfYearThresholdC?: (d: IsoDate) => number } = {
    dayOfYearThresholdC: dayOfYearPercentileThreshold(byDate, HOT_DAY_PERCENTILE, HOT_DAY_WINDOW),
  };
  if (tmin && tmin.members === 1 && tmin.days.length === tmax.days.length && tmax.days.length >= 34) {
    const c = ehfClimatology(tmax.data, tmin.data);
    out.dmtP95C = c.dmtP95C;
    out.ehf85 = c.ehf85;
  }
  return out;
}

/** Analysed values of the 30 days before `firstDay` from a one-member reference, oldest first. */
export function antecedentContext(
  reference: ReadonlyMap<Quantity, RegionSeries> | undefined,
  firstDay: IsoDate,
): Pick<IndicatorContext, 'antecedent' | 'antecedentDmtC'> {
  const tmax = reference?.get('tmax');
  const tmin = reference?.get('tmin');
  if (!tmax || !tmin || tmax.members !== 1 || tmin.members !== 1) return {};
  const days = daysBefore(firstDay, ANTECEDENT_DAYS);
  const tx = valuesOnDays(tmax, days);
  const tn = valuesOnDays(tmin, [...days, firstDay]);
  if (tx.every(Number.isNaN)) return {};
  const tmean = new Float64Array(days.length);
  const dmt = new Float64Array(days.length);
  for (let i = 0; i < days.length; i++) {
    tmean[i] = (tx[i] + tn[i]) / 2;
    // DMT_i = (Tmax_i + Tmin_(i+1))/2, Nairn & Fawcett (2015); the last one needs the first lead day's morning.
    dmt[i] = (tx[i] + tn[i + 1]) / 2;
  }
  const lastValid = Number.isNaN(dmt[dmt.length - 1]) ? dmt.subarray(0, dmt.length - 1) : dmt;
  return { antecedent: { tmax: tx, tmin: tn.subarray(0, days.length), tmean }, antecedentDmtC: lastValid };
}

/** The full context of one indicator for a series starting on `firstDay`. */
export function indicatorContext(
  climatology: IndicatorClimatology,
  reference: ReadonlyMap<Quantity, RegionSeries> | undefined,
  firstDay: IsoDate | undefined,
): IndicatorContext {
  return { climatology, ...(firstDay ? antecedentContext(reference, firstDay) : {}) };
}
