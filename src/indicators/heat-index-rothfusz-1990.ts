/**
 * NWS Heat Index: Rothfusz (1990) regression [rothfusz1990] fitted to Steadman (1979) [steadman1979], applied as
 * in the NWS/WPC algorithm page "The Heat Index Equation" [nwsWpcHeatIndex]:
 *  1. HI_s = 0.5 (T + 61 + 1.2 (T − 68) + 0.094 RH); if HI_s < 80 °F the result is HI_s (no further averaging).
 *  2. else the nine-term regression;
 *  3. minus ((13 − RH)/4)·sqrt((17 − |T − 95|)/17) when RH < 13 and 80 ≤ T ≤ 112;
 *  4. plus ((RH − 85)/10)·((87 − T)/5) when RH > 85 and 80 ≤ T ≤ 87.
 * Computed in °F (the 80 °F switch is 26.67 °C; °F breakpoints are never applied to °C numbers).
 * Follows the WPC text, not the printed chart (which omits step 4); strict < and > (RH 13 and 85: no adjustment).
 * Valid range used here: 40 ≤ T ≤ 120 °F (4.4..48.9 °C) and 0 ≤ RH ≤ 100 %; outside → NaN (flagged).
 * The regression error is about ±1.3 °F against Steadman's table.
 */
import { mapElementwise2, type ElementwiseCounts } from './elementwise.ts';

export type HeatIndexBranch = 'simple' | 'regression' | 'regression-low-rh' | 'regression-high-rh' | 'out-of-range';

export const HEAT_INDEX_VALID_MIN_F = 40;
export const HEAT_INDEX_VALID_MAX_F = 120;

function simpleHeatIndexF(tF: number, rhPct: number): number {
  return 0.5 * (tF + 61.0 + 1.2 * (tF - 68.0) + 0.094 * rhPct);
}

/** The raw nine-term Rothfusz (1990) regression [°F], without the NWS adjustments. T °F, RH %. */
export function heatIndexRegressionRothfusz1990F(tF: number, rhPct: number): number {
  const t = tF;
  const r = rhPct;
  return (
    -42.379 +
    2.04901523 * t +
    10.14333127 * r -
    0.22475541 * t * r -
    6.83783e-3 * t * t -
    5.481717e-2 * r * r +
    1.22874e-3 * t * t * r +
    8.5282e-4 * t * r * r -
    1.99e-6 * t * t * r * r
  );
}

/** Which step of the WPC algorithm applies at (T °F, RH %). */
export function heatIndexBranchNws(tF: number, rhPct: number): HeatIndexBranch {
  if (!(tF >= HEAT_INDEX_VALID_MIN_F && tF <= HEAT_INDEX_VALID_MAX_F && rhPct >= 0 && rhPct <= 100)) return 'out-of-range';
  if (simpleHeatIndexF(tF, rhPct) < 80) return 'simple';
  if (rhPct < 13 && tF >= 80 && tF <= 112) return 'regression-low-rh';
  if (rhPct > 85 && tF >= 80 && tF <= 87) return 'regression-high-rh';
  return 'regression';
}

/** NWS Heat Index [°F] from air temperature [°F] and relative humidity [%] (WPC algorithm, see file comment). */
export function heatIndexRothfusz1990F(tF: number, rhPct: number): number {
  switch (heatIndexBranchNws(tF, rhPct)) {
    case 'out-of-range':
      return NaN;
    case 'simple':
      return simpleHeatIndexF(tF, rhPct);
    case 'regression':
      return heatIndexRegressionRothfusz1990F(tF, rhPct);
    case 'regression-low-rh':
      return heatIndexRegressionRothfusz1990F(tF, rhPct) - ((13 - rhPct) / 4) * Math.sqrt((17 - Math.abs(tF - 95)) / 17);
    case 'regression-high-rh':
      return heatIndexRegressionRothfusz1990F(tF, rhPct) + ((rhPct - 85) / 10) * ((87 - tF) / 5);
  }
}

/** NWS Heat Index [°C] from air temperature [°C] and RH [%]: converted to °F, computed, converted back. */
export function heatIndexRothfusz1990C(tC: number, rhPct: number): number {
  return (heatIndexRothfusz1990F(1.8 * tC + 32, rhPct) - 32) / 1.8;
}

/** Vectorised {@link heatIndexRothfusz1990C}. */
export function heatIndexRothfusz1990CArray(tC: ArrayLike<number>, rhPct: ArrayLike<number>, out: Float64Array): ElementwiseCounts {
  return mapElementwise2(tC, rhPct, out, heatIndexRothfusz1990C);
}
