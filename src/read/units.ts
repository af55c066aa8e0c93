/**
 * Canonical units at the input boundary (CF `units` attribute → `CANONICAL_UNITS` of src/types.ts).
 * Conversions are affine (`canonical = raw * scale + offset`) and are applied once, in place, right after
 * CF decoding. Precipitation additionally carries how it is stored in time (amount, accumulation, rate),
 * which decides how sub-daily steps become a daily total (see daily.ts).
 * Definitions: CF Conventions 1.x and UDUNITS-2 unit strings; temperature T[degC] = T[K] - 273.15,
 * T[degF] = 1.8 T[degC] + 32 (SI definitions); 1 kg m-2 of liquid water = 1 mm; 1 knot = 1852 m / 3600 s.
 */
import { UnitError } from '../core/errors.ts';
import { CANONICAL_UNITS, type Quantity } from '../types.ts';

export const KELVIN_AT_ZERO_CELSIUS = 273.15;
export const SECONDS_PER_DAY = 86400;
export const MM_PER_M = 1000;

/** How a quantity is stored along time. */
export type TemporalKind =
  /** A state (temperature, humidity, wind): instantaneous or a mean/extreme over an interval. */
  | 'state'
  /** An amount per interval (mm); daily value = sum of the amounts of the day. */
  | 'amount'
  /**
   * An amount accumulated since the forecast reference time (mm after scaling): lengths of liquid water in
   * metres, CF `lwe_thickness_of_precipitation_amount`, as forecast centres store total precipitation.
   * De-accumulated to per-step amounts first (acc(t0) = 0), then summed per day.
   */
  | 'accumulation'
  /** A rate (mm/day after scaling); daily value = mean of the day's rates. */
  | 'rate';

export interface UnitPlan {
  readonly quantity: Quantity;
  /** The file's own units string, as found. */
  readonly sourceUnits: string;
  readonly units: string;
  readonly scale: number;
  readonly offset: number;
  readonly kind: TemporalKind;
}

interface UnitRule {
  readonly scale: number;
  readonly offset: number;
  readonly kind: TemporalKind;
}

const CELSIUS: UnitRule = { scale: 1, offset: 0, kind: 'state' };
const KELVIN: UnitRule = { scale: 1, offset: -KELVIN_AT_ZERO_CELSIUS, kind: 'state' };
const FAHRENHEIT: UnitRule = { scale: 1 / 1.8, offset: -32 / 1.8, kind: 'state' };

/** Keys are `normaliseUnits` outputs. */
const TEMPERATURE: Readonly<Record<string, UnitRule>> = {
  k: KELVIN,
  kelvin: KELVIN,
  degk: KELVIN,
  degreesk: KELVIN,
  degc: CELSIUS,
  celsius: CELSIUS,
  '°c': CELSIUS,
  degreec: CELSIUS,
  degreesc: CELSIUS,
  degreecelsius: CELSIUS,
  degreescelsius: CELSIUS,
  degf: FAHRENHEIT,
  fahrenheit: FAHRENHEIT,
  '°f': FAHRENHEIT,
  degreef: FAHRENHEIT,
  degreesf: FAHRENHEIT,
  degreefahrenheit: FAHRENHEIT,
  degreesfahrenheit: FAHRENHEIT,
};

/** Mass fraction of water vapour: kg kg-1 (CF canonical "1"), g kg-1. */
const SPECIFIC_HUMIDITY: Readonly<Record<string, UnitRule>> = {
  'kgkg-1': { scale: 1, offset: 0, kind: 'state' },
  '1': { scale: 1, offset: 0, kind: 'state' },
  'gkg-1': { scale: 1e-3, offset: 0, kind: 'state' },
};

/** Pressure to hPa (1 hPa = 100 Pa = 1 mbar, SI). */
const PRESSURE: Readonly<Record<string, UnitRule>> = {
  pa: { scale: 0.01, offset: 0, kind: 'state' },
  hpa: { scale: 1, offset: 0, kind: 'state' },
  mbar: { scale: 1, offset: 0, kind: 'state' },
  mb: { scale: 1, offset: 0, kind: 'state' },
  millibar: { scale: 1, offset: 0, kind: 'state' },
  kpa: { scale: 10, offset: 0, kind: 'state' },
};

const HUMIDITY: Readonly<Record<string, UnitRule>> = {
  '%': { scale: 1, offset: 0, kind: 'state' },
  percent: { scale: 1, offset: 0, kind: 'state' },
  '1': { scale: 100, offset: 0, kind: 'state' },
};

const PRECIPITATION: Readonly<Record<string, UnitRule>> = {
  m: { scale: MM_PER_M, offset: 0, kind: 'accumulation' },
  mm: { scale: 1, offset: 0, kind: 'amount' },
  'kgm-2': { scale: 1, offset: 0, kind: 'amount' },
  'kgm-2s-1': { scale: SECONDS_PER_DAY, offset: 0, kind: 'rate' },
  'ms-1': { scale: SECONDS_PER_DAY * MM_PER_M, offset: 0, kind: 'rate' },
  'mms-1': { scale: SECONDS_PER_DAY, offset: 0, kind: 'rate' },
  'mmh-1': { scale: 24, offset: 0, kind: 'rate' },
  'mmday-1': { scale: 1, offset: 0, kind: 'rate' },
  'mmd-1': { scale: 1, offset: 0, kind: 'rate' },
};

const KNOT_IN_M_PER_S = 1852 / 3600;
const WIND: Readonly<Record<string, UnitRule>> = {
  'ms-1': { scale: 1, offset: 0, kind: 'state' },
  'kmh-1': { scale: 1 / 3.6, offset: 0, kind: 'state' },
  'kmhr-1': { scale: 1 / 3.6, offset: 0, kind: 'state' },
  kt: { scale: KNOT_IN_M_PER_S, offset: 0, kind: 'state' },
  knot: { scale: KNOT_IN_M_PER_S, offset: 0, kind: 'state' },
  knots: { scale: KNOT_IN_M_PER_S, offset: 0, kind: 'state' },
};

const RULES: Readonly<Record<Quantity, Readonly<Record<string, UnitRule>>>> = {
  tmax: TEMPERATURE,
  tmin: TEMPERATURE,
  tmean: TEMPERATURE,
  dewpoint: TEMPERATURE,
  rh: HUMIDITY,
  'specific-humidity': SPECIFIC_HUMIDITY,
  'surface-pressure': PRESSURE,
  precip: PRECIPITATION,
  wind: WIND,
};

const SUGGESTED: Readonly<Record<Quantity, string>> = {
  tmax: 'K, degC or degF',
  tmin: 'K, degC or degF',
  tmean: 'K, degC or degF',
  dewpoint: 'K, degC or degF',
  rh: '% or 1',
  'specific-humidity': 'kg kg-1 or g kg-1',
  'surface-pressure': 'Pa or hPa',
  precip: 'm, kg m-2, kg m-2 s-1 or m s-1',
  wind: 'm s-1 or km/h',
};

/**
 * Reduces a UDUNITS-style string to a lookup key: lower case; `**`, `^`, `_`, `.` and blanks removed; each
 * `/unit` division rewritten as a negative power ("kg/m2/s" → "kgm-2s-1", "m s**-1" → "ms-1",
 * "degrees_Celsius" → "degreescelsius", "km/h" → "kmh-1").
 */
export function normaliseUnits(units: string): string {
  return units
    .trim()
    .toLowerCase()
    .replace(/\*\*|\^/g, '')
    .replace(/\/\s*([a-z°%]+)(\d*)/g, (_m, unit: string, power: string) => ` ${unit}-${power === '' ? '1' : power}`)
    .replace(/[\s_.·]+/g, '');
}

/** The one-line error for a variable without units (`run` and `extract` alike); `quantity` null when unknown. */
export function missingUnitsError(file: string, variable: string, quantity: Quantity | null): UnitError {
  const example = `e.g. ncatted -a units,${variable},o,c,<units> ${file}`;
  return quantity === null
    ? new UnitError(
        `${file}: variable '${variable}' has no units attribute`,
        `set it to its units (${example}); without units its values cannot be read`,
      )
    : new UnitError(
        `${file}: variable '${variable}' (${quantity}) has no units attribute`,
        `set it to one of ${SUGGESTED[quantity]} (${example}) or map ${quantity} to another variable`,
      );
}

/**
 * The conversion of one variable's values to the canonical units of `quantity`.
 * @throws UnitError naming file and variable when `units` is missing or not convertible.
 */
export function planUnits(quantity: Quantity, units: string | undefined, file: string, variable: string): UnitPlan {
  const target = CANONICAL_UNITS[quantity];
  if (units === undefined || units.trim() === '') throw missingUnitsError(file, variable, quantity);
  const rule = RULES[quantity][normaliseUnits(units)];
  if (!rule) {
    throw new UnitError(
      `${file}: variable '${variable}' (${quantity}) has units '${units}' that cannot be converted to ${target}`,
      `expected one of ${SUGGESTED[quantity]}; fix the units attribute or map ${quantity} to another variable`,
    );
  }
  return { quantity, sourceUnits: units, units: target, scale: rule.scale, offset: rule.offset, kind: rule.kind };
}

/** Applies `plan` in place (NaN stays NaN). */
export function convertInPlace(values: Float64Array, plan: UnitPlan): void {
  const { scale, offset } = plan;
  if (scale === 1 && offset === 0) return;
  for (let i = 0; i < values.length; i++) values[i] = values[i] * scale + offset;
}

/** T[degC] = T[K] - 273.15 (SI definition). */
export function kelvinToCelsius(tK: number): number {
  return tK - KELVIN_AT_ZERO_CELSIUS;
}

/** T[degF] = (T[K] - 273.15) * 9/5 + 32 (SI definition). */
export function kelvinToFahrenheit(tK: number): number {
  return kelvinToCelsius(tK) * 1.8 + 32;
}

/**
 * Mean precipitation in mm/day over `hours` from a field accumulated since the forecast start, in metres of
 * liquid water equivalent (CF `lwe_thickness_of_precipitation_amount`): (acc(t2) - acc(t1)) * 1000 * 24 / hours.
 */
export function precipMmPerDayFromAccumulationM(accStartM: number, accEndM: number, hours: number): number {
  return ((accEndM - accStartM) * MM_PER_M * 24) / hours;
}

/** Mean rate in m s-1 of liquid water → mm/day (× 86400 × 1000). */
export function precipMmPerDayFromRateMPerS(rateMPerS: number): number {
  return rateMPerS * SECONDS_PER_DAY * MM_PER_M;
}

/** CF `precipitation_flux` kg m-2 s-1 → mm/day (1 kg m-2 of water = 1 mm; × 86400). */
export function precipMmPerDayFromFluxKgM2S(fluxKgM2S: number): number {
  return fluxKgM2S * SECONDS_PER_DAY;
}

/** Monthly total (mm/month) = mean daily rate (mm/day) × days in the month (input to Craig's rainfall membership). */
export function precipMmPerMonthFromMeanRate(precipMmPerDay: number, daysInMonth: number): number {
  return precipMmPerDay * daysInMonth;
}
