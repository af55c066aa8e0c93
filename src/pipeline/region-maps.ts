/**
 * The archive's region maps: for each source, an SVG map and a GeoJSON preview of the regions and the grid cells
 * they average (render/region-map.ts, the same as `forelight regions`), in `<archive>/maps/<source>.svg|.geojson`,
 * rewritten at every run from each source's newest forecast grid. A source whose grid cannot be read keeps its
 * previous map and is logged; the run goes on.
 */
import { join } from 'node:path';
import type { Config } from '../config/types.ts';
import type { Logger } from '../core/log.ts';
import { writeFileAtomic } from '../core/write-atomic.ts';
import { MAPS_FOLDER } from '../render/archive.ts';
import { regionMapSvg, regionPreviewGeoJson } from '../render/region-map.ts';
import { regionReport } from './region-report.ts';

export async function writeRegionMaps(config: Config, log: Logger): Promise<void> {
  const { sources, notes } = await regionReport(config);
  const dir = join(config.delivery.archive, MAPS_FOLDER);
  for (const s of sources) {
    writeFileAtomic(join(dir, `${s.source}.geojson`), JSON.stringify(regionPreviewGeoJson(s)) + '\n', 'render');
    writeFileAtomic(
      join(dir, `${s.source}.svg`),
      regionMapSvg(s, `${config.country}: regions and the grid cells of source ${s.source}`),
      'render',
    );
  }
  for (const n of notes) log.warn(`region map not redrawn: ${n}`, { stage: 'render' });
}
