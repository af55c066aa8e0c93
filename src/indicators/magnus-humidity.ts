/**
 * Magnus-form saturation vapour pressure over liquid water and the dewpoint ↔ relative humidity conversions.
 *
 *     e_s(T) = c · exp(a·T / (b + T))     [hPa, T in °C]      RH = 100 · e_s(Td) / e_s(T)   [%]
 *
 * Valid range: liquid water surface, −40..+50 °C for both T and Td (below 0 °C the result is RH with respect to
 * water, not ice). Outside that range the functions return NaN (flagged by the caller as out of range).
 * Default set: Alduchov & Eskridge (1996) [alduchovEskridge1996]; alternatives below are named, never mixed silently.
 */
import { mapElementwise2, type ElementwiseCounts } from './elementwise.ts';
import type { ReferenceKey } from './references.ts';

export interface MagnusCoefficients {
  readonly name: string;
  /** c, hPa */
  readonly cHpa: number;
  /** a, dimensionless */
  readonly a: number;
  /** b, °C */
  readonly bC: number;
  readonly source: ReferenceKey;
}

/** Alduchov & Eskridge (1996), J. Appl. Meteor. 35:601-609, eq. 21 (AERK): 6.1094, 17.625, 243.04. Default. */
export const MAGNUS_ALDUCHOV_ESKRIDGE_1996: MagnusCoefficients = {
  name: 'alduchov-eskridge-1996',
  cHpa: 6.1094,
  a: 17.625,
  bC: 243.04,
  source: 'alduchovEskridge1996',
};
/** Bolton (1980), Mon. Wea. Rev. 108:1046-1053, eq. 10: 6.112, 17.67, 243.5. */
export const MAGNUS_BOLTON_1980: MagnusCoefficients = {
  name: 'bolton-1980',
  cHpa: 6.112,
  a: 17.67,
  bC: 243.5,
  source: 'bolton1980',
};
/** Sonntag (1990) Magnus constants as used by WMO: 6.112, 17.62, 243.12. */
export const MAGNUS_WMO_SONNTAG_1990: MagnusCoefficients = {
  name: 'wmo-sonntag-1990',
  cHpa: 6.112,
  a: 17.62,
  bC: 243.12,
  source: 'sonntag1990',
};
/** Tetens-type constants printed with the BoM apparent-temperature formula: 6.105, 17.27, 237.7. */
export const MAGNUS_BOM: MagnusCoefficients = {
  name: 'bom',
  cHpa: 6.105,
  a: 17.27,
  bC: 237.7,
  source: 'bomThermalComfort',
};

export const MAGNUS_SETS: Readonly<Record<string, MagnusCoefficients>> = {
  [MAGNUS_ALDUCHOV_ESKRIDGE_1996.name]: MAGNUS_ALDUCHOV_ESKRIDGE_1996,
  [MAGNUS_BOLTON_1980.name]: MAGNUS_BOLTON_1980,
  [MAGNUS_WMO_SONNTAG_1990.name]: MAGNUS_WMO_SONNTAG_1990,
  [MAGNUS_BOM.name]: MAGNUS_BOM,
};

export const MAGNUS_VALID_MIN_C = -40;
export const MAGNUS_VALID_MAX_C = 50;

function inMagnusRange(tC: number): boolean {
  return tC >= MAGNUS_VALID_MIN_C && tC <= MAGNUS_VALID_MAX_C;
}

/** Saturation vapour pressure e_s(T) [hPa] over water, Magnus form; T in °C, valid −40..50 °C, else NaN. */
export function saturationVapourPressureMagnusHpa(tC: number, k: MagnusCoefficients = MAGNUS_ALDUCHOV_ESKRIDGE_1996): number {
  if (!inMagnusRange(tC)) return NaN;
  return k.cHpa * Math.exp((k.a * tC) / (k.bC + tC));
}

/**
 * Relative humidity [%] from air temperature and dewpoint [°C], RH = 100 e_s(Td)/e_s(T) (Magnus form).
 * Valid −40..50 °C for both; Td > T gives RH > 100 (supersaturation), returned as is for the caller to judge.
 */
export function rhFromDewpointMagnusPct(tC: number, tdC: number, k: MagnusCoefficients = MAGNUS_ALDUCHOV_ESKRIDGE_1996): number {
  return (100 * saturationVapourPressureMagnusHpa(tdC, k)) / saturationVapourPressureMagnusHpa(tC, k);
}

/**
 * Dewpoint [°C] from air temperature [°C] and relative humidity [%], inverse Magnus form:
 * γ = ln(RH/100) + aT/(b+T), Td = bγ/(a−γ). Valid T −40..50 °C, 0 < RH ≤ 100, else NaN.
 */
export function dewpointFromRhMagnusC(tC: number, rhPct: number, k: MagnusCoefficients = MAGNUS_ALDUCHOV_ESKRIDGE_1996): number {
  if (!inMagnusRange(tC) || !(rhPct > 0 && rhPct <= 100)) return NaN;
  const g = Math.log(rhPct / 100) + (k.a * tC) / (k.bC + tC);
  return (k.bC * g) / (k.a - g);
}

/**
 * Dewpoint [°C] of vapour pressure e [hPa], inverse Magnus form: γ = ln(e/c), Td = bγ/(a−γ).
 * NaN for e ≤ 0 or a dewpoint outside the valid −40..50 °C.
 */
export function dewpointFromVapourPressureMagnusC(eHpa: number, k: MagnusCoefficients = MAGNUS_ALDUCHOV_ESKRIDGE_1996): number {
  if (!(eHpa > 0)) return NaN;
  const g = Math.log(eHpa / k.cHpa);
  const td = (k.bC * g) / (k.a - g);
  return inMagnusRange(td) ? td : NaN;
}

/**
 * Vapour pressure e [hPa] in the form printed with the BoM apparent-temperature and simplified-WBGT formulas
 * [bomThermalComfort]: e = (RH/100) · 6.105 · exp(17.27 T/(237.7 + T)). T °C (−40..50), RH % (0..100), else NaN.
 */
export function vapourPressureBomHpa(tC: number, rhPct: number): number {
  if (!(rhPct >= 0 && rhPct <= 100)) return NaN;
  return (rhPct / 100) * saturationVapourPressureMagnusHpa(tC, MAGNUS_BOM);
}

/** Vectorised {@link rhFromDewpointMagnusPct}: out[i] = RH(tC[i], tdC[i]). */
export function rhFromDewpointMagnusPctArray(
  tC: ArrayLike<number>,
  tdC: ArrayLike<number>,
  out: Float64Array,
  k: MagnusCoefficients = MAGNUS_ALDUCHOV_ESKRIDGE_1996,
): ElementwiseCounts {
  return mapElementwise2(tC, tdC, out, (t, td) => rhFromDewpointMagnusPct(t, td, k));
}
