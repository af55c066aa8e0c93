/**
 * Grid extents of each source's newest forecast file, for the "region outside every source grid" check of
 * `forelight check` (src/config/check-grids.ts). Only headers and coordinate variables are read.
 */
import { readdirSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import type { GridExtent } from '../config/check-grids.ts';
import type { Config } from '../config/types.ts';
import { diagnostic, within, type Diagnostic } from '../core/diagnostics.ts';
import { diagnosticOf } from '../core/errors.ts';
import { findCoordinates } from '../read/coordinates.ts';
import { withDataset } from '../read/open-dataset.ts';

/** The newest file matching a `{date}` pattern (YYYYMMDD in the file name), or null when none exists. */
export function newestForecastFile(pattern: string): string | null {
  const name = basename(pattern);
  const [before, after] = name.split('{date}');
  if (after === undefined) return pattern;
  let entries: string[];
  try {
    entries = readdirSync(dirname(pattern));
  } catch {
    return null;
  }
  const dated = entries.filter(
    (e) => e.startsWith(before) && e.endsWith(after) && /^\d{8}$/.test(e.slice(before.length, e.length - after.length)),
  );
  return dated.length === 0 ? null : join(dirname(pattern), dated.sort().at(-1) as string);
}

/** Extents of the sources whose files can be found and read; the others are listed as notes. */
export async function sourceGridExtents(config: Config): Promise<{ grids: GridExtent[]; notes: Diagnostic[] }> {
  const grids: GridExtent[] = [];
  const notes: Diagnostic[] = [];
  for (const source of config.sources) {
    const file = newestForecastFile(source.forecast);
    if (!file) {
      notes.push(
        diagnostic(
          'grid-not-checked',
          `source '${source.id}': no forecast file yet matches ${source.forecast}; its grid was not checked`,
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
