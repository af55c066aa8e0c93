/**
 * Boundary geometry as read from a file, made ready for weighting: rings checked (closed, at least 4 positions,
 * finite, latitude within ±90°, no self-intersection or crossing between rings of one polygon: the OGC Simple
 * Features validity rules, ISO 19125-1 §6.1.11.1) and longitudes made continuous, so a ring crossing 180° runs
 * e.g. 170..190 instead of jumping by 360° (RFC 7946 §3.1.9 asks writers to cut such rings, but GIS exports
 * often do not). Holes are put in their outer ring's frame. A ring around a pole (its unwrapped longitudes do
 * not close) keeps its longitudes as written.
 */
import type { Ring } from '../types.ts';

type Point = readonly [number, number];

/** Longitudes continuous along the ring (each point within 180° of the previous), unless that opens the ring. */
export function unwrapRing(ring: Ring): Ring {
  const out: [number, number][] = [];
  let prev = ring[0][0];
  for (const [lon, lat] of ring) {
    const x = lon + 360 * Math.round((prev - lon) / 360);
    out.push([x, lat]);
    prev = x;
  }
  const [first, last] = [out[0], out[out.length - 1]];
  return Math.abs(first[0] - last[0]) > 1e-9 ? ring : out;
}

/** Shifts a ring by a multiple of 360° so its first point is within 180° of `lon`. */
function shiftNear(ring: Ring, lon: number): Ring {
  const k = Math.round((lon - ring[0][0]) / 360);
  return k === 0 ? ring : ring.map(([x, y]) => [x + 360 * k, y] as const);
}

/** Outer ring and holes in one continuous frame; the outer ring's west edge moved into −180..180. */
export function framePolygon(rings: readonly Ring[]): Ring[] {
  const unwrapped = unwrapRing(rings[0]);
  const west = Math.min(...unwrapped.map((p) => p[0]));
  const outer = shiftNear(unwrapped, unwrapped[0][0] - 360 * Math.floor((west + 180) / 360));
  return [outer, ...rings.slice(1).map((h) => shiftNear(unwrapRing(h), outer[0][0]))];
}

/** First problem with a ring's positions, or null. */
export function ringProblem(ring: readonly (readonly number[])[]): string | null {
  if (ring.length === 0) return 'is empty';
  if (ring.some((p) => !Array.isArray(p) || p.length < 2 || !Number.isFinite(p[0]) || !Number.isFinite(p[1])))
    return 'has a position that is not a pair of numbers';
  const bad = ring.find((p) => Math.abs(p[1]) > 90);
  if (bad) return `has latitude ${bad[1]} outside −90..90 (are longitude and latitude swapped, or is it not in degrees?)`;
  if (ring.length < 4) return `has ${ring.length} positions; a ring needs at least 4 (the first repeated at the end)`;
  const [first, last] = [ring[0], ring[ring.length - 1]];
  if (first[0] !== last[0] || first[1] !== last[1])
    return `is not closed: last position [${last[0]}, ${last[1]}] differs from the first [${first[0]}, ${first[1]}]`;
  const distinct = new Set(ring.slice(1).map((p) => `${p[0]},${p[1]}`)).size;
  if (distinct < 3) return `has only ${distinct} distinct positions; a ring needs at least 3 (it encloses no area)`;
  return null;
}

interface Segment {
  readonly ring: number;
  readonly index: number;
  readonly a: Point;
  readonly b: Point;
  readonly minX: number;
  readonly maxX: number;
}

function orient(p: Point, q: Point, r: Point): number {
  const v = (q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]);
  return v > 0 ? 1 : v < 0 ? -1 : 0;
}

function onSeg(p: Point, q: Point, r: Point): boolean {
  return Math.min(p[0], r[0]) <= q[0] && q[0] <= Math.max(p[0], r[0]) && Math.min(p[1], r[1]) <= q[1] && q[1] <= Math.max(p[1], r[1]);
}

/**
 * Segments intersect — the orientation test (Cormen et al. 2009, Introduction to Algorithms, §33.1). Touching
 * counts within one ring; rings of one polygon may touch at a point (ISO 19125-1 §6.1.11.1) but not cross.
 */
function intersects(s: Segment, t: Segment): boolean {
  const [o1, o2, o3, o4] = [orient(s.a, s.b, t.a), orient(s.a, s.b, t.b), orient(t.a, t.b, s.a), orient(t.a, t.b, s.b)];
  if (s.ring !== t.ring) return o1 * o2 < 0 && o3 * o4 < 0;
  if (o1 !== o2 && o3 !== o4) return true;
  return (
    (o1 === 0 && onSeg(s.a, t.a, s.b)) ||
    (o2 === 0 && onSeg(s.a, t.b, s.b)) ||
    (o3 === 0 && onSeg(t.a, s.a, t.b)) ||
    (o4 === 0 && onSeg(t.a, s.b, t.b))
  );
}

/** Segments that are neighbours on one ring share an end point legitimately. */
function adjacent(s: Segment, t: Segment, ringSizes: readonly number[]): boolean {
  if (s.ring !== t.ring) return false;
  const n = ringSizes[s.ring];
  const d = Math.abs(s.index - t.index);
  return d <= 1 || d === n - 1;
}

/** Where two intersecting edges meet: their crossing point (Cramer's rule), or for collinear edges an end point shared. */
function meetingPoint(s: Segment, t: Segment): Point {
  const [dx, dy, ex, ey] = [s.b[0] - s.a[0], s.b[1] - s.a[1], t.b[0] - t.a[0], t.b[1] - t.a[1]];
  const det = dx * ey - dy * ex;
  if (det === 0) return [t.a, t.b, s.b].find((p) => onSeg(s.a, p, s.b) || onSeg(t.a, p, t.b)) ?? s.a;
  const u = ((t.a[0] - s.a[0]) * ey - (t.a[1] - s.a[1]) * ex) / det;
  return [s.a[0] + u * dx, s.a[1] + u * dy];
}

/**
 * Where two edges of one polygon (its rings in a continuous frame) cross or touch, or null. Sorted by west end,
 * each edge is compared only with edges overlapping it in longitude (a sweep; near n log n for real boundaries).
 */
export function selfIntersection(rings: readonly Ring[]): { ring: number; other: number; at: Point } | null {
  const segs: Segment[] = [];
  const sizes: number[] = [];
  rings.forEach((ring, r) => {
    const pts = ring.filter((p, i) => i === 0 || p[0] !== ring[i - 1][0] || p[1] !== ring[i - 1][1]);
    sizes.push(pts.length - 1);
    for (let i = 0; i + 1 < pts.length; i++) {
      const [a, b] = [pts[i], pts[i + 1]];
      segs.push({ ring: r, index: i, a, b, minX: Math.min(a[0], b[0]), maxX: Math.max(a[0], b[0]) });
    }
  });
  segs.sort((s, t) => s.minX - t.minX);
  for (let i = 0; i < segs.length; i++) {
    for (let j = i + 1; j < segs.length && segs[j].minX <= segs[i].maxX; j++) {
      const [s, t] = [segs[i], segs[j]];
      if (adjacent(s, t, sizes)) continue;
      if (Math.max(Math.min(s.a[1], s.b[1]), Math.min(t.a[1], t.b[1])) > Math.min(Math.max(s.a[1], s.b[1]), Math.max(t.a[1], t.b[1])))
        continue;
      if (intersects(s, t)) return { ring: s.ring, other: t.ring, at: meetingPoint(s, t) };
    }
  }
  return null;
}
