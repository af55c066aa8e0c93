/**
 * What the read stage reads per region besides the area-weighted mean: for every distinct `region-value` of the
 * indicators (population weights, cells kept for share-above values) one derived region per configured region,
 * with id `<region>@<view>` (outside the id grammar, so never a configured id). Indicators find their series
 * through `regionViewId`.
 */
import type { Config, IndicatorConfig, RegionConfig, RegionValueConfig } from './types.ts';

const AREA_MEAN: RegionValueConfig = { weights: 'area' };

/** The view name of a region value, or null for the area-weighted mean (the configured region itself). */
function viewOf(v: RegionValueConfig): string | null {
  const cells = v.shareAbove !== undefined;
  if (v.weights === 'area') return cells ? 'cells' : null;
  return cells ? 'population-cells' : 'population';
}

/** The region id under which the read stage returns the series an indicator is computed on. */
export function regionViewId(region: string, ind: IndicatorConfig): string {
  const view = viewOf(ind.regionValue ?? AREA_MEAN);
  return view === null ? region : `${region}@${view}`;
}

/** The configured regions, then the derived regions the indicators' region values need. */
export function readRegions(config: Pick<Config, 'regions' | 'indicators'>): RegionConfig[] {
  const views = new Map<string, RegionValueConfig>();
  for (const ind of config.indicators) {
    const v = ind.regionValue ?? AREA_MEAN;
    const view = viewOf(v);
    if (view !== null) views.set(view, v);
  }
  return [
    ...config.regions,
    ...[...views].flatMap(([view, v]) =>
      config.regions.map((r) => ({
        ...r,
        id: `${r.id}@${view}`,
        weighting: v.weights,
        ...(v.shareAbove !== undefined ? { keepCells: true } : {}),
      })),
    ),
  ];
}
