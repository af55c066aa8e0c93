/**
 * Population-weighted region means (`forelight extract FILE --var tas --regions B.geojson --population RASTER --json`)
 * against shapely/GEOS + numpy (population_reference.py: people per cell = Σ count × |pixel ∩ cell ∩ region| / |pixel|,
 * exact spherical areas): weights within 1e-6 relative, means within 1e-4 relative, and the share of a district's
 * people whose cell is above a level (region-value share-above) within 1e-4 percentage points. Rasters: a GeoTIFF written by
 * GDAL (gdal_translate from an ESRI ASCII grid, EPSG:4326) holding counts, and a NetCDF written by ncgen holding the
 * same people as density per km² with latitude descending. Pixels (0.25°, edges offset by 0.1°) straddle the
 * 1° source cells. Bad rasters: a projected CRS (UTM, warped by gdalwarp; the suggested gdalwarp line is run and
 * its output accepted) and a raster not covering a district give one line naming file, CRS or region.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadBoundarySet } from '../../src/config/boundaries/boundary-sets.ts';
import { regionIndicator } from '../../src/calibrate/region-indicator.ts';
import { readRegions, regionViewId } from '../../src/config/region-views.ts';
import type { IndicatorConfig, PopulationConfig, RegionConfig } from '../../src/config/types.ts';
import { readFile } from '../../src/pipeline/read-file.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import { findCoordinates } from '../../src/read/coordinates.ts';
import { withDataset } from '../../src/read/open-dataset.ts';
import { populationSetCells } from '../../src/read/population-set.ts';
import { regionSetCells } from '../../src/read/region-weights.ts';

const ROOT = join(import.meta.dirname, '../..');
const DISTRICTS = join(ROOT, 'config/veloria-districts.geojson');
const dir = mkdtempSync(join(tmpdir(), 'forelight-population-'));
const [SOUTH, WEST, STEP, ROWS, COLS] = [-16.1, -7.1, 0.25, 45, 49];
const DEG = Math.PI / 180;
const KM2_PER_SR = 6371.0088 ** 2;

/** People per pixel (invented): smooth with a few empty (no-data) pixels, row 0 southmost. */
const counts: (number | null)[][] = Array.from({ length: ROWS }, (_, i) =>
  Array.from({ length: COLS }, (_, j) => {
    if ((i * 7 + j * 3) % 23 === 0) return null;
    const [lat, lon] = [SOUTH + (i + 0.5) * STEP, WEST + (j + 0.5) * STEP];
    return Math.round(500 * (1.2 + Math.sin(1.3 * lat) * Math.cos(0.9 * lon)) ** 2);
  }),
);

function writeAsciiGrid(path: string, south = SOUTH): void {
  const rows = [...counts].reverse().map((r) => r.map((v) => (v === null ? -9999 : v)).join(' '));
  writeFileSync(
    path,
    [`ncols ${COLS}`, `nrows ${ROWS}`, `xllcorner ${WEST}`, `yllcorner ${south}`, `cellsize ${STEP}`, 'NODATA_value -9999', ...rows].join(
      '\n',
    ) + '\n',
  );
}

function geoTiff(name: string, srs: string, south = SOUTH): string {
  const asc = join(dir, `${name}.asc`);
  writeAsciiGrid(asc, south);
  const tif = join(dir, `${name}.tif`);
  execFileSync('gdal_translate', ['-q', '-of', 'GTiff', '-a_srs', srs, '-ot', 'Float32', asc, tif]);
  return tif;
}

/** The same people as density (per km²), latitude descending, written by ncgen. */
function densityNetcdf(): string {
  const lats = Array.from({ length: ROWS }, (_, i) => SOUTH + (i + 0.5) * STEP).reverse();
  const lons = Array.from({ length: COLS }, (_, j) => WEST + (j + 0.5) * STEP);
  const values = [...counts].reverse().flatMap((row, k) => {
    const i = ROWS - 1 - k;
    const km2 = KM2_PER_SR * (Math.sin((SOUTH + (i + 1) * STEP) * DEG) - Math.sin((SOUTH + i * STEP) * DEG)) * STEP * DEG;
    return row.map((v) => (v === null ? '_' : (v / km2).toPrecision(17)));
  });
  const cdl = `netcdf people {
dimensions: lat = ${ROWS} ; lon = ${COLS} ;
variables:
  double lat(lat) ; lat:units = "degrees_north" ; lat:standard_name = "latitude" ;
  double lon(lon) ; lon:units = "degrees_east" ; lon:standard_name = "longitude" ;
  double people(lat, lon) ; people:units = "km-2" ; people:_FillValue = -1.0 ;
data:
  lat = ${lats.map((v) => v.toFixed(3)).join(', ')} ;
  lon = ${lons.map((v) => v.toFixed(3)).join(', ')} ;
  people = ${values.join(', ')} ;
}
`;
  const path = join(dir, 'people.nc');
  execFileSync('ncgen', ['-o', path], { input: cdl });
  return path;
}

const nc = join(dir, 'tas.nc');
/** Level of the share-above check: between the districts' coolest and warmest cells on days 0–2 (about 21–23 °C). */
const SHARE_LEVEL = 22.3;
const features = JSON.parse(execFileSync('cat', [DISTRICTS]).toString()).features as { properties: { code: string }; geometry: object }[];
const regions = features.map((f) => ({ id: f.properties.code.toLowerCase(), geometry: f.geometry }));
// region_means_reference.py writes tas.nc (1° global grid, netCDF4-python); its area means are not needed here.
execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'region_means_reference.py'), nc], {
  input: JSON.stringify({ regions: [] }),
  cwd: import.meta.dirname,
});
const ref = JSON.parse(
  execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'population_reference.py')], {
    input: JSON.stringify({ nc, regions, raster: { south: SOUTH, west: WEST, step: STEP, counts }, share_above_c: SHARE_LEVEL }),
    cwd: import.meta.dirname,
    maxBuffer: 64 * 1024 * 1024,
  }).toString(),
) as { weights: Record<string, [number, number, number][]>; means: Record<string, number[]>; shares: Record<string, number[]> };

const forelight = (...args: string[]) =>
  spawnSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), ...args], { cwd: ROOT, encoding: 'utf8' });

async function districts(): Promise<RegionConfig[]> {
  const set = await loadBoundarySet({ boundaries: DISTRICTS, 'id-property': 'code' }, 0, ROOT, { utcOffsetHours: 0 });
  return set.regions.map((r) => ({ ...r, weighting: 'population' as const }));
}

describe('population weights vs shapely + numpy', () => {
  const tif = geoTiff('people', 'EPSG:4326');
  const people = densityNetcdf();

  it.each([
    ['GeoTIFF of counts (gdal_translate)', { file: tif, values: 'people-per-pixel' }],
    ['NetCDF of density per km² (ncgen)', { file: people, variable: 'people', values: 'people-per-km2' }],
  ] as [string, PopulationConfig][])('%s: people per cell within 1e-6 relative', async (_label, pop) => {
    const list = await districts();
    const grid = (await withDataset(nc, findCoordinates)).grid;
    const area = regionSetCells(grid, list, nc, null);
    const { cells, problems } = await populationSetCells(grid, area.selected, pop, join(dir, 'cache'));
    expect(problems).toEqual([]);
    for (const r of list) {
      const got = cells.get(r.id)!;
      const want = ref.weights[r.id];
      expect(got.weights.length, r.id).toBe(want.length);
      want.forEach(([y, x, w], k) => {
        expect([got.latIndex[k], got.lonIndex[k]], `${r.id} cell ${k}`).toEqual([y, x]);
        expect(Math.abs(got.weights[k] - w) / w, `${r.id} cell ${y},${x}`).toBeLessThan(1e-6);
      });
    }
  });

  it('forelight extract --population: every district, every day within 1e-4 relative of numpy', () => {
    const run = forelight('extract', nc, '--var', 'tas', '--regions', DISTRICTS, '--id-property', 'code', '--population', tif, '--json');
    expect(run.stderr).toBe('');
    const got = JSON.parse(run.stdout) as { regions: Record<string, { members: number[][] }>; problems: string[] };
    expect(got.problems).toEqual([]);
    expect(Object.keys(got.regions).sort()).toEqual(Object.keys(ref.means).sort());
    for (const [id, want] of Object.entries(ref.means))
      want.forEach((v, t) => expect(Math.abs(got.regions[id].members[0][t] - v) / Math.abs(v), `${id} day ${t}`).toBeLessThan(1e-4));
    const area = JSON.parse(forelight('extract', nc, '--var', 'tas', '--regions', DISTRICTS, '--id-property', 'code', '--json').stdout);
    // The people sit unevenly, so the weighting shows in the value (not a copy of the area mean).
    expect(Math.abs(area.regions['mh-01'].members[0][0] - got.regions['mh-01'].members[0][0])).toBeGreaterThan(1e-3);
  });

  it('region-value { weights: population, share-above }: % of the people above the level within 1e-4 points of numpy', async () => {
    const list = (await districts()).map(({ weighting: _, ...r }) => r);
    const ind: IndicatorConfig = {
      id: 'tmax-day',
      name: 'daily maximum temperature',
      kind: 'tmax-mean',
      windowDays: 1, // each cell's own daily value
      threshold: { kind: 'absolute', value: 50, units: '%' },
      regionThresholds: {},
      trendClimate: false,
      aggregate: 'mean',
      tiers: ['days'],
      params: {},
      regionValue: { weights: 'population', shareAbove: SHARE_LEVEL },
    };
    const population: PopulationConfig = { file: tif, values: 'people-per-pixel' };
    const series = (await readFile(
      extractRegionSeries,
      nc,
      { tmax: 'tas' },
      readRegions({ regions: list, indicators: [ind] }),
      { population },
      [],
    ))!;
    const partial: string[] = [];
    for (const r of list) {
      const got = regionIndicator(ind, series.get(regionViewId(r.id, ind))!, r.id, {}).data;
      ref.shares[r.id].forEach((want, t) => {
        expect(Math.abs(got[t] - want), `${r.id} day ${t}`).toBeLessThan(1e-4);
        if (want > 0 && want < 100) partial.push(r.id);
      });
    }
    expect(partial.length).toBeGreaterThanOrEqual(3);
  });

  it('a gdalinfo whose -json answer has another shape than GDAL documents is refused naming the raster, never read as "no CRS"', () => {
    // A stand-in gdalinfo ahead of Debian's on PATH, answering valid JSON of the wrong shape (the WKT as a number).
    const bin = join(dir, 'odd-gdal');
    mkdirSync(bin);
    writeFileSync(join(bin, 'gdalinfo'), '#!/bin/sh\necho \'{"coordinateSystem": {"wkt": 4326}}\'\n', { mode: 0o755 });
    const run = spawnSync(
      process.execPath,
      [
        join(ROOT, 'bin/forelight.mjs'),
        'extract',
        nc,
        '--var',
        'tas',
        '--regions',
        DISTRICTS,
        '--id-property',
        'code',
        '--population',
        tif,
        '--json',
      ],
      { cwd: ROOT, encoding: 'utf8', env: { ...process.env, PATH: `${bin}:${process.env.PATH}` } },
    );
    const got = JSON.parse(run.stdout) as { regions: object; problems: string[] };
    expect(got.regions).toEqual({});
    expect(got.problems).toEqual([
      expect.stringMatching(
        /gdalinfo -json gave no usable description of the population raster \(\/coordinateSystem\/wkt must be string\)/,
      ),
    ]);
  });

  it('a projected GeoTIFF is refused naming the file and its CRS, with a gdalwarp line that works pasted from anywhere', () => {
    // Really projected (warped to UTM 31S by GDAL), in a folder whose name needs quoting in a shell.
    const folder = join(dir, "census office's rasters");
    mkdirSync(folder);
    const utm = join(folder, 'people-utm.tif');
    execFileSync('gdalwarp', ['-q', '-t_srs', 'EPSG:32731', tif, utm]);
    const run = forelight('extract', nc, '--var', 'tas', '--regions', DISTRICTS, '--id-property', 'code', '--population', utm, '--json');
    const got = JSON.parse(run.stdout) as { regions: object; problems: string[] };
    expect(got.regions).toEqual({});
    expect(got.problems).toEqual([expect.stringMatching(/CRS 'WGS 84 \/ UTM zone 31S', not WGS 84 longitude\/latitude/)]);
    const command = /reproject it once: (gdalwarp .+), and name (.+) in population\.file/.exec(got.problems[0]);
    expect(command?.[2]).toBe(join(folder, 'people-utm-wgs84.tif'));
    execFileSync('sh', ['-c', command![1]], { cwd: '/' });
    const again = forelight(
      'extract',
      nc,
      '--var',
      'tas',
      '--regions',
      DISTRICTS,
      '--id-property',
      'code',
      '--population',
      command![2],
      '--json',
    );
    const fixed = JSON.parse(again.stdout) as { regions: Record<string, unknown>; problems: string[] };
    expect(fixed.problems).toEqual([]);
    expect(Object.keys(fixed.regions).sort()).toEqual(Object.keys(ref.means).sort());
  });

  it('a raster not covering a district names that district; the others are weighted', async () => {
    const part = geoTiff('people-north', 'EPSG:4326', -13.1); // south edge 13.1° S: Tulva Delta (to 13.5° S) falls out
    const list = await districts();
    const grid = (await withDataset(nc, findCoordinates)).grid;
    const area = regionSetCells(grid, list, nc, null);
    const { cells, problems } = await populationSetCells(grid, area.selected, { file: part, values: 'people-per-pixel' }, null);
    expect(problems.map((p) => p.message)).toEqual([
      expect.stringMatching(/raster \(lat -13\.1\.\.-1\.85, lon -7\.1\.\.5\.15\) does not cover region 'td-01'/),
    ]);
    expect(problems[0].diagnostic.code).toBe('population-coverage');
    expect(cells.has('ks-01')).toBe(true);
  });
});
