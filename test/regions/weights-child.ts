/** Child process for region-weights.test.ts: one "run" computing the weights of the sample districts on a 1° grid. */
import { featurePolygons } from '../../src/config/boundaries/feature-geometry.ts';
import type { RegionConfig } from '../../src/config/types.ts';
import { regionSetCells } from '../../src/read/region-weights.ts';
import { readFileSync } from 'node:fs';

const [cacheDir, districts, step] = process.argv.slice(2);
const fc = JSON.parse(readFileSync(districts, 'utf8')) as {
  features: { properties: { code: string }; geometry: { type: string; coordinates: unknown } }[];
};
const regions: RegionConfig[] = fc.features.map((f) => {
  const g = featurePolygons(f.geometry);
  if ('problem' in g) throw new Error(g.problem);
  return {
    id: f.properties.code,
    name: f.properties.code,
    shape: { kind: 'multipolygon', polygons: g.polygons },
    utcOffsetHours: 0,
    teams: [],
  };
});
const d = Number(step);
const axis = (lo: number, n: number) => Float64Array.from({ length: n }, (_, i) => lo + d / 2 + i * d);
const grid = { latName: 'lat', lonName: 'lon', lat: axis(-20, 20 / d), lon: axis(-10, 20 / d), latBounds: null, lonBounds: null };
const { selected } = regionSetCells(grid, regions, 'grid.nc', cacheDir);
process.stdout.write(JSON.stringify(Object.fromEntries(selected.map((s) => [s.region.id, [...s.cells.weights]]))));
