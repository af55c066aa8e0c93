/**
 * Climatological constants of the Excess Heat Factor from one contiguous daily reference series (observations,
 * or one hindcast member chain), Nairn & Fawcett (2015) [nairnFawcett2015]:
 *   T95   = 95th percentile of all DMT_i = (Tmax_i + Tmin_(i+1))/2 of the period,
 *   EHF85 = 85th percentile of the positive EHF values of the period (days with a full 30-day T30 only).
 * Percentiles are numpy 'linear' (Hyndman & Fan 1996 type 7). NaN days are skipped for T95 and give NaN EHF.
 */
import { dailyMeanTemperatureDmtC, excessHeatFactorSeries } from './excess-heat-factor-nairn-fawcett-2015.ts';
import { percentileLinear } from '../core/percentile.ts';

export interface EhfClimatology {
  readonly dmtP95C: number;
  readonly ehf85: number;
  /** Number of positive EHF days behind EHF85. */
  readonly positiveDays: number;
}

/** T95 and EHF85 from daily Tmax/Tmin (°C) of one reference period, same days, at least 34 days. */
export function ehfClimatology(tmaxC: Float64Array, tminC: Float64Array): EhfClimatology {
  const n = tmaxC.length;
  if (tminC.length !== n || n < 34)
    throw new RangeError(`ehfClimatology needs equal-length Tmax/Tmin of at least 34 days, got ${n}/${tminC.length}`);
  const dmt = new Float64Array(n - 1);
  for (let i = 0; i + 1 < n; i++) dmt[i] = dailyMeanTemperatureDmtC(tmaxC[i], tminC[i + 1]);
  const dmtP95C = percentileLinear(dmt, 95);
  const ehf = new Float64Array(n);
  excessHeatFactorSeries(tmaxC, tminC, 1, n, dmtP95C, undefined, ehf);
  const positive = ehf.subarray(30).filter((v) => v > 0);
  return { dmtP95C, ehf85: percentileLinear(positive, 85), positiveDays: positive.length };
}
