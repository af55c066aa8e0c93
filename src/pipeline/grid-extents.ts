/**
 * Grid extents of each source's newest forecast file, for the "region outside every source grid" check of
 * `forelight check` (src/config/check-grids.ts). Only headers and coordinate variables are read.
 */
import type { GridExtent } from '../config/check-grids.ts';
import type { Config, SourceConfig } from '../config/types.ts';
import { fillPattern, matchPattern, type PatternMatch } from '../core/path-patterns.ts';
import { fileVariables } from './split-files.ts';
import { diagnostic, within, type Diagnostic } from '../core/diagnostics.ts';
import { diagnosticOf } from '../core/errors.ts';
import { findCoordinates } from '../read/coordinates.ts';
import { withDataset } from '../read/open-dataset.ts';

/**
 * The first file of a source's newest forecast on disk (the greatest `{date}` any pattern matches, `{var}` the
 * first variable, `{member}` the first member), or null when no file matches yet.
 */
export function newestForecastFile(source: SourceConfig): string | null {
  const [variable] = fileVariables(source);
  const found = source.forecast.flatMap((p) => matchPattern(fillPattern(p, { var: variable })));
  const newest = found.reduce<PatternMatch | null>(
    (best, m) => (best === null || (m.values.date ?? '') > (best.values.date ?? '') ? m : best),
    null,
  );
  return newest?.path ?? null;
}

/** Extents of the sources whose files can be found and read; the others are listed as notes. */
export async function sourceGridExtents(config: Config): Promise<{ grids: GridExtent[]; notes: Diagnostic[] }> {
  const grids: GridExtent[] = [];
  const notes: Diagnostic[] = [];
  for (const source of config.sources) {
    const file = newestForecastFile(source);
    if (!file) {
      notes.push(
        diagnostic(
          'grid-not-checked',
          `source '${source.id}': no forecast file yet matches ${source.forecast.join(' + ')}${hindcastMissing(source)}; its grid was not checked`,
          '',
          { source: source.id },
        ),
      );
      continue;
    }
    try {
      const { grid } = await withDataset(file, findCoordinates);
      const lats = Array.from(grid.lat);
      const lons = Array.from(grid.lon);
      grids.push({
        source: source.id,
        latMin: Math.min(...lats),
        latMax: Math.max(...lats),
        lonMin: Math.min(...lons),
        lonMax: Math.max(...lons),
        lon360: Math.max(...lons) > 180,
        centres: { lats, lons },
      });
    } catch (err) {
      notes.push({
        ...within(diagnosticOf(err, 'read-failed'), `source '${source.id}'`, { source: source.id }, 'grid-not-checked'),
        severity: 'note',
      });
    }
  }
  return { grids, notes };
}

/** ", nor any hindcast file …" when the source's `hindcast-files` matches nothing either (checked once forecasts arrive). */
function hindcastMissing(source: SourceConfig): string {
  return source.hindcast !== undefined && matchPattern(source.hindcast).length === 0 ? `, nor any hindcast file ${source.hindcast}` : '';
}
