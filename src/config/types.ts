/**
 * The operator-owned configuration, as loaded and validated from YAML (see config/forelight.yaml).
 * Paths are resolved against the directory of the main YAML file by the loader. How stages are set is in
 * decision-config.ts, calibration, schedule and delivery in service-config.ts.
 */
import type { IndicatorKind, IndicatorParams } from '../indicators/registry.ts';
import type { Quantity, Tier } from '../types.ts';
import type { DecisionConfig, StageConfig, TriggerRule } from './decision-config.ts';
import type { CalibrationConfig, DeliveryConfig, ScheduleConfig } from './service-config.ts';

export interface SourceConfig {
  readonly id: string;
  /** Human-readable name, used in bulletins ("Sub-seasonal ensemble"). */
  readonly name: string;
  readonly tier: Tier;
  /**
   * Path patterns of forecast files (YAML `forecast-files`, one or a list whose files together make one forecast):
   * `{date}` = YYYYMMDD of the forecast reference date, `{var}` and `{member}` for files split by variable and by
   * member (src/core/path-patterns.ts, src/pipeline/split-files.ts).
   */
  readonly forecast: readonly string[];
  /** Path pattern of hindcast files; `{year}` = hindcast year, `{mmdd}` = start month-day; `{var}`, `{member}` as above. Optional. */
  readonly hindcast?: string;
  /** Canonical quantity → variable name in the file. */
  readonly variables: Readonly<Partial<Record<Quantity, string>>>;
  /** Newer/finer sources win overlaps: lower number = higher priority. */
  readonly priority: number;
  /**
   * How many days before the issue date a late source's newest forecast may be (YAML `look-back-days`);
   * default one issue interval of the tier (DEFAULT_LOOKBACK_DAYS).
   */
  readonly lookbackDays: number;
}

/**
 * Default look-back per tier: seasonal forecasts are issued monthly, so one issue interval plus a few days of
 * delivery delay is 35 days; daily and sub-seasonal sources (issued daily to twice weekly) keep 10 days.
 * Common practice, no source.
 */
export const DEFAULT_LOOKBACK_DAYS: Readonly<Record<Tier, number>> = { days: 10, weeks: 10, months: 35 };

export interface ObservationsConfig {
  /** Gridded daily observations (or reanalysis) covering the hindcast years. */
  readonly path: string;
  readonly variables: Readonly<Partial<Record<Quantity, string>>>;
}

/** Closed ring of [lon, lat] pairs (GeoJSON order, first point repeated at the end). */
export type Ring = readonly (readonly [number, number])[];

export type RegionShape =
  | { readonly kind: 'box'; readonly south: number; readonly north: number; readonly west: number; readonly east: number }
  /** Polygon ring of [lon, lat] pairs (GeoJSON order). */
  | { readonly kind: 'polygon'; readonly ring: Ring }
  /**
   * Polygons from a boundary file: each is its outer ring then its holes (either winding). Longitudes of a ring
   * that crosses 180° are made continuous (e.g. 170..190), so a ring never jumps by 360°.
   */
  | { readonly kind: 'multipolygon'; readonly polygons: readonly (readonly Ring[])[] };

/**
 * How grid cells count for a region: `overlap` weights every cell by the area of its intersection with the region
 * on the sphere (every region gets a value on any grid); `centre` takes the cells whose centre lies inside, each
 * weighted by its whole area (the rule of `cdo sellonlatbox`).
 */
export type CellRule = 'overlap' | 'centre';

export interface RegionConfig {
  readonly id: string;
  readonly name: string;
  readonly shape: RegionShape;
  /** Offset of local time from UTC in hours (local day boundaries) when `timeZone` is absent. */
  readonly utcOffsetHours: number;
  /** IANA time zone of local days (daylight saving followed); wins over `utcOffsetHours`. */
  readonly timeZone?: string;
  /** Default `overlap`. */
  readonly cellRule?: CellRule;
  /**
   * Set only on the read stage's derived regions (config/region-views.ts): `population` weights each cell by
   * the people of the population raster living in cell ∩ region instead of its area; `keepCells` also returns
   * every cell's own series (for indicators whose region value is a share above a level).
   */
  readonly weighting?: RegionWeighting;
  readonly keepCells?: boolean;
  /** Team ids that receive this region's advisories. */
  readonly teams: readonly string[];
}

/** How a region's cells are weighted: by area (the default) or by the people living in each cell ∩ region. */
export type RegionWeighting = 'area' | 'population';

/** The gridded population raster (YAML `population:`), WGS 84 longitude/latitude. */
export interface PopulationConfig {
  /** NetCDF or GeoTIFF file (absolute path). */
  readonly file: string;
  /** NetCDF variable of the people; absent = the only variable on the latitude × longitude grid. */
  readonly variable?: string;
  /** `people-per-pixel` (counts, e.g. a census raster) or `people-per-km2` (density). */
  readonly values: 'people-per-pixel' | 'people-per-km2';
}

/**
 * How an indicator's per-member region value is formed (YAML `region-value:`): the mean of the cells weighted by
 * `weights`, or, with `shareAbove`, the percentage of the region's area or people whose own cell value of the
 * indicator exceeds `shareAbove` (in the indicator's units).
 */
export interface RegionValueConfig {
  readonly weights: RegionWeighting;
  readonly shareAbove?: number;
}

export interface TeamConfig {
  readonly id: string;
  readonly name: string;
  /** Locale of the templates to use: "en", "fr". */
  readonly locale: string;
  readonly recipients: readonly string[];
  /** Marks the coordinating office that receives the national summary. */
  readonly national: boolean;
}

/** How an indicator's exceedance threshold is set. */
export type ThresholdSpec =
  /** Absolute value (quantile-mapped at every tier where observations cover the lead). */
  | { readonly kind: 'absolute'; readonly value: number; readonly units: string }
  /** Percentile of the model climate (hindcasts) at the same lead. */
  | { readonly kind: 'percentile'; readonly percentile: number };

export type { IndicatorKind };

interface IndicatorCommon {
  readonly id: string;
  readonly name: string;
  /** Running-mean window in days where the kind uses one. */
  readonly windowDays: number;
  /** Threshold used for exceedance; per-region overrides below. */
  readonly threshold: ThresholdSpec;
  readonly regionThresholds: Readonly<Record<string, ThresholdSpec>>;
  /** How daily values combine into a week/month lead: mean, max, or count of days above threshold. */
  readonly aggregate: 'mean' | 'max' | 'sum';
  /** Tiers this indicator is computed for. */
  readonly tiers: readonly Tier[];
  /** How the region value is formed; absent = the area-weighted mean. */
  readonly regionValue?: RegionValueConfig;
  /**
   * YAML `trend-climate`: detrend the climate per lead and re-centre it on the issue year (calibrate/trend-climate.ts).
   * Default `defaultTrendClimate(kind)`: on for kinds that need no rainfall, off for rain and malaria.
   */
  readonly trendClimate: boolean;
}

/**
 * One configured indicator, discriminated by `kind`: `params` (camelCase keys) are those its definition in
 * src/indicators/kinds/ declares, validated at load against the kind's params schema.
 */
export type IndicatorConfig = {
  [K in IndicatorKind]: IndicatorCommon & { readonly kind: K; readonly params: IndicatorParams<K> };
}[IndicatorKind];

export interface Config {
  /** Absolute path of the main YAML file. */
  readonly file: string;
  /** Country name as written when no per-locale name is given (the English one when `country:` is per locale). */
  readonly country: string;
  /** Country name per locale (`country: { en: ..., fr: ... }` in the YAML); empty when one name serves every locale. */
  readonly countryNames: Readonly<Record<string, string>>;
  readonly sources: readonly SourceConfig[];
  readonly observations: ObservationsConfig | null;
  readonly regions: readonly RegionConfig[];
  /** The population raster that `region-value: { weights: population }` indicators weight by; null when none. */
  readonly population?: PopulationConfig | null;
  readonly teams: readonly TeamConfig[];
  readonly indicators: readonly IndicatorConfig[];
  /** Ordered lowest ("nothing unusual") to highest ("act now"). */
  readonly stages: readonly StageConfig[];
  readonly rules: readonly TriggerRule[];
  readonly decision: DecisionConfig;
  readonly calibration: CalibrationConfig;
  readonly schedule: ScheduleConfig;
  readonly delivery: DeliveryConfig;
  /** Caution paragraphs per locale; never empty. */
  readonly cautions: Readonly<Record<string, readonly string[]>>;
  /** Words for probability ranges: upper bounds ascending with a word per locale. */
  readonly probabilityWords: readonly { readonly below: number; readonly words: Readonly<Record<string, string>> }[];
  /** SQLite file (absolute path) or PostgreSQL URL `postgres://user@host:port/db` (never with a password). */
  readonly ledger: string;
  /** Environment variable holding the PostgreSQL ledger's password; never the password itself. */
  readonly ledgerPasswordEnv?: string;
  readonly templates: string;
}
