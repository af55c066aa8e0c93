/**
 * The configuration the benchmarks time: the shipped one narrowed to one sub-seasonal source, the bench's regions,
 * four indicators against the 90th percentile of the model climate, two rules each, no observations. Shared by
 * bench/forelight-entry.ts and bench/continental/ (a module without a main block, so that bundles of either work).
 */
import type { Config, IndicatorConfig, RegionConfig } from '../src/config/types.ts';
import type { Quantity } from '../src/types.ts';

export const QUANTITIES: Partial<Record<Quantity, string>> = { tmax: 'tasmax', tmin: 'tasmin', dewpoint: 'tdps' };

/** The four bench indicators, each against the 90th percentile of the model climate at the same lead. */
export const INDICATORS: readonly IndicatorConfig[] = (
  [
    ['tmax-3day', 'tmax-mean', 'max'],
    ['tmin-3day', 'tmin-mean', 'mean'],
    ['heat-index', 'heat-index', 'max'],
    ['humidex', 'humidex', 'max'],
  ] as const
).map(([id, kind, aggregate]) => ({
  id,
  name: id,
  kind,
  windowDays: kind.endsWith('-mean') ? 3 : 1,
  threshold: { kind: 'percentile', percentile: 90 },
  regionThresholds: {},
  trendClimate: false,
  aggregate,
  tiers: ['weeks'],
  params: {},
}));

/**
 * The shipped configuration narrowed to the bench: one sub-seasonal source (the forecast file, hindcasts by
 * pattern), the 20 bench boxes, four indicators with a "mindful" and a "brace" rule each, no observations.
 */
export function benchConfig(
  base: Config,
  forecast: string,
  hindcastPattern: string,
  regions: readonly RegionConfig[],
  cacheDir: string,
): Config {
  return {
    ...base,
    sources: [
      {
        id: 'bench',
        name: 'bench ensemble',
        tier: 'weeks',
        forecast: [forecast],
        hindcast: hindcastPattern,
        variables: QUANTITIES,
        priority: 1,
        lookbackDays: 10,
      },
    ],
    observations: null,
    regions,
    teams: [],
    indicators: INDICATORS,
    rules: INDICATORS.flatMap((ind) => [
      { id: `${ind.id}-mindful`, indicator: ind.id, tier: 'weeks' as const, leads: [1, 2, 3, 4, 5, 6], stage: 'mindful', probability: 0.4 },
      { id: `${ind.id}-brace`, indicator: ind.id, tier: 'weeks' as const, leads: [1, 2, 3, 4, 5, 6], stage: 'brace', probability: 0.6 },
    ]),
    calibration: { ...base.calibration, cacheDir },
  };
}

/** Issue date of the bench forecasts (make-large-inputs.ts). */
export const BENCH_ISSUE_DATE = '2026-11-26';
