/**
 * The population raster against the configuration, for `forelight check`: the caller reads the raster's header
 * (pipeline/population-check.ts) and passes its extent or the reason it could not; problems are located at
 * `population.file`, or at the entry of each region the raster does not cover (only when an indicator weights by
 * population).
 */
import { diagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { regionEntryOf } from './load-config.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';
import { shapeBounds } from './region-shape.ts';
import type { ConfigSourceMap } from './source-map.ts';
import type { Config, RegionConfig } from './types.ts';

/** A raster's extent in degrees (pixel edges; longitudes in one continuous frame). */
export interface RasterExtent {
  readonly south: number;
  readonly north: number;
  readonly west: number;
  readonly east: number;
}

/** True when the raster's extent holds the region's extent (longitudes modulo 360). */
export function rasterCovers(extent: RasterExtent, region: RegionConfig): boolean {
  const b = region.shape.kind === 'box' ? region.shape : shapeBounds(region.shape);
  const east = b.east < b.west ? b.east + 360 : b.east;
  const eps = 1e-9;
  if (b.south < extent.south - eps || b.north > extent.north + eps) return false;
  if (extent.east - extent.west >= 360 - eps) return true;
  return [-720, -360, 0, 360, 720].some((s) => b.west + s >= extent.west - eps && east + s <= extent.east + eps);
}

export function checkPopulationRaster(
  config: Config,
  raster: { readonly extent: RasterExtent } | { readonly problem: { readonly message: string; readonly hint: string } },
  sourceMap: ConfigSourceMap | undefined,
): Diagnostic[] {
  const place = (p: ConfigProblem): Diagnostic =>
    sourceMap
      ? sourceMap.place('config-population', p)
      : diagnostic('config-population', p.message, p.fix, { file: config.file, pointer: p.pointer });
  if ('problem' in raster) return [place(problem(pointerOf('population', 'file'), raster.problem.message, raster.problem.hint))];
  if (!config.indicators.some((i) => i.regionValue?.weights === 'population')) return [];
  const e = raster.extent;
  return config.regions
    .filter((r) => !rasterCovers(e, r))
    .map((r) =>
      place(
        problem(
          pointerOf('regions', regionEntryOf(config, r.id)),
          `region ${r.id} is not inside the population raster ${config.population?.file ?? ''} (lat ${e.south}..${e.north}, lon ${e.west}..${e.east})`,
          'give a raster that covers every region, or weight the population-weighted indicators by area',
        ),
      ),
    );
}
