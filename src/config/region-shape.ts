/** Outer rings and extent of any region shape (boxes as rings; a box with west > east crosses 180°). */
import type { RegionShape, Ring } from './types.ts';

/** Every polygon of a shape as [outer ring, …holes]; a box becomes the ring west..east (east + 360 across 180°). */
export function shapeRingSets(shape: RegionShape): (readonly Ring[])[] {
  if (shape.kind === 'box') {
    const east = shape.east < shape.west ? shape.east + 360 : shape.east;
    const { south: s, north: n, west: w } = shape;
    return [
      [
        [
          [w, s],
          [w, n],
          [east, n],
          [east, s],
          [w, s],
        ],
      ],
    ];
  }
  return shape.kind === 'polygon' ? [[shape.ring]] : shape.polygons.map((p) => [...p]);
}

export interface ShapeBounds {
  readonly south: number;
  readonly north: number;
  /** West and east in the shape's own continuous frame (east may exceed 180 for a shape crossing 180°). */
  readonly west: number;
  readonly east: number;
}

export function ringBounds(ring: Ring): ShapeBounds {
  let [west, east, south, north] = [Infinity, -Infinity, Infinity, -Infinity];
  for (const [lon, lat] of ring) {
    west = Math.min(west, lon);
    east = Math.max(east, lon);
    south = Math.min(south, lat);
    north = Math.max(north, lat);
  }
  return { south, north, west, east };
}

/** Extent of all outer rings of a shape. */
export function shapeBounds(shape: RegionShape): ShapeBounds {
  const b = shapeRingSets(shape).map((p) => ringBounds(p[0]));
  return {
    south: Math.min(...b.map((x) => x.south)),
    north: Math.max(...b.map((x) => x.north)),
    west: Math.min(...b.map((x) => x.west)),
    east: Math.max(...b.map((x) => x.east)),
  };
}
