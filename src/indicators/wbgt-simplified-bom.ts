/**
 * Simplified ("approximate") wet-bulb globe temperature as published by the Australian Bureau of Meteorology
 * [bomThermalComfort], after ACSM (1984) [acsm1984]:
 *
 *     WBGT_s = 0.567 Ta + 0.393 e + 3.94   [°C],   e = (RH/100) · 6.105 exp(17.27 Ta/(237.7 + Ta))  [hPa]
 *
 * Assumes fairly strong sunshine and light wind; an estimate, not a measured WBGT (overestimates under cloud,
 * strong wind or at night). Not to be mixed with the 0.567/0.216/3.38 constant set. Valid range used here:
 * Ta −40..50 °C (vapour-pressure formula) and RH 0..100 %; outside → NaN.
 */
import { mapElementwise2, type ElementwiseCounts } from './elementwise.ts';
import { vapourPressureBomHpa } from './magnus-humidity.ts';

export function wbgtSimplifiedBomC(tC: number, rhPct: number): number {
  return 0.567 * tC + 0.393 * vapourPressureBomHpa(tC, rhPct) + 3.94;
}

/** Vectorised {@link wbgtSimplifiedBomC}. */
export function wbgtSimplifiedBomCArray(tC: ArrayLike<number>, rhPct: ArrayLike<number>, out: Float64Array): ElementwiseCounts {
  return mapElementwise2(tC, rhPct, out, wbgtSimplifiedBomC);
}
