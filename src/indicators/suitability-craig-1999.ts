/**
 * Fuzzy climatic suitability for stable malaria transmission, Craig, Snow & le Sueur (1999) [craigSnowLeSueur1999],
 * on MONTHLY values: T = monthly mean temperature (°C), R = monthly rainfall total (mm).
 *
 *     S(x; a, b) = 0 (x ≤ a), 1 (x ≥ b), sin²((π/2)(x − a)/(b − a)) between   ("simple sigmoidal curve")
 *     f_T = S(T; 18, 22) for T ≤ 27, 1 − S(T; 32, 40) for T > 27     f_R = S(R; 0, 80)     index = min(f_T, f_R)
 *
 * Breakpoints 18/22/32/40 °C, 0/80 mm and the cos² curve shape are FROM MEMORY of the paper (CHECKS.md §9, code M):
 * verify before relying on them. The paper's seasonal aggregation and frost condition are not implemented.
 * Valid range: any finite T; R ≥ 0 (negative R → NaN).
 */

export const CRAIG_1999_BREAKPOINTS = {
  tempRiseStartC: 18,
  tempRiseEndC: 22,
  tempFallStartC: 32,
  tempFallEndC: 40,
  rainRiseStartMm: 0,
  rainRiseEndMm: 80,
} as const;

/** Cosine-squared S-curve rising from 0 at a to 1 at b. */
export function sCurveCos2(x: number, a: number, b: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x <= a) return 0;
  if (x >= b) return 1;
  const s = Math.sin((Math.PI / 2) * ((x - a) / (b - a)));
  return s * s;
}

/** Temperature membership f_T(T), T monthly mean °C, 0..1. */
export function craigTemperatureMembership1999(tMonthMeanC: number): number {
  const k = CRAIG_1999_BREAKPOINTS;
  return tMonthMeanC <= 27
    ? sCurveCos2(tMonthMeanC, k.tempRiseStartC, k.tempRiseEndC)
    : 1 - sCurveCos2(tMonthMeanC, k.tempFallStartC, k.tempFallEndC);
}

/** Rainfall membership f_R(R), R monthly total mm (≥ 0), 0..1. */
export function craigRainfallMembership1999(rainMonthMm: number): number {
  if (rainMonthMm < 0) return NaN;
  return sCurveCos2(rainMonthMm, CRAIG_1999_BREAKPOINTS.rainRiseStartMm, CRAIG_1999_BREAKPOINTS.rainRiseEndMm);
}

/** Monthly suitability min(f_T, f_R) (fuzzy AND), 0..1. */
export function craigMonthlySuitability1999(tMonthMeanC: number, rainMonthMm: number): number {
  return Math.min(craigTemperatureMembership1999(tMonthMeanC), craigRainfallMembership1999(rainMonthMm));
}
