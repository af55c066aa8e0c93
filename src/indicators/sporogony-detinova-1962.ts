/**
 * Duration of sporogony (extrinsic incubation) of Plasmodium in Anopheles, degree-day model of Detinova (1962)
 * [detinova1962]:
 *
 *     n(T) = DD / (T − Tmin)  [days] for T > Tmin;     r(T) = max(0, (T − Tmin)/DD)  [1/day]
 *
 * T daily (or monthly) mean air temperature in °C. Constants (table below): P. falciparum DD 111, Tmin 16 °C;
 * P. vivax DD 105, Tmin 14.5 °C. At or below Tmin no sporogony completes: r = 0 and n = +Infinity.
 * The model has no upper limit (the decline at high T comes from mosquito survival, see Martens 1997).
 * Valid range: any finite T; NaN in → NaN out. Other papers pair 105 DD with 18 °C for P. vivax — pass custom
 * constants for those.
 */

export type PlasmodiumSpecies = 'falciparum' | 'vivax';

export interface SporogonyConstants {
  /** Degree-days above tMinC needed to complete sporogony. */
  readonly degreeDays: number;
  /** Minimum temperature for development, °C. */
  readonly tMinC: number;
}

export const DETINOVA_1962: Readonly<Record<PlasmodiumSpecies, SporogonyConstants>> = {
  falciparum: { degreeDays: 111, tMinC: 16 },
  vivax: { degreeDays: 105, tMinC: 14.5 },
};

/** Sporogony duration n(T) in days; +Infinity at or below Tmin. */
export function sporogonyDurationDetinova1962Days(tC: number, k: SporogonyConstants): number {
  if (Number.isNaN(tC)) return NaN;
  return tC > k.tMinC ? k.degreeDays / (tC - k.tMinC) : Infinity;
}

/** Sporogony development rate r(T) = 1/n in 1/day; 0 at or below Tmin. */
export function sporogonyRateDetinova1962PerDay(tC: number, k: SporogonyConstants): number {
  if (Number.isNaN(tC)) return NaN;
  return tC > k.tMinC ? (tC - k.tMinC) / k.degreeDays : 0;
}
