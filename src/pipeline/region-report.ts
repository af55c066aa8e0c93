/**
 * What each region averages on each source's grid (`forelight regions`): cells used, the area they cover, the
 * region's own area, and a warning when the region is much smaller than the cells it falls in (its value is
 * then a blend of neighbouring cells, land and sea alike). The grid is that of each source's newest forecast.
 */
import type { Config } from '../config/types.ts';
import { describeError } from '../core/errors.ts';
import { findCoordinates } from '../read/coordinates.ts';
import { withDataset } from '../read/open-dataset.ts';
import { regionAreaSr } from '../read/region-overlap.ts';
import { regionSetCells } from '../read/region-weights.ts';
import { cellBounds } from '../read/regions.ts';
import type { SourceRegions, UsedCell } from '../render/region-map.ts';
import { newestForecastFile } from './grid-extents.ts';

/** Mean Earth radius R1 = 6371.0088 km (Moritz 2000, Geodetic Reference System 1980, IUGG; Bulletin Géodésique 74). */
export const EARTH_RADIUS_KM = 6371.0088;
/** "Much smaller than a grid cell": region area below this share of the largest cell it touches (common practice, no source). */
export const SMALL_REGION_SHARE = 0.25;

const toKm2 = (sr: number) => sr * EARTH_RADIUS_KM * EARTH_RADIUS_KM;

/** Per source with a readable newest forecast: every region's cells; `notes` for sources without one. */
export async function regionReport(config: Config): Promise<{ sources: SourceRegions[]; notes: string[] }> {
  const sources: SourceRegions[] = [];
  const notes: string[] = [];
  for (const source of config.sources) {
    const file = newestForecastFile(source);
    if (!file) {
      notes.push(`source '${source.id}': no forecast file yet matches ${source.forecast.join(' + ')}`);
      continue;
    }
    try {
      const { grid } = await withDataset(file, findCoordinates);
      const { selected, problems } = regionSetCells(grid, config.regions, file, config.calibration.cacheDir);
      const b = cellBounds(grid);
      const cellSr = (y: number, x: number) =>
        (Math.abs(Math.sin((b.lat[2 * y + 1] * Math.PI) / 180) - Math.sin((b.lat[2 * y] * Math.PI) / 180)) *
          Math.abs(b.lon[2 * x + 1] - b.lon[2 * x]) *
          Math.PI) /
        180;
      const regions = selected.map(({ region, cells }) => {
        const total = cells.weights.reduce((a, w) => a + w, 0);
        const used = Array.from(cells.weights, (w, k): UsedCell => {
          const [y, x] = [cells.latIndex[k], cells.lonIndex[k]];
          const [s, n] = [Math.min(b.lat[2 * y], b.lat[2 * y + 1]), Math.max(b.lat[2 * y], b.lat[2 * y + 1])];
          const [w0, e0] = [Math.min(b.lon[2 * x], b.lon[2 * x + 1]), Math.max(b.lon[2 * x], b.lon[2 * x + 1])];
          return { bounds: [w0, Math.max(-90, s), e0, Math.min(90, n)], weight: w / total, km2: toKm2(w) };
        });
        const largest = Math.max(...Array.from(cells.latIndex, (y, k) => toKm2(cellSr(y, cells.lonIndex[k]))));
        const regionKm2 = toKm2(regionAreaSr(region.shape));
        return {
          region,
          cells: used,
          coveredKm2: toKm2(total),
          regionKm2,
          largestCellKm2: largest,
          small: regionKm2 < SMALL_REGION_SHARE * largest,
        };
      });
      sources.push({ source: source.id, file, regions, problems: problems.map(describeError) });
    } catch (err) {
      notes.push(`source '${source.id}': ${describeError(err)}`);
    }
  }
  return { sources, notes };
}
