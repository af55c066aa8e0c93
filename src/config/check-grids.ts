/**
 * Checks of the regions against each source's grid, which need the data: the caller reads each source's grid
 * (extent and cell centres) from its files and passes it here; problems are located at the region's entry in the
 * YAML. "Outside the grid" is an error; a box that falls between cell centres is a warning.
 */
import { diagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { pointerOf, problem } from './problem.ts';
import { regionEntryOf } from './load-config.ts';
import type { ConfigSourceMap } from './source-map.ts';
import { shapeBounds, type ShapeBounds } from './region-shape.ts';
import type { Config, RegionShape } from './types.ts';

export interface GridExtent {
  readonly source: string;
  /** Extent of the grid-cell centres, degrees. */
  readonly latMin: number;
  readonly latMax: number;
  readonly lonMin: number;
  readonly lonMax: number;
  /** True when the file's longitudes run 0..360 instead of -180..180. */
  readonly lon360: boolean;
  /** The cell-centre coordinates, degrees (absent: only the extent is known). */
  readonly centres?: { readonly lats: readonly number[]; readonly lons: readonly number[] };
}

function bounds(shape: RegionShape): ShapeBounds {
  if (shape.kind === 'box') return shape;
  const b = shapeBounds(shape);
  // A shape crossing 180° is checked as two arcs' envelope: the whole longitude circle.
  return b.east > 180 ? { ...b, west: -180, east: 180 } : b;
}

/**
 * The arc from `west` eastwards to `east` (west > east crosses 180°) as intervals in the grid's convention
 * (0..360 or -180..180); an arc across the end of that range splits in two.
 */
export function lonIntervals(west: number, east: number, lon360: boolean): [number, number][] {
  const lo = lon360 ? 0 : -180;
  const start = lo + ((((west - lo) % 360) + 360) % 360);
  const span = east - west >= 360 ? 360 : (((east - west) % 360) + 360) % 360;
  const end = start + span;
  return end <= lo + 360
    ? [[start, end]]
    : [
        [start, lo + 360],
        [lo, end - 360],
      ];
}

const overlaps = (a0: number, a1: number, b0: number, b1: number) => a0 <= b1 && b0 <= a1;
const EDGE = 1e-6;

/**
 * One diagnostic per region that lies entirely outside a source's grid, at the region's YAML line when the
 * source map of the loaded configuration is given (`checkConfigFile` returns it), else naming the file only.
 */
export function checkRegionsAgainstGrids(
  config: Config,
  grids: readonly GridExtent[],
  sourceMap: ConfigSourceMap | undefined,
): Diagnostic[] {
  const out: Diagnostic[] = [];
  config.regions.forEach((region) => {
    const i = regionEntryOf(config, region.id);
    const b = bounds(region.shape);
    for (const g of grids) {
      const latOk = overlaps(b.south, b.north, g.latMin, g.latMax);
      const lonOk = lonIntervals(b.west, b.east, g.lon360).some(([w, e]) => overlaps(w, e, g.lonMin, g.lonMax));
      if (latOk && lonOk) continue;
      const p = problem(
        pointerOf('regions', i),
        `region ${region.id} (lat ${b.south}..${b.north}, lon ${b.west}..${b.east}) lies outside the grid of source ${g.source} (lat ${g.latMin}..${g.latMax}, lon ${g.lonMin}..${g.lonMax})`,
        'check the region coordinates (latitude north positive, longitude east positive, -180..180) or the source files',
      );
      out.push(
        sourceMap
          ? sourceMap.place('config-grid', p)
          : diagnostic('config-grid', p.message, p.fix, { file: config.file, pointer: p.pointer }),
      );
    }
  });
  return out;
}

/** Spacing of sorted coordinates (smallest step), for the message. */
function spacing(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  let step = Infinity;
  for (let i = 1; i < sorted.length; i++) if (sorted[i] > sorted[i - 1]) step = Math.min(step, sorted[i] - sorted[i - 1]);
  return Number.isFinite(step) ? +step.toFixed(4) : NaN;
}

/**
 * One warning per box region × source whose box lies within the grid's extent but contains no cell centre: under
 * `cell-rule: centre` (as cdo sellonlatbox) it gets no cells at all, so that source gives it no value; under the
 * default `overlap` rule it is still valid, its value being the area-weighted mean of the cells it touches. Boxes
 * outside the grid are left to checkRegionsAgainstGrids; polygons are not checked here.
 */
export function checkBoxesBetweenCentres(
  config: Config,
  grids: readonly GridExtent[],
  sourceMap: ConfigSourceMap | undefined,
): Diagnostic[] {
  const out: Diagnostic[] = [];
  config.regions.forEach((region) => {
    if (region.shape.kind !== 'box') return;
    const b = region.shape;
    for (const g of grids) {
      if (!g.centres) continue;
      const lonOk = lonIntervals(b.west, b.east, g.lon360);
      // A regular grid holds a centre in the box when one latitude and one longitude of the centres fall in it;
      // centres on the edge count (to 1e-6°, as the centre rule of src/read/regions.ts).
      const inLat = g.centres.lats.some((lat) => lat >= b.south - EDGE && lat <= b.north + EDGE);
      const inLon = g.centres.lons.some((lon) => lonOk.some(([w, e]) => lon >= w - EDGE && lon <= e + EDGE));
      const touches = overlaps(b.south, b.north, g.latMin, g.latMax) && lonOk.some(([w, e]) => overlaps(w, e, g.lonMin, g.lonMax));
      if ((inLat && inLon) || !touches) continue;
      const rule = region.cellRule ?? 'overlap';
      const where = `box region ${region.id} (lat ${b.south}..${b.north}, lon ${b.west}..${b.east}) contains no cell centre of source ${g.source}'s grid (spacing ${spacing(g.centres.lats)}° × ${spacing(g.centres.lons)}°)`;
      const p =
        rule === 'centre'
          ? problem(
              pointerOf('regions', regionEntryOf(config, region.id)),
              `${where}: with cell-rule: centre it gets no cells, so this source gives it no value`,
              'remove cell-rule: centre (the overlap rule weights the cells the box touches by shared area) or enlarge the box to hold a cell centre',
            )
          : problem(
              pointerOf('regions', regionEntryOf(config, region.id)),
              `${where}: cell-rule overlap (the default) is in use, so its value is the area-weighted mean of the cells it touches, land and sea alike`,
              'nothing to do if that is intended; enlarge the box or use a finer grid for a value of its own',
            );
      out.push(
        sourceMap
          ? sourceMap.place('region-between-centres', p)
          : diagnostic('region-between-centres', p.message, p.fix, { file: config.file, pointer: p.pointer }),
      );
    }
  });
  return out;
}
