/** Builders for indicator tests: invented Veloria region series and indicator configs (no real data). */
import type { IndicatorConfig, IndicatorKind } from '../../src/config/types.ts';
import type { IndicatorParams } from '../../src/indicators/registry.ts';
import { CANONICAL_UNITS, type IsoDate, type Quantity, type RegionSeries } from '../../src/types.ts';
import { addDays } from '../../src/core/iso-dates.ts';

export function dayList(first: IsoDate, n: number): IsoDate[] {
  return Array.from({ length: n }, (_, i) => addDays(first, i));
}

export function regionSeries(
  quantity: Quantity,
  days: readonly IsoDate[],
  members: number,
  data: Float64Array,
  region = 'kessan-lowlands',
): RegionSeries {
  return {
    region,
    quantity,
    units: CANONICAL_UNITS[quantity],
    days,
    members,
    data,
    cells: 12,
    provenance: { file: `sample-inputs/forecast-20261123.nc`, variable: `${quantity}_var`, referenceTime: '2026-11-23T00:00:00Z' },
  };
}

export function inputsOf(...series: RegionSeries[]): Map<Quantity, RegionSeries> {
  return new Map(series.map((s) => [s.quantity, s]));
}

/** An indicator of `kind` (every kind's params are optional, so `{}` fits each). */
export function indicator<K extends IndicatorKind>(
  kind: K,
  params: IndicatorParams<K> = {} as IndicatorParams<K>,
  windowDays = 3,
): IndicatorConfig {
  return {
    id: `test-${kind}`,
    name: kind,
    kind,
    windowDays,
    threshold: { kind: 'percentile', percentile: 90 },
    regionThresholds: {},
    trendClimate: false,
    aggregate: 'mean',
    tiers: ['days'],
    params,
  } as IndicatorConfig;
}

/** Deterministic uniform 0..1 generator (mulberry32), so the fixtures are reproducible. */
export { mulberry32 as rng } from '../support/rng.ts';
