/** The climate sample of one source × region × indicator × tier: lead values over years (hindcasts or observations). */
import type { LeadWindow } from '../types.ts';

export interface LeadClimate {
  /**
   * Year of each entry. A year repeats when several starts of a year are pooled (starts within ±windowDays, see
   * `startsWithinWindow`); leave-one-year-out then removes every start of that year.
   */
  readonly years: readonly number[];
  readonly members: number;
  /** Lead windows of the first year (labels); year y's windows are the same leads in year y. */
  readonly leads: readonly LeadWindow[];
  readonly units: string;
  /** [year][member][lead]: values[(y * members + m) * leads.length + l], NaN where missing; as read, never detrended. */
  readonly values: Float64Array;
  /**
   * Set when the climate is trend-aware (trend-climate.ts): the year its samples are re-centred on (the issue
   * year). `leadSample` then detrends every lead and moves it to this year, or to the held-out year.
   */
  readonly recentreOn?: number;
}
