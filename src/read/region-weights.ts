/**
 * The cells and weights of a whole region set on one grid, computed once per (grid, region set) and reused:
 * in this process (hindcast years share the forecast's grid) and across runs through a cache file named by the
 * sha256 of the grid's cell bounds and of the regions' shapes and cell rules (`<cache-dir>/weights/<sha>.json`).
 * A region that fails (no cell on this grid) is reported each time and never cached.
 */
import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { RegionConfig } from '../config/types.ts';
import { ForelightError } from '../core/errors.ts';
import { jsonShape, parseShaped } from '../core/json-shape.ts';
import { writeFileAtomic } from '../core/write-atomic.ts';
import type { LatLonGrid } from './coordinates.ts';
import { cellBounds, selectRegionCells, type RegionCells } from './regions.ts';

/** Bump when the weight computation changes, so older cache files are not used. */
const FORMAT = 1;

export interface RegionSetCells {
  /** Regions with cells, in the order given. */
  readonly selected: { readonly region: RegionConfig; readonly cells: RegionCells }[];
  readonly problems: ForelightError[];
}

const setHashes = new WeakMap<readonly RegionConfig[], string>();
const memo = new Map<string, Map<string, RegionCells>>();

function regionSetHash(regions: readonly RegionConfig[]): string {
  let h = setHashes.get(regions);
  if (!h) {
    h = createHash('sha256')
      .update(JSON.stringify(regions.map((r) => [r.id, r.cellRule ?? 'overlap', r.shape])))
      .digest('hex');
    setHashes.set(regions, h);
  }
  return h;
}

/** sha256 of a grid's centres and cell bounds (cache keys). */
export function gridHash(grid: LatLonGrid): string {
  const { lat, lon } = cellBounds(grid);
  const hash = createHash('sha256');
  for (const a of [grid.lat, grid.lon, lat, lon]) hash.update(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
  return hash.digest('hex');
}

type Stored = Record<string, { lat: number[]; lon: number[]; w: number[] }>;

const index = { type: 'array', items: { type: 'integer', minimum: 0 } };
/** A cache file as `writeStored` writes it, of this format: grid indices and finite weights ≥ 0 per region. */
const isStoredFile = jsonShape<{ format: typeof FORMAT; regions: Stored }>({
  type: 'object',
  properties: {
    format: { const: FORMAT },
    regions: {
      type: 'object',
      additionalProperties: {
        type: 'object',
        properties: { lat: index, lon: index, w: { type: 'array', items: { type: 'number', minimum: 0 } } },
        required: ['lat', 'lon', 'w'],
        additionalProperties: false,
      },
    },
  },
  required: ['format', 'regions'],
});

/**
 * A stored cell set (`writeStored`) on `grid`, or null when absent, unreadable, of an older format, of another shape
 * or pointing outside the grid (then it is computed again and rewritten: a damaged cache is never used).
 */
export function readStored(path: string, grid: LatLonGrid): Map<string, RegionCells> | null {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    return null;
  }
  const doc = parseShaped(text, isStoredFile);
  if (!doc.ok) return null;
  const cells = new Map<string, RegionCells>();
  for (const [region, c] of Object.entries(doc.value.regions)) {
    if (c.lat.length !== c.w.length || c.lon.length !== c.w.length) return null;
    if (c.lat.some((y) => y >= grid.lat.length) || c.lon.some((x) => x >= grid.lon.length)) return null;
    cells.set(region, { region, latIndex: Int32Array.from(c.lat), lonIndex: Int32Array.from(c.lon), weights: Float64Array.from(c.w) });
  }
  return cells;
}

/** Stores a cell set atomically; a failure only costs the computation next time. */
export function writeStored(dir: string, path: string, cells: ReadonlyMap<string, RegionCells>): void {
  try {
    mkdirSync(dir, { recursive: true });
    const regions: Stored = {};
    for (const [id, c] of cells) regions[id] = { lat: [...c.latIndex], lon: [...c.lonIndex], w: [...c.weights] };
    writeFileAtomic(path, JSON.stringify({ format: FORMAT, regions }));
  } catch {
    // A cache that cannot be written only costs the computation next time.
  }
}

/**
 * Cells of every region of `regions` on `grid` (see module comment). `cacheDir` null = in-process memo only.
 * Regions without cells go to `problems` (the others go on).
 */
export function regionSetCells(grid: LatLonGrid, regions: readonly RegionConfig[], file: string, cacheDir: string | null): RegionSetCells {
  const key = `${gridHash(grid)}-${regionSetHash(regions)}`;
  const dir = cacheDir === null ? null : join(cacheDir, 'weights');
  const path = dir === null ? null : join(dir, `${createHash('sha256').update(key).digest('hex')}.json`);
  let known = memo.get(key) ?? (path ? readStored(path, grid) : null);
  const fresh = !known;
  known ??= new Map();
  const selected: RegionSetCells['selected'] = [];
  const problems: ForelightError[] = [];
  for (const region of regions) {
    const cached = known.get(region.id);
    if (cached) {
      selected.push({ region, cells: cached });
      continue;
    }
    try {
      const cells = selectRegionCells(grid, region, file);
      known.set(region.id, cells);
      selected.push({ region, cells });
    } catch (err) {
      if (!(err instanceof ForelightError)) throw err;
      problems.push(err);
    }
  }
  memo.set(key, known);
  if (fresh && dir && path) writeStored(dir, path, known);
  return { selected, problems };
}
