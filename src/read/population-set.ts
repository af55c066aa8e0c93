/**
 * Population weights of the population-weighted regions of a region set on one grid (population-weights.ts),
 * computed once per (grid, region set, raster) and reused: in this process and across runs through
 * `<cache-dir>/weights/<sha>.json`, keyed also by the sha256 of the raster file. The raster is read only on a miss,
 * and only around the regions. A region that fails (raster not covering it, nobody there) is reported each time.
 */
import { createHash } from 'node:crypto';
import { statSync } from 'node:fs';
import { join } from 'node:path';
import { shapeBounds } from '../config/region-shape.ts';
import type { PopulationConfig, RegionConfig } from '../config/types.ts';
import { ForelightError } from '../core/errors.ts';
import { sha256File } from '../core/file-checksums.ts';
import type { LatLonGrid } from './coordinates.ts';
import { readPopulation, type RasterExtent } from './population-raster.ts';
import { populationCells } from './population-weights.ts';
import { gridHash, readStored, writeStored } from './region-weights.ts';
import type { RegionCells } from './regions.ts';

/** Bump when the population weighting changes. */
const FORMAT = 1;
const memo = new Map<string, Map<string, RegionCells>>();
const rasterSums = new Map<string, string>();

async function rasterSha(file: string): Promise<string> {
  let stamp = file;
  try {
    const st = statSync(file);
    stamp = `${file}:${st.size}:${st.mtimeMs}`;
  } catch {
    // readPopulation names a missing file
  }
  let sha = rasterSums.get(stamp);
  if (!sha) rasterSums.set(stamp, (sha = await sha256File(file).catch(() => 'missing')));
  return sha;
}

/** Envelope of the regions' extents (longitudes of the first region's frame, widened to 360° when they spread). */
function window(regions: readonly RegionConfig[]): RasterExtent {
  const b = regions.map((r) => (r.shape.kind === 'box' ? r.shape : shapeBounds(r.shape)));
  const west = Math.min(...b.map((x) => x.west));
  const east = Math.max(...b.map((x) => (x.east < x.west ? x.east + 360 : x.east)));
  return {
    south: Math.min(...b.map((x) => x.south)),
    north: Math.max(...b.map((x) => x.north)),
    west,
    east: east - west > 360 ? west + 360 : east,
  };
}

/**
 * Population-weighted cells of every `selected` region whose `weighting` is `population`, by region id; the
 * regions that fail go to `problems`.
 */
export async function populationSetCells(
  grid: LatLonGrid,
  selected: readonly { readonly region: RegionConfig; readonly cells: RegionCells }[],
  pop: PopulationConfig,
  cacheDir: string | null,
): Promise<{ cells: Map<string, RegionCells>; problems: ForelightError[] }> {
  const wanted = selected.filter((s) => s.region.weighting === 'population');
  const problems: ForelightError[] = [];
  if (wanted.length === 0) return { cells: new Map(), problems };
  const regionsKey = JSON.stringify(wanted.map((s) => [s.region.id, s.region.cellRule ?? 'overlap', s.region.shape]));
  const key = createHash('sha256')
    .update(`${FORMAT}-${gridHash(grid)}-${await rasterSha(pop.file)}-${pop.values}-${pop.variable ?? ''}-${regionsKey}`)
    .digest('hex');
  const dir = cacheDir === null ? null : join(cacheDir, 'weights');
  const path = dir === null ? null : join(dir, `population-${key}.json`);
  const known = memo.get(key) ?? (path ? readStored(path, grid) : null) ?? new Map<string, RegionCells>();
  const missing = wanted.filter((s) => !known.has(s.region.id));
  if (missing.length > 0) {
    let raster;
    try {
      raster = await readPopulation(pop, cacheDir, window(missing.map((s) => s.region)));
    } catch (err) {
      if (!(err instanceof ForelightError)) throw err;
      return { cells: known, problems: [err] };
    }
    for (const s of missing) {
      try {
        known.set(s.region.id, populationCells(grid, s.cells, s.region, raster));
      } catch (err) {
        if (!(err instanceof ForelightError)) throw err;
        problems.push(err);
      }
    }
    if (dir && path && problems.length === 0) writeStored(dir, path, known);
  }
  memo.set(key, known);
  return { cells: known, problems };
}
