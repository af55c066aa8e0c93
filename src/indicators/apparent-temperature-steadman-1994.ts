/**
 * Apparent temperature, non-radiative form of Steadman (1994) [steadman1994] as published by the Australian
 * Bureau of Meteorology [bomThermalComfort]:
 *
 *     AT = Ta + 0.33 e − 0.70 ws − 4.00   [°C],   e = (RH/100) · 6.105 exp(17.27 Ta/(237.7 + Ta))  [hPa]
 *
 * Ta dry-bulb °C, RH %, ws wind speed at 10 m in m/s. Valid range used here: Ta −40..50 °C (vapour-pressure
 * formula), RH 0..100 %, ws ≥ 0 m/s; outside → NaN. Not the NWS heat index (which NWS also calls apparent temperature).
 */
import { mapElementwise3, type ElementwiseCounts } from './elementwise.ts';
import { vapourPressureBomHpa } from './magnus-humidity.ts';

export function apparentTemperatureSteadman1994C(tC: number, rhPct: number, wind10mMs: number): number {
  if (!(wind10mMs >= 0)) return NaN;
  return tC + 0.33 * vapourPressureBomHpa(tC, rhPct) - 0.7 * wind10mMs - 4.0;
}

/** Vectorised {@link apparentTemperatureSteadman1994C}. */
export function apparentTemperatureSteadman1994CArray(
  tC: ArrayLike<number>,
  rhPct: ArrayLike<number>,
  wind10mMs: ArrayLike<number>,
  out: Float64Array,
): ElementwiseCounts {
  return mapElementwise3(tC, rhPct, wind10mMs, out, apparentTemperatureSteadman1994C);
}
