/**
 * Humidex, Masterton & Richardson (1979) [mastertonRichardson1979], as used by Environment Canada:
 *
 *     H = T + 0.5555 (e − 10),   e = 6.11 exp(5417.7530 (1/273.16 − 1/Td_K))  [hPa],  Td_K = Td + 273.15
 *
 * T air temperature and Td dewpoint in °C; H is dimensionless but read as °C. Below e = 10 hPa, H < T.
 * Valid range used here: T and Td within −40..50 °C and Td ≤ T + 0.5 °C (rounding tolerance); outside → NaN.
 */
import { mapElementwise2, type ElementwiseCounts } from './elementwise.ts';

/** Vapour pressure [hPa] from dewpoint [°C] in the form printed with the humidex. */
export function vapourPressureHumidexHpa(tdC: number): number {
  return 6.11 * Math.exp(5417.753 * (1 / 273.16 - 1 / (tdC + 273.15)));
}

/** Humidex (read as °C) from air temperature and dewpoint [°C]. */
export function humidexMastertonRichardson1979(tC: number, tdC: number): number {
  if (!(tC >= -40 && tC <= 50 && tdC >= -40 && tdC <= tC + 0.5)) return NaN;
  return tC + 0.5555 * (vapourPressureHumidexHpa(tdC) - 10);
}

/** Vectorised {@link humidexMastertonRichardson1979}. */
export function humidexMastertonRichardson1979Array(tC: ArrayLike<number>, tdC: ArrayLike<number>, out: Float64Array): ElementwiseCounts {
  return mapElementwise2(tC, tdC, out, humidexMastertonRichardson1979);
}
