/**
 * The share of a region above a level: from one indicator series per grid cell and the cells' weights (area or
 * people, summing to 1), the percentage of the region whose own cell value exceeds `level` (strictly greater, as
 * exceedance probabilities are), per member and day. Cells whose value is missing are left out and the weights of
 * the others renormalised, as in the region mean; a day with no valid cell stays missing (never 0 %).
 * Common practice for "share of the population exposed" (no single source); valid for any level.
 */
import type { IndicatorSeries } from '../types.ts';

export function shareAbove(cells: readonly IndicatorSeries[], weights: Float64Array, level: number, region: string): IndicatorSeries {
  const [first] = cells;
  const data = new Float64Array(first.data.length);
  for (let i = 0; i < data.length; i++) {
    let above = 0;
    let valid = 0;
    cells.forEach((c, k) => {
      const v = c.data[i];
      if (v !== v) return;
      valid += weights[k];
      if (v > level) above += weights[k];
    });
    data[i] = valid > 0 ? (100 * above) / valid : NaN;
  }
  return {
    ...first,
    region,
    units: '%',
    data,
    outOfRange: cells.reduce((n, c) => n + c.outOfRange, 0),
    missing: data.reduce((n, v) => n + Number(v !== v), 0),
  };
}
