/**
 * Population weights of a region on a source grid: each source cell weighs the people living in cell ∩ region,
 * Σ over raster pixels p of density(p) × |p ∩ cell ∩ region| (steradians), people spread evenly within a pixel.
 * The pieces p ∩ cell are the rectangles between the union of the cell's and the raster's edges, and each piece's
 * intersection with the region is the exact spherical area of overlap-area.ts, so weights = area share × people.
 */
import { rasterCovers } from '../config/check-population.ts';
import type { RegionConfig, Ring } from '../config/types.ts';
import { InputError } from '../core/errors.ts';
import type { LatLonGrid } from './coordinates.ts';
import type { PopulationGrid } from './population-raster.ts';
import { overlapAreas, shapePolygons, type FramedPolygon } from './region-overlap.ts';
import { cellBounds, describeShape, type RegionCells } from './regions.ts';

/** Index of the interval of ascending `edges` holding `x`, or -1. */
function intervalOf(edges: Float64Array, x: number): number {
  let [lo, hi] = [0, edges.length - 1];
  if (!(x >= edges[0] && x < edges[hi])) return -1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (edges[mid] <= x) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** [lo, hi] cut by the raster's edges (shifted by `shifts`), with the raster interval of each piece (-1 outside). */
function pieces(lo: number, hi: number, edges: Float64Array, shifts: readonly number[]): { bounds: Float64Array; index: Int32Array } {
  const cuts = new Set([lo, hi]);
  for (const s of shifts) for (const e of edges) if (e + s > lo && e + s < hi) cuts.add(e + s);
  const sorted = [...cuts].sort((a, b) => a - b);
  const bounds = new Float64Array(2 * (sorted.length - 1));
  const index = new Int32Array(sorted.length - 1);
  for (let i = 0; i + 1 < sorted.length; i++) {
    [bounds[2 * i], bounds[2 * i + 1]] = [sorted[i], sorted[i + 1]];
    const mid = (sorted[i] + sorted[i + 1]) / 2;
    index[i] = -1;
    for (const s of shifts) if (index[i] < 0) index[i] = intervalOf(edges, mid - s);
  }
  return { bounds, index };
}

/** People in (one cell × region), from the cell's rectangle in degrees. */
function cellPeople(polygons: readonly FramedPolygon[], pop: PopulationGrid, s: number, n: number, w: number, e: number): number {
  const rows = pieces(s, n, pop.latEdges, [0]);
  const cols = pieces(w, e, pop.lonEdges, [-720, -360, 0, 360, 720]);
  const nCols = pop.lonEdges.length - 1;
  let people = 0;
  for (const [k, area] of overlapAreas(polygons, rows.bounds, cols.bounds)) {
    const [y, x] = [rows.index[Math.floor(k / cols.index.length)], cols.index[k % cols.index.length]];
    if (y >= 0 && x >= 0) people += pop.density[y * nCols + x] * area;
  }
  return people;
}

/**
 * The region's cells (from the area weights) re-weighted by the people in each cell ∩ region.
 * @throws InputError `population-coverage` when the raster does not hold the region, `population-empty` when nobody lives there.
 */
export function populationCells(grid: LatLonGrid, area: RegionCells, region: RegionConfig, pop: PopulationGrid): RegionCells {
  const extent = pop.extent;
  if (pop.density.length === 0 || !rasterCovers(extent, region)) {
    throw new InputError(
      'population-coverage',
      pop.file,
      `population raster (lat ${extent.south}..${extent.north}, lon ${extent.west}..${extent.east}) does not cover region '${region.id}' (${describeShape(region.shape)})`,
      'give a raster that covers every region, or weight the indicator by area (region-value: { weights: area })',
    );
  }
  // Under the centre rule a cell counts whole, so do its people.
  const polygons = region.cellRule === 'centre' ? null : shapePolygons(region.shape);
  const b = cellBounds(grid);
  const weights = new Float64Array(area.weights.length);
  let total = 0;
  for (let k = 0; k < weights.length; k++) {
    const [y, x] = [area.latIndex[k], area.lonIndex[k]];
    const [s, n] = [Math.max(-90, Math.min(b.lat[2 * y], b.lat[2 * y + 1])), Math.min(90, Math.max(b.lat[2 * y], b.lat[2 * y + 1]))];
    const [w, e] = [Math.min(b.lon[2 * x], b.lon[2 * x + 1]), Math.max(b.lon[2 * x], b.lon[2 * x + 1])];
    const ring: Ring = [
      [w, s],
      [e, s],
      [e, n],
      [w, n],
      [w, s],
    ];
    weights[k] = cellPeople(polygons ?? [{ rings: [ring], south: s, north: n, west: w, east: e }], pop, s, n, w, e);
    total += weights[k];
  }
  if (!(total > 0)) {
    throw new InputError(
      'population-empty',
      pop.file,
      `population raster holds nobody in region '${region.id}' (${describeShape(region.shape)})`,
      'check the raster over that region (gdalinfo -stats), or weight the indicator by area',
    );
  }
  return { region: region.id, latIndex: area.latIndex, lonIndex: area.lonIndex, weights };
}
