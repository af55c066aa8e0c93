/**
 * Region-weight benchmark (`npm run bench -- --weights-only`, also run first by `npm run bench`): exact
 * area-overlap weights on a 0.25° global grid (721 × 1440 centres, 90 → −90, like ERA5) for
 * (a) 1,000 invented districts (60-vertex star-shaped rings of 0.3–1.2° radius, one in ten with a lake, some across
 *     180°; seeded), and (b) every valid country of Natural Earth 1:50m (public domain, npm world-atlas 2.0.2).
 * Prints the wall time of the weight computation (no cache) and the number of cells used.
 */
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { featurePolygons } from '../src/config/boundaries/feature-geometry.ts';
import type { RegionConfig } from '../src/config/types.ts';
import type { LatLonGrid } from '../src/read/coordinates.ts';
import { selectRegionCells } from '../src/read/regions.ts';
import { naturalEarthCountries } from '../test/regions/natural-earth.ts';

/** Park & Miller (1988) minimal standard generator, "Random number generators: good ones are hard to find", CACM 31(10). */
function lehmer(seed: number): () => number {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

function star(cx: number, cy: number, radius: number, rnd: () => number, n = 60): [number, number][] {
  const ring: [number, number][] = [];
  for (let i = 0; i < n; i++) {
    const a = (2 * Math.PI * i) / n;
    const r = radius * (0.75 + 0.25 * rnd());
    ring.push([cx + (r * Math.cos(a)) / Math.cos((cy * Math.PI) / 180), cy + r * Math.sin(a)]);
  }
  ring.push(ring[0]);
  return ring;
}

/** Where district centres fall (degrees); the default, the whole world between 60° S and 60° N, also puts every 50th on 180°. */
export interface DistrictArea {
  readonly south: number;
  readonly north: number;
  readonly west: number;
  readonly east: number;
}

const WORLD: DistrictArea = { south: -60, north: 60, west: -180, east: 180 };

export function inventedDistricts(count: number, area: DistrictArea = WORLD): RegionConfig[] {
  const rnd = lehmer(20261202);
  const world = area === WORLD;
  return Array.from({ length: count }, (_, i) => {
    const cx = world && i % 50 === 0 ? 179.5 : area.west + (area.east - area.west) * rnd();
    const cy = area.south + (area.north - area.south) * rnd();
    const radius = 0.3 + 0.9 * rnd();
    const rings = [star(cx, cy, radius, rnd)];
    if (i % 10 === 0) rings.push(star(cx, cy, radius * 0.3, rnd, 12).reverse());
    const g = featurePolygons({ type: 'Polygon', coordinates: rings.map((r) => r.map(([x, y]) => [x > 180 ? x - 360 : x, y])) });
    if ('problem' in g) throw new Error(`district ${i}: ${g.problem}`);
    return { id: `d${i}`, name: `d${i}`, shape: { kind: 'multipolygon', polygons: g.polygons }, utcOffsetHours: 0, teams: [] };
  });
}

function naturalEarth50m(): { regions: RegionConfig[]; refused: number } {
  let refused = 0;
  const regions = naturalEarthCountries('50m').features.flatMap((f, i): RegionConfig[] => {
    const g = featurePolygons(f.geometry as never);
    if ('problem' in g) return (refused++, []);
    return [{ id: `c${i}`, name: f.properties.name, shape: { kind: 'multipolygon', polygons: g.polygons }, utcOffsetHours: 0, teams: [] }];
  });
  return { regions, refused };
}

function quarterDegreeGrid(): LatLonGrid {
  return {
    latName: 'latitude',
    lonName: 'longitude',
    lat: Float64Array.from({ length: 721 }, (_, i) => 90 - 0.25 * i),
    lon: Float64Array.from({ length: 1440 }, (_, i) => 0.25 * i),
    latBounds: null,
    lonBounds: null,
  };
}

function time(label: string, regions: readonly RegionConfig[], grid: LatLonGrid): string {
  const t0 = performance.now();
  let cells = 0;
  for (const r of regions) cells += selectRegionCells(grid, r, 'bench-grid').weights.length;
  const s = (performance.now() - t0) / 1000;
  return `${label}: ${regions.length} regions, ${cells} cells used, ${s.toFixed(2)} s`;
}

export function regionWeightsBench(): string[] {
  const grid = quarterDegreeGrid();
  const ne = naturalEarth50m();
  return [
    'Region weights, exact area overlap, 0.25° global grid (721 × 1440)',
    time('  1,000 invented districts', inventedDistricts(1000), grid),
    time(`  Natural Earth 1:50m countries (${ne.refused} refused as invalid geometry)`, ne.regions, grid),
  ];
}

// Not when bundled into another entry (import.meta.url is then the bundle's).
if (import.meta.url.endsWith('.ts') && process.argv[1] === fileURLToPath(import.meta.url))
  process.stdout.write(`${regionWeightsBench().join('\n')}\n`);
