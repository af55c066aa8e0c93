/**
 * Boundary types passed between pipeline stages (read → indicators → calibrate → decide → render → deliver).
 * Every object crossing a stage boundary is read-only and serialisable; arrays of numbers are Float64Array,
 * member-major: value of member m on step t is `data[m * steps + t]`, NaN where missing. This file holds the
 * read and indicators stages' output and the lead windows; the later stages' outputs are in probability-types.ts
 * (calibrate), decision-types.ts (decide) and bulletin-types.ts (render, deliver).
 */

/** Calendar date `YYYY-MM-DD` (a local day of a region, or a UTC date where stated). */
export type IsoDate = string;

/** Lead-time tiers: short-range days, sub-seasonal weeks, seasonal months. */
/** The tiers, shortest first. */
export const TIERS = ['days', 'weeks', 'months'] as const;
export type Tier = (typeof TIERS)[number];

/** Canonical physical quantities Forelight reads, with their canonical units. */
export type Quantity =
  | 'tmax'
  | 'tmin'
  | 'tmean'
  | 'dewpoint'
  | 'rh'
  /** Near-surface specific humidity; with surface-pressure it gives the dewpoint (indicators/specific-humidity.ts). */
  | 'specific-humidity'
  | 'surface-pressure'
  | 'precip'
  | 'wind';

export const CANONICAL_UNITS: Readonly<Record<Quantity, string>> = {
  tmax: 'degC',
  tmin: 'degC',
  tmean: 'degC',
  dewpoint: 'degC',
  rh: '%',
  'specific-humidity': 'kg/kg',
  'surface-pressure': 'hPa',
  precip: 'mm/day',
  wind: 'm/s',
};

/** Where a series came from: enough to find the exact bytes again. */
export interface Provenance {
  readonly file: string;
  readonly variable: string;
  /** Forecast reference time (ISO 8601, UTC). */
  readonly referenceTime: string;
}

/** Output of the read stage: one quantity, one region, all members, daily steps (local days of the region). */
export interface RegionSeries {
  readonly region: string;
  readonly quantity: Quantity;
  readonly units: string;
  /** Local calendar days, lead day 1 first. */
  readonly days: readonly IsoDate[];
  readonly members: number;
  /** member-major [member][day], NaN where missing. */
  readonly data: Float64Array;
  /** Number of grid cells that fall in the region. */
  readonly cells: number;
  readonly provenance: Provenance;
  /** How the cells were weighted: by area (absent) or by the people of the population raster. */
  readonly weighting?: 'population';
  /** Every cell's own series, for indicators whose region value is a share above a level (absent otherwise). */
  readonly perCell?: CellSeries;
  /** Daily data of a model-calendar file: its calendar and the model date of each day (absent for Gregorian files). */
  readonly modelCalendar?: ModelDays;
}

/** CF 1.11 §4.4.1 calendars whose dates differ from the Gregorian ones (`noleap` also stands for `365_day`). */
export type ModelCalendarName = 'julian' | 'noleap' | 'all_leap' | '360_day';

/**
 * Daily data in a model calendar (src/read/DECISIONS.md §3): `days[i]` is the model-calendar date (`YYYY-MM-DD`)
 * of the series' i-th local day, so that month leads are the model's months.
 */
export interface ModelDays {
  readonly calendar: ModelCalendarName;
  readonly days: readonly string[];
}

/** The cells of a region one by one: weights (area or people, summing to 1) and [cell][member][day] values. */
export interface CellSeries {
  readonly weights: Float64Array;
  readonly data: Float64Array;
}

/** Output of the read stage for one file (a forecast, one hindcast start or the observations): region id → quantity → series. */
export type RegionQuantities = Map<string, Map<Quantity, RegionSeries>>;

/** Output of the read stage for one hindcast start of a source. */
export interface HindcastRead {
  readonly year: number;
  /** Start date, YYYY-MM-DD. */
  readonly start: IsoDate;
  readonly path: string;
  readonly series: RegionQuantities;
}

/** Output of the indicators stage: one indicator for one region, per member and day. */
export interface IndicatorSeries {
  readonly region: string;
  readonly indicator: string;
  readonly units: string;
  readonly days: readonly IsoDate[];
  readonly members: number;
  /** member-major [member][day], NaN where missing. */
  readonly data: Float64Array;
  /** Count of input values outside the formula's valid range (flagged, result NaN). */
  readonly outOfRange: number;
  /** Count of missing (NaN) values in the result. */
  readonly missing: number;
  /** 1 where a value lies beyond the formula's published table and was capped there (heat index), member-major. */
  readonly beyondTable?: Uint8Array;
  /** The inputs' model calendar (RegionSeries.modelCalendar); absent for Gregorian data. */
  readonly modelCalendar?: ModelDays;
}

/** One lead of a tier: the local days it speaks for. */
export interface LeadWindow {
  readonly tier: Tier;
  /** 1-based: day 1, week 1, month 1. */
  readonly index: number;
  /** First and last local day covered (inclusive). */
  readonly start: IsoDate;
  readonly end: IsoDate;
  /** A month lead of daily data in a model calendar: the model month (`YYYY-MM`) it is; absent otherwise. */
  readonly modelMonth?: string;
}
