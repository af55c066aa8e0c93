/**
 * From a region set to what the read stage reduces: each region's area cells (region-weights.ts, cached per grid
 * and region set), then population-weighted regions get their people
 * weights (population-set.ts); regions that keep their cells get one single-cell band region per cell, read in the
 * same pass as the means, whose series become the region's `perCell` values.
 */
import type { PopulationConfig, RegionConfig } from '../config/types.ts';
import { InputError, type ForelightError } from '../core/errors.ts';
import type { CellSeries } from '../types.ts';
import type { LatLonGrid } from './coordinates.ts';
import type { RegionMeans } from './extract-reduce.ts';
import { populationSetCells } from './population-set.ts';
import { regionSetCells } from './region-weights.ts';
import type { RegionCells } from './regions.ts';

type Selected = { readonly region: RegionConfig; readonly cells: RegionCells };

/** One cell of a region that keeps its cells: `owner` is the region's index in the selection. */
export interface CellRegion {
  readonly region: RegionConfig;
  readonly owner: number;
  readonly cells: RegionCells;
}

/** The regions of `regions` with cells on `grid`, their weights and kept cells; regions left out are `problems`. */
export async function regionSelection(
  grid: LatLonGrid,
  regions: readonly RegionConfig[],
  opts: { readonly population: PopulationConfig | null; readonly cacheDir: string | null; readonly file: string },
): Promise<{ selected: Selected[]; cellRegions: CellRegion[]; problems: ForelightError[] }> {
  const area = regionSetCells(grid, regions, opts.file, opts.cacheDir);
  const areaSelected = area.selected;
  const problems: ForelightError[] = [...area.problems];
  let people = new Map<string, RegionCells>();
  const needsPeople = areaSelected.some((s) => s.region.weighting === 'population');
  if (needsPeople && !opts.population) {
    problems.push(
      new InputError(
        'population-raster',
        opts.file,
        'an indicator weights by population but no population raster is configured',
        'add population: { file: …, values: people-per-pixel } to the YAML, or weight the indicator by area',
      ),
    );
  } else if (needsPeople && opts.population) {
    const r = await populationSetCells(grid, areaSelected, opts.population, opts.cacheDir);
    people = r.cells;
    problems.push(...r.problems);
  }
  const selected: Selected[] = [];
  for (const s of areaSelected) {
    if (s.region.weighting !== 'population') selected.push(s);
    else if (people.has(s.region.id)) selected.push({ region: s.region, cells: people.get(s.region.id)! });
  }
  const cellRegions: CellRegion[] = [];
  selected.forEach((s, owner) => {
    if (!s.region.keepCells) return;
    for (let k = 0; k < s.cells.weights.length; k++) {
      cellRegions.push({
        region: s.region,
        owner,
        cells: {
          region: s.region.id,
          latIndex: s.cells.latIndex.subarray(k, k + 1),
          lonIndex: s.cells.lonIndex.subarray(k, k + 1),
          weights: Float64Array.of(1),
        },
      });
    }
  });
  return { selected, cellRegions, problems };
}

/** The per-cell series of selected region `owner` from the reduced means (cell regions follow the `offset` regions). */
export function cellSeriesOf(
  weights: Float64Array,
  means: readonly RegionMeans[],
  offset: number,
  cellRegions: readonly CellRegion[],
  owner: number,
): CellSeries {
  const parts = cellRegions.flatMap((c, i) => (c.owner === owner ? [means[offset + i].data] : []));
  const size = parts[0]?.length ?? 0;
  const data = new Float64Array(size * parts.length);
  parts.forEach((p, i) => data.set(p, i * size));
  const total = weights.reduce((a, b) => a + b, 0);
  return { weights: weights.map((w) => w / total), data };
}
