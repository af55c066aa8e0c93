/**
 * Which grid cells make up a region, and their area weights.
 *
 * Rule `overlap` (the default): every cell intersecting the region, weighted by the exact spherical area of the
 * intersection (region-overlap.ts). Rule `centre`, below, for users who must match CDO:
 *
 * Inclusion (matches `cdo sellonlatbox`, checked on test/fixtures/regions): a cell belongs to a box when its
 * CENTRE lies inside the box, edges inclusive (to 1e-6°). Longitudes are compared modulo 360, so a box may
 * use -180..180 or 0..360 numbers on either kind of grid and may cross 0° or 180° (west > east means it
 * crosses 180°). A cell belongs to a polygon when its centre is inside the ring by the even-odd rule (ray
 * casting); centres on an edge or vertex (to 1e-6°) count as inside. The polygon is compared in its own
 * longitude frame (cell longitudes are shifted by a multiple of 360° to the ring's mid-longitude).
 *
 * Weights: the cell's area on the sphere, (sin φ2 − sin φ1) × Δλ, from `lat_bnds`/`lon_bnds` when the file
 * has them; otherwise bounds are derived from the centres the way CDO does (midpoints between neighbours,
 * half a spacing beyond the outermost centres, latitude clamped to ±90°). On an evenly spaced grid this is
 * exactly proportional to cos(latitude).
 */
import { InputError } from '../core/errors.ts';
import type { RegionConfig, RegionShape, Ring } from '../config/types.ts';
import type { LatLonGrid } from './coordinates.ts';
import { overlapAreas, shapePolygons } from './region-overlap.ts';

const EDGE_EPS_DEG = 1e-6;
const DEG = Math.PI / 180;

/** The cells of one region as grid indices, with their (unnormalised) area weights. */
export interface RegionCells {
  readonly region: string;
  readonly latIndex: Int32Array;
  readonly lonIndex: Int32Array;
  readonly weights: Float64Array;
}

/** Bounds derived from centres: midpoints inside, half a spacing beyond each end (CDO's rule for absent bounds). */
function deriveBounds(centres: Float64Array): Float64Array {
  const n = centres.length;
  const out = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    const lo = i > 0 ? (centres[i - 1] + centres[i]) / 2 : n > 1 ? centres[0] - (centres[1] - centres[0]) / 2 : centres[0] - 0.5;
    const hi = i < n - 1 ? (centres[i] + centres[i + 1]) / 2 : n > 1 ? centres[i] + (centres[i] - centres[i - 1]) / 2 : centres[0] + 0.5;
    out[2 * i] = lo;
    out[2 * i + 1] = hi;
  }
  return out;
}

/** `[n][2]` cell bounds in degrees along both axes: the file's, or derived from the centres (see module comment). */
export function cellBounds(grid: LatLonGrid): { readonly lat: Float64Array; readonly lon: Float64Array } {
  return { lat: grid.latBounds ?? deriveBounds(grid.lat), lon: grid.lonBounds ?? deriveBounds(grid.lon) };
}

/** Per-row factor |sin φ2 − sin φ1| and per-column width |Δλ| in degrees; weight of a cell is their product. */
export function cellAreaFactors(grid: LatLonGrid): { readonly latFactor: Float64Array; readonly lonWidth: Float64Array } {
  const { lat: latB, lon: lonB } = cellBounds(grid);
  const clamp = (x: number): number => Math.max(-90, Math.min(90, x));
  const latFactor = new Float64Array(grid.lat.length);
  for (let i = 0; i < latFactor.length; i++)
    latFactor[i] = Math.abs(Math.sin(clamp(latB[2 * i + 1]) * DEG) - Math.sin(clamp(latB[2 * i]) * DEG));
  const lonWidth = new Float64Array(grid.lon.length);
  for (let i = 0; i < lonWidth.length; i++) {
    const w = Math.abs(lonB[2 * i + 1] - lonB[2 * i]) % 360;
    lonWidth[i] = w > 180 ? 360 - w : w;
  }
  return { latFactor, lonWidth };
}

function mod360(x: number): number {
  return ((x % 360) + 360) % 360;
}

/** True when longitude `lon` lies in the arc from `west` eastwards to `east`, edges inclusive. */
export function lonInArc(lon: number, west: number, east: number): boolean {
  if (east - west >= 360) return true;
  const span = mod360(east - west);
  const rel = mod360(lon - west);
  return rel <= span + EDGE_EPS_DEG || rel >= 360 - EDGE_EPS_DEG;
}

function onSegment(x: number, y: number, x1: number, y1: number, x2: number, y2: number): boolean {
  const cross = (x2 - x1) * (y - y1) - (y2 - y1) * (x - x1);
  const len = Math.hypot(x2 - x1, y2 - y1);
  if (Math.abs(cross) > EDGE_EPS_DEG * Math.max(len, 1)) return false;
  return (
    x >= Math.min(x1, x2) - EDGE_EPS_DEG &&
    x <= Math.max(x1, x2) + EDGE_EPS_DEG &&
    y >= Math.min(y1, y2) - EDGE_EPS_DEG &&
    y <= Math.max(y1, y2) + EDGE_EPS_DEG
  );
}

/** Even-odd ray casting; points on an edge or vertex count as inside. `ring` is [lon, lat] pairs. */
export function pointInRing(lon: number, lat: number, ring: Ring): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (onSegment(lon, lat, xj, yj, xi, yi)) return true;
    if (yi > lat !== yj > lat && lon < ((xj - xi) * (lat - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/** "box S..N, W..E" or "polygon of K points, lat a..b, lon c..d" for messages. */
export function describeShape(shape: RegionShape): string {
  if (shape.kind === 'box') return `box ${shape.south}..${shape.north}, ${shape.west}..${shape.east}`;
  const polygons = shapePolygons(shape);
  const [s, n] = [Math.min(...polygons.map((p) => p.south)), Math.max(...polygons.map((p) => p.north))];
  const [w, e] = [Math.min(...polygons.map((p) => p.west)), Math.max(...polygons.map((p) => p.east))];
  const what = shape.kind === 'polygon' ? `polygon of ${shape.ring.length} points` : `${polygons.length} polygon(s)`;
  return `${what}, lat ${s}..${n}, lon ${w}..${e}`;
}

function range(values: Float64Array): string {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return `${lo}..${hi}`;
}

/** A membership test for one shape on cell centres (lat, lon in the grid's own convention). */
function shapeTest(shape: RegionShape): (lat: number, lon: number) => boolean {
  if (shape.kind === 'box') {
    return (lat, lon) => lat >= shape.south - EDGE_EPS_DEG && lat <= shape.north + EDGE_EPS_DEG && lonInArc(lon, shape.west, shape.east);
  }
  // Even-odd over all rings of a polygon: inside the outer ring and outside its holes.
  const polygons = shapePolygons(shape);
  return (lat, lon) =>
    polygons.some((p) => {
      if (lat < p.south - EDGE_EPS_DEG || lat > p.north + EDGE_EPS_DEG) return false;
      const x = lon + 360 * Math.round(((p.west + p.east) / 2 - lon) / 360);
      return p.rings.reduce((inside, ring) => inside !== pointInRing(x, lat, ring), false);
    });
}

function centreCells(grid: LatLonGrid, shape: RegionShape): { latIdx: number[]; lonIdx: number[]; weights: number[] } {
  const inside = shapeTest(shape);
  const { latFactor, lonWidth } = cellAreaFactors(grid);
  const out: ReturnType<typeof centreCells> = { latIdx: [], lonIdx: [], weights: [] };
  for (let y = 0; y < grid.lat.length; y++) {
    for (let x = 0; x < grid.lon.length; x++) {
      if (!inside(grid.lat[y], grid.lon[x])) continue;
      out.latIdx.push(y);
      out.lonIdx.push(x);
      out.weights.push(latFactor[y] * lonWidth[x] * DEG); // steradians, as the overlap rule
    }
  }
  return out;
}

/** Cells with their intersection area in steradians, ascending by (row, column). */
function overlapCells(grid: LatLonGrid, shape: RegionShape): { latIdx: number[]; lonIdx: number[]; weights: number[] } {
  const bounds = cellBounds(grid);
  const areas = [...overlapAreas(shapePolygons(shape), bounds.lat, bounds.lon)].sort((a, b) => a[0] - b[0]);
  const nLon = grid.lon.length;
  return { latIdx: areas.map(([c]) => Math.floor(c / nLon)), lonIdx: areas.map(([c]) => c % nLon), weights: areas.map(([, a]) => a) };
}

/**
 * The cells of `region` on `grid`, with area weights (see module comment for the rules).
 * @throws InputError `region-empty` when no cell counts for the region.
 */
export function selectRegionCells(grid: LatLonGrid, region: RegionConfig, file: string): RegionCells {
  const rule = region.cellRule ?? 'overlap';
  const { latIdx, lonIdx, weights } = rule === 'centre' ? centreCells(grid, region.shape) : overlapCells(grid, region.shape);
  if (latIdx.length === 0) {
    throw new InputError(
      'region-empty',
      file,
      `region '${region.id}' (${describeShape(region.shape)}) has no grid cell in ${file} (grid lat ${range(grid.lat)}, lon ${range(grid.lon)})`,
      rule === 'centre'
        ? 'check the region shape or the source, or use cell-rule: overlap (a region smaller than a cell may hold no centre)'
        : 'check the region shape (longitude east, latitude north) or the source',
    );
  }
  return { region: region.id, latIndex: Int32Array.from(latIdx), lonIndex: Int32Array.from(lonIdx), weights: Float64Array.from(weights) };
}
