/**
 * An indicator's per-member series for one region as its `region-value` asks: computed on the region's mean series
 * (area- or population-weighted, config/region-views.ts), or, with `share-above`, computed on every cell's own
 * series and turned into the % of the region's area or people above the level (indicators/region-share.ts). The
 * indicator's context (climatology, antecedent days) is the region's, for every cell.
 */
import { regionViewId } from '../config/region-views.ts';
import type { IndicatorConfig } from '../config/types.ts';
import { ForelightError } from '../core/errors.ts';
import { computeIndicator, type IndicatorContext, type IndicatorResult } from '../indicators/compute.ts';
import { shareAbove } from '../indicators/region-share.ts';
import type { Quantity, RegionSeries } from '../types.ts';

type ByRegion = ReadonlyMap<string, ReadonlyMap<Quantity, RegionSeries>>;

/** The series an indicator of `region` is computed on (its region value's view), or undefined when not read. */
export function indicatorInputs(series: ByRegion, region: string, ind: IndicatorConfig): ReadonlyMap<Quantity, RegionSeries> | undefined {
  return series.get(regionViewId(region, ind));
}

/** The cells' own series of every quantity, as one map per cell (all quantities come from one file read). */
function cellInputs(
  inputs: ReadonlyMap<Quantity, RegionSeries>,
  region: string,
): { maps: Map<Quantity, RegionSeries>[]; weights: Float64Array } {
  const all = [...inputs.values()];
  const weights = all[0]?.perCell?.weights ?? new Float64Array(0);
  const maps = Array.from({ length: weights.length }, () => new Map<Quantity, RegionSeries>());
  for (const s of all) {
    const size = s.data.length;
    if (!s.perCell || s.perCell.weights.length !== weights.length)
      throw new ForelightError(
        'indicators',
        'series-shape',
        `the cells of region ${region} differ between quantities`,
        'report it with the file',
      );
    maps.forEach((m, k) => m.set(s.quantity, { ...s, data: s.perCell!.data.subarray(k * size, (k + 1) * size), perCell: undefined }));
  }
  return { maps, weights };
}

/** The indicator on the region's inputs (see module comment); `region` is the configured region's id. */
export function regionIndicator(
  ind: IndicatorConfig,
  inputs: ReadonlyMap<Quantity, RegionSeries>,
  region: string,
  context: IndicatorContext,
): IndicatorResult {
  const level = ind.regionValue?.shareAbove;
  if (level === undefined) return { ...computeIndicator(ind, inputs, context), region };
  const { maps, weights } = cellInputs(inputs, region);
  const cells = maps.map((m) => computeIndicator(ind, m, context));
  return { ...shareAbove(cells, weights, level, region), indicator: ind.id, notes: [...new Set(cells.flatMap((c) => c.notes))] };
}
