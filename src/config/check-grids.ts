/**
 * "Region outside every grid" check, which needs the data: the caller reads each source's grid extent from
 * its files and passes it here; problems are located at the region's entry in the YAML.
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
