/**
 * NWS Heat Index: Rothfusz (1990) regression [rothfusz1990] fitted to Steadman (1979) [steadman1979], applied as
 * in the NWS/WPC algorithm page "The Heat Index Equation" [nwsWpcHeatIndex]:
 *  1. HI_s = 0.5 (T + 61 + 1.2 (T − 68) + 0.094 RH); if HI_s < 80 °F the result is HI_s (no further averaging).
 *  2. else the nine-term regression;
 *  3. minus ((13 − RH)/4)·sqrt((17 − |T − 95|)/17) when RH < 13 and 80 ≤ T ≤ 112;
 *  4. plus ((RH − 85)/10)·((87 − T)/5) when RH > 85 and 80 ≤ T ≤ 87.
 * Computed in °F (the 80 °F switch is 26.67 °C; °F breakpoints are never applied to °C numbers).
 * Follows the WPC text, not the printed chart (which omits step 4); strict < and > (RH 13 and 85: no adjustment).
 * Valid range used here: T ≥ 40 °F (4.4 °C) and 0 ≤ RH ≤ 100 %; outside → NaN (flagged, counted out of range).
 * The regression error is about ±1.3 °F against Steadman's table, and the WPC page says it does not hold beyond the
 * range of Steadman's data. Published table range (the NWS chart of Steadman's values): air temperature up to
 * 110 °F (43.3 °C, its last column) and heat index up to 137 °F (58.3 °C, its highest filled cell; both from
 * memory of the chart, CHECKS.md §2 rows hi-nws-chart-* lie inside it). Beyond it the value is BEYOND THE TABLE:
 * never extrapolated (the regression gives 380 °F at 120 °F and 100 %), but capped at 137 °F and flagged, so an
 * exceedance of any threshold up to 58.3 °C still counts and the bulletin says the value is off the table.
 */
import { mapElementwise2, type ElementwiseCounts } from './elementwise.ts';

export type HeatIndexBranch = 'simple' | 'regression' | 'regression-low-rh' | 'regression-high-rh' | 'out-of-range';

export const HEAT_INDEX_VALID_MIN_F = 40;
/** Upper ends of the published table (NWS chart of Steadman 1979): air temperature and heat index, °F. */
export const HEAT_INDEX_TABLE_MAX_T_F = 110;
export const HEAT_INDEX_TABLE_MAX_F = 137;

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
  if (!(tF >= HEAT_INDEX_VALID_MIN_F && tF < Infinity && rhPct >= 0 && rhPct <= 100)) return 'out-of-range';
  if (simpleHeatIndexF(tF, rhPct) < 80) return 'simple';
  if (rhPct < 13 && tF >= 80 && tF <= 112) return 'regression-low-rh';
  if (rhPct > 85 && tF >= 80 && tF <= 87) return 'regression-high-rh';
  return 'regression';
}

/** The WPC algorithm's value [°F] without the table cap (may be far beyond the table; use for the flag only). */
function heatIndexAlgorithmF(tF: number, rhPct: number): number {
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

/** True when (T °F, RH %) lies beyond the published table: T above 110 °F or the heat index above 137 °F. */
export function heatIndexBeyondTableF(tF: number, rhPct: number): boolean {
  return tF > HEAT_INDEX_TABLE_MAX_T_F || heatIndexAlgorithmF(tF, rhPct) > HEAT_INDEX_TABLE_MAX_F;
}

/** NWS Heat Index [°F] from air temperature [°F] and relative humidity [%] (WPC algorithm), capped at the table's 137 °F. */
export function heatIndexRothfusz1990F(tF: number, rhPct: number): number {
  return Math.min(heatIndexAlgorithmF(tF, rhPct), HEAT_INDEX_TABLE_MAX_F);
}

/** NWS Heat Index [°C] from air temperature [°C] and RH [%]: converted to °F, computed, converted back. */
export function heatIndexRothfusz1990C(tC: number, rhPct: number): number {
  return (heatIndexRothfusz1990F(1.8 * tC + 32, rhPct) - 32) / 1.8;
}

/** {@link heatIndexBeyondTableF} for °C. */
export function heatIndexBeyondTableC(tC: number, rhPct: number): boolean {
  return heatIndexBeyondTableF(1.8 * tC + 32, rhPct);
}

/** Vectorised {@link heatIndexRothfusz1990C}. */
export function heatIndexRothfusz1990CArray(tC: ArrayLike<number>, rhPct: ArrayLike<number>, out: Float64Array): ElementwiseCounts {
  return mapElementwise2(tC, rhPct, out, heatIndexRothfusz1990C);
}
