/**
 * The union "band" of all regions: the smallest latitude-row range and (circular) longitude-column range that
 * holds every selected cell. Data are read once per variable for this band only; of what is read, only the
 * cells some region uses (`band.used`) are kept, decoded and reduced. Each region's cells are indices into
 * that compact list, computed once per grid.
 */
import type { RegionCells } from './regions.ts';

export interface GridBand {
  readonly lat0: number;
  readonly nLat: number;
  /** First longitude index; columns are lon0, lon0+1, … modulo `gridLon` (the band may wrap past the last index). */
  readonly lon0: number;
  readonly nLon: number;
  readonly gridLon: number;
  /** Cells used by at least one region, as band-flat indices `row * nLon + column`, ascending. */
  readonly used: Int32Array;
}

export interface BandRegion {
  readonly region: string;
  /** Indices into `band.used`. */
  readonly cells: Int32Array;
  readonly weights: Float64Array;
}

/** Smallest circular arc of column indices covering `used` (true = needed). */
function columnArc(used: Uint8Array): { lon0: number; nLon: number } {
  const n = used.length;
  let bestGap = 0;
  let bestGapEnd = 0;
  for (let start = 0; start < n; start++) {
    if (used[start] || !used[(start - 1 + n) % n]) continue;
    let len = 0;
    while (len < n && !used[(start + len) % n]) len++;
    if (len > bestGap) {
      bestGap = len;
      bestGapEnd = (start + len) % n;
    }
  }
  return bestGap === 0 ? { lon0: 0, nLon: n } : { lon0: bestGapEnd, nLon: n - bestGap };
}

/** The union band of `regions` on a grid of `gridLat` × `gridLon` cells, and each region's cells in it. */
export function planBand(regions: readonly RegionCells[], gridLat: number, gridLon: number): { band: GridBand; regions: BandRegion[] } {
  let latMin = gridLat;
  let latMax = -1;
  const usedCols = new Uint8Array(gridLon);
  for (const r of regions) {
    for (let k = 0; k < r.latIndex.length; k++) {
      latMin = Math.min(latMin, r.latIndex[k]);
      latMax = Math.max(latMax, r.latIndex[k]);
      usedCols[r.lonIndex[k]] = 1;
    }
  }
  if (latMax < 0) return { band: { lat0: 0, nLat: 0, lon0: 0, nLon: 0, gridLon, used: new Int32Array(0) }, regions: [] };
  const { lon0, nLon } = columnArc(usedCols);
  const nLat = latMax - latMin + 1;
  const flat = regions.map((r) =>
    Int32Array.from(r.latIndex, (y, k) => (y - latMin) * nLon + ((r.lonIndex[k] - lon0 + gridLon) % gridLon)),
  );
  const compact = new Int32Array(nLat * nLon).fill(-1);
  for (const cells of flat) for (const c of cells) compact[c] = 0;
  const used: number[] = [];
  compact.forEach((mark, c) => {
    if (mark === 0) {
      compact[c] = used.length;
      used.push(c);
    }
  });
  const band: GridBand = { lat0: latMin, nLat, lon0, nLon, gridLon, used: Int32Array.from(used) };
  return {
    band,
    regions: flat.map((cells, k) => ({ region: regions[k].region, cells: cells.map((c) => compact[c]), weights: regions[k].weights })),
  };
}
