/**
 * One feature's GeoJSON geometry (Polygon or MultiPolygon) → checked polygons in a continuous longitude frame
 * (geometry.ts), or the first problem found, naming the polygon and ring.
 */
import type { Ring } from '../types.ts';
import { framePolygon, ringProblem, selfIntersection } from './geometry.ts';
import type { RawFeature } from './read-features.ts';

export type GeometryCheck = { readonly polygons: Ring[][] } | { readonly problem: string };

function polygonsOf(geometry: RawFeature['geometry']): unknown[] | string {
  if (!geometry) return 'has no geometry (empty)';
  if (geometry.type === 'Polygon') return [geometry.coordinates];
  if (geometry.type === 'MultiPolygon')
    return Array.isArray(geometry.coordinates) ? geometry.coordinates : 'has MultiPolygon without coordinates';
  return `has geometry type ${geometry.type}; regions need Polygon or MultiPolygon`;
}

/** A point of the continuous frame as the file would write it: longitude back in −180..180, 6 decimals (0.1 m). */
function lonLatText([lon, lat]: readonly [number, number]): string {
  const wrapped = lon > 180 || lon < -180 ? ((((lon + 180) % 360) + 360) % 360) - 180 : lon;
  return `${Number(wrapped.toFixed(6))}, ${Number(lat.toFixed(6))}`;
}

export function featurePolygons(geometry: RawFeature['geometry']): GeometryCheck {
  const raw = polygonsOf(geometry);
  if (typeof raw === 'string') return { problem: raw };
  if (raw.length === 0) return { problem: 'has no polygon (empty)' };
  const out: Ring[][] = [];
  for (let p = 0; p < raw.length; p++) {
    const rings = raw[p];
    const where = raw.length > 1 ? `polygon ${p}, ` : '';
    if (!Array.isArray(rings) || rings.length === 0) return { problem: `${where}has no ring (empty)` };
    for (let r = 0; r < rings.length; r++) {
      const issue = Array.isArray(rings[r])
        ? ringProblem(rings[r] as number[][]) /* ringProblem checks every position */
        : 'is not a list of positions';
      if (issue) return { problem: `${where}ring ${r} ${r === 0 ? '(outer)' : '(hole)'} ${issue}` };
    }
    const framed = framePolygon((rings as number[][][]).map((ring) => ring.map(([lon, lat]) => [lon, lat] as const)));
    const cross = selfIntersection(framed);
    if (cross) {
      const name = (r: number) => `ring ${r} ${r === 0 ? '(outer)' : '(hole)'}`;
      const what =
        cross.ring === cross.other ? `${name(cross.ring)} intersects itself` : `${name(cross.ring)} crosses ${name(cross.other)}`;
      return { problem: `${where}${what} at [${lonLatText(cross.at)}]` };
    }
    out.push(framed);
  }
  return { polygons: out };
}
