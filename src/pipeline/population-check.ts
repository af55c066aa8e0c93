/**
 * The population raster's header for `forelight check` (src/config/check-population.ts): its extent, or why it
 * cannot serve (missing, unreadable, not WGS 84 longitude/latitude). Only coordinates are read.
 */
import { checkPopulationRaster } from '../config/check-population.ts';
import type { ConfigSourceMap } from '../config/source-map.ts';
import type { Config } from '../config/types.ts';
import type { Diagnostic } from '../core/diagnostics.ts';
import { ForelightError } from '../core/errors.ts';
import { populationExtent } from '../read/population-raster.ts';

export async function populationProblems(config: Config, sourceMap: ConfigSourceMap | undefined): Promise<Diagnostic[]> {
  if (!config.population) return [];
  try {
    const extent = await populationExtent(config.population, config.calibration.cacheDir);
    return checkPopulationRaster(config, { extent }, sourceMap);
  } catch (err) {
    if (!(err instanceof ForelightError)) throw err;
    return checkPopulationRaster(
      config,
      { problem: { message: `${config.population.file}: ${err.diagnostic.message}`, hint: err.diagnostic.hint } },
      sourceMap,
    );
  }
}
