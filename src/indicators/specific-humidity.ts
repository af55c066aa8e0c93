/**
 * Dewpoint from specific humidity q [kg/kg] and pressure p [hPa], as files from forecast centres carry humidity
 * (2 m specific humidity with surface pressure).
 *
 *     r = ε e / (p − e), q = r / (1 + r)  ⇒  e = q p / (ε + (1 − ε) q)        ε = Rd/Rv = 0.62198
 *
 * Mixing ratio and specific humidity as defined in WMO-No. 8 Annex 4.B [wmoGuide8] (ε from memory of that annex);
 * the dewpoint is then the inverse Magnus form of Alduchov & Eskridge (1996) [alduchovEskridge1996], valid −40..50 °C.
 * Surface pressure stands for the pressure at 2 m (about 0.25 hPa more): an error below 0.01 °C in the dewpoint.
 */
import type { Quantity } from '../types.ts';
import { dewpointFromVapourPressureMagnusC, MAGNUS_ALDUCHOV_ESKRIDGE_1996, type MagnusCoefficients } from './magnus-humidity.ts';

/** ε = Rd/Rv, the ratio of the molar masses of water and dry air [wmoGuide8]. */
export const EPSILON_WATER_DRY_AIR = 0.62198;

/** Vapour pressure e [hPa] of specific humidity q [kg/kg] at pressure p [hPa]; NaN for q outside 0..1 or p ≤ 0. */
export function vapourPressureFromSpecificHumidityHpa(q: number, pHpa: number): number {
  if (!(q >= 0 && q < 1 && pHpa > 0)) return NaN;
  return (q * pHpa) / (EPSILON_WATER_DRY_AIR + (1 - EPSILON_WATER_DRY_AIR) * q);
}

/** Dewpoint [°C] of specific humidity q [kg/kg] at pressure p [hPa]; NaN outside the Magnus range −40..50 °C. */
export function dewpointFromSpecificHumidityC(q: number, pHpa: number, k: MagnusCoefficients = MAGNUS_ALDUCHOV_ESKRIDGE_1996): number {
  return dewpointFromVapourPressureMagnusC(vapourPressureFromSpecificHumidityHpa(q, pHpa), k);
}

/**
 * The run.json note for a source or the observations whose humidity is specific humidity with surface pressure
 * (`variables` maps both), naming the file variables and the derivation; none otherwise.
 */
export function specificHumidityNote(label: string, variables: Readonly<Partial<Record<Quantity, string>>>): string[] {
  const [q, p] = [variables['specific-humidity'], variables['surface-pressure']];
  if (q === undefined || p === undefined || variables.dewpoint !== undefined) return [];
  return [
    `${label}: humidity from specific humidity '${q}' with surface pressure '${p}': dewpoint of the day's mean vapour pressure ` +
      `e = q p / (ε + (1 − ε) q), ε = ${EPSILON_WATER_DRY_AIR} (WMO-No. 8, Annex 4.B), by the inverse Magnus form of Alduchov & Eskridge (1996)`,
  ];
}
