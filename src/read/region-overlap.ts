/**
 * Overlap weights: every grid cell that intersects a region, weighted by the exact spherical area of the
 * intersection (overlap-area.ts). A region smaller than a cell still gets that cell (with its small share);
 * cells on the boundary count by their share. Cell bounds come from `cellBounds` (file bounds or CDO's rule).
 */
import { ringBounds, shapeRingSets } from '../config/region-shape.ts';
import type { RegionShape, Ring } from '../config/types.ts';
import { Clipper, clipStrip, pieceCellArea, ringAreaSr } from './overlap-area.ts';

/** A polygon (outer ring, then holes) in a continuous longitude frame, with its extent. */
export interface FramedPolygon {
  readonly rings: readonly Ring[];
  readonly west: number;
  readonly east: number;
  readonly south: number;
  readonly north: number;
}

/** Any region shape as framed polygons (see config/region-shape.ts). */
export function shapePolygons(shape: RegionShape): FramedPolygon[] {
  return shapeRingSets(shape).map((rings) => ({ rings, ...ringBounds(rings[0]) }));
}

/** Sorted [lo, hi] of every cell along one axis, from `[n][2]` bounds. */
function sortedBounds(bounds: Float64Array, clampLat: boolean): Float64Array {
  const out = new Float64Array(bounds.length);
  for (let i = 0; i < bounds.length; i += 2) {
    let lo = Math.min(bounds[i], bounds[i + 1]);
    let hi = Math.max(bounds[i], bounds[i + 1]);
    if (clampLat) [lo, hi] = [Math.max(-90, lo), Math.min(90, hi)];
    out[i] = lo;
    out[i + 1] = hi;
  }
  return out;
}

/** Cell index (row × columns + column) → intersection area in steradians, for every polygon of a region. */
export function overlapAreas(polygons: readonly FramedPolygon[], latBounds: Float64Array, lonBounds: Float64Array): Map<number, number> {
  const lat = sortedBounds(latBounds, true);
  const lon = sortedBounds(lonBounds, false);
  const nLon = lon.length / 2;
  const clipper = new Clipper();
  const areas = new Map<number, number>();
  for (const p of polygons) {
    for (let y = 0; y < lat.length / 2; y++) {
      const [s, n] = [lat[2 * y], lat[2 * y + 1]];
      if (n <= p.south || s >= p.north) continue;
      const pieces = p.rings.map((ring) => clipStrip(clipper, ring, 0, s, n));
      if (pieces[0].length < 6) continue;
      const ref = (s + n) / 2;
      for (let x = 0; x < nLon; x++) {
        const [w, e] = [lon[2 * x], lon[2 * x + 1]];
        for (let k = Math.ceil((p.west - e) / 360); w + 360 * k < p.east; k++) {
          const [cw, ce] = [w + 360 * k, e + 360 * k];
          let a = pieceCellArea(clipper, pieces[0], cw, ce, ref);
          if (a === 0) continue;
          for (let h = 1; h < pieces.length; h++) a -= pieceCellArea(clipper, pieces[h], cw, ce, ref);
          if (a > 0) areas.set(y * nLon + x, (areas.get(y * nLon + x) ?? 0) + a);
        }
      }
    }
  }
  return areas;
}

/** Area of a region on the unit sphere (steradians): Σ over polygons of |outer| − Σ |holes| (overlap-area.ts). */
export function regionAreaSr(shape: RegionShape): number {
  let total = 0;
  for (const p of shapePolygons(shape)) {
    p.rings.forEach((ring, r) => {
      const flat = ring.slice(0, -1).flat();
      const area = Math.abs(ringAreaSr(flat, flat.length / 2, (p.south + p.north) / 2));
      total += r === 0 ? area : -area;
    });
  }
  return total;
}
