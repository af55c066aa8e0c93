/**
 * The gridded population raster a desk supplies (YAML `population:`), read once per run as people per steradian
 * on its own pixels. NetCDF is read directly by Forelight's readers; a GeoTIFF is first converted once with GDAL
 * (`gdal_translate -of netCDF`, Debian gdal-bin) into `<cache>/population/<sha256 of the GeoTIFF>.nc` and read
 * from there, after `gdalinfo -json` showed its CRS is WGS 84 longitude/latitude. Missing and negative pixels
 * count as nobody (population rasters mark water and uninhabited land as no-data). Only the rows and columns
 * around the regions asked for are read.
 */
import { existsSync } from 'node:fs';
import type { RasterExtent } from '../config/check-population.ts';
import type { PopulationConfig } from '../config/types.ts';
import { InputError } from '../core/errors.ts';
import { decodeCf } from './cf-decode.ts';
import { findCoordinates, type LatLonGrid } from './coordinates.ts';
import type { Dataset, VariableInfo } from './dataset.ts';
import { geoTiffAsNetcdf, isGeoTiff, missingRaster, reprojectFix } from './geotiff-netcdf.ts';
import { withDataset } from './open-dataset.ts';
import { cellBounds } from './regions.ts';

const DEG = Math.PI / 180;
/** Mean Earth radius R1 = 6371.0088 km (Moritz 2000, Geodetic Reference System 1980): km² per steradian = R1². */
const KM2_PER_SR = 6371.0088 ** 2;

/** People per steradian on the raster's pixels; rows ascending in latitude, columns ascending in longitude. */
export interface PopulationGrid {
  readonly file: string;
  /** Pixel edges, degrees: rows+1 ascending latitudes, cols+1 ascending longitudes (one continuous frame). */
  readonly latEdges: Float64Array;
  readonly lonEdges: Float64Array;
  /** [row][col] people per steradian (0 where the raster has no data). */
  readonly density: Float64Array;
  /** The whole raster's extent (pixel edges), for messages and the coverage check. */
  readonly extent: RasterExtent;
}

export type { RasterExtent };

/** The people variable: the one named, or the only variable on the latitude × longitude grid. */
function peopleVariable(ds: Dataset, grid: LatLonGrid, file: string, name: string | undefined): VariableInfo {
  const gridded = ds.variables.filter((v) => v.dimensions.includes(grid.latName) && v.dimensions.includes(grid.lonName));
  const info = name ? ds.variable(name) : gridded.length === 1 ? gridded[0] : undefined;
  if (
    !info ||
    !gridded.includes(info) ||
    info.shape.some((n, k) => n !== 1 && ![grid.latName, grid.lonName].includes(info.dimensions[k]))
  ) {
    throw new InputError(
      'population-raster',
      file,
      name
        ? `population variable '${name}' is not a single latitude × longitude field`
        : `population raster has ${gridded.length} gridded variables`,
      `name the people variable in population.variable (one of: ${gridded.map((v) => v.name).join(', ') || 'none'})`,
    );
  }
  const mapping = info.attributes.grid_mapping;
  const mapped = typeof mapping === 'string' ? ds.variable(mapping)?.attributes.grid_mapping_name : undefined;
  if (mapped !== undefined && mapped !== 'latitude_longitude') {
    throw new InputError(
      'population-crs',
      file,
      `population variable '${info.name}' is on grid mapping '${String(mapped)}', not WGS 84 longitude/latitude`,
      reprojectFix(file, `NETCDF:${file}:${info.name}`),
    );
  }
  return info;
}

async function openRaster<T>(
  pop: PopulationConfig,
  cacheDir: string | null,
  use: (ds: Dataset, grid: LatLonGrid) => Promise<T>,
): Promise<T> {
  const path = isGeoTiff(pop.file) ? await geoTiffAsNetcdf(pop.file, cacheDir) : pop.file;
  if (!existsSync(path)) throw missingRaster(pop.file);
  return withDataset(path, async (ds) => {
    let grid: LatLonGrid;
    try {
      grid = (await findCoordinates(ds)).grid;
    } catch (err) {
      throw new InputError(
        'population-crs',
        pop.file,
        `population raster has no latitude/longitude coordinates (${err instanceof Error ? err.message : String(err)}), so it is not WGS 84 longitude/latitude`,
        reprojectFix(pop.file),
        { cause: err },
      );
    }
    return use(ds, grid);
  });
}

/** Sorted edges of one axis and the index order of its pixels (ascending). */
function axisEdges(bounds: Float64Array): { edges: Float64Array; order: Int32Array } {
  const n = bounds.length / 2;
  const order = Int32Array.from({ length: n }, (_, i) => i).sort(
    (a, b) => bounds[2 * a] + bounds[2 * a + 1] - bounds[2 * b] - bounds[2 * b + 1],
  );
  const edges = new Float64Array(n + 1);
  order.forEach((i, k) => {
    edges[k] = Math.min(bounds[2 * i], bounds[2 * i + 1]);
    edges[k + 1] = Math.max(bounds[2 * i], bounds[2 * i + 1]);
  });
  return { edges, order };
}

const round6 = (v: number) => Number(v.toFixed(6));

function extentOf(lat: Float64Array, lon: Float64Array): RasterExtent {
  return {
    south: round6(Math.max(-90, lat[0])),
    north: round6(Math.min(90, lat[lat.length - 1])),
    west: round6(lon[0]),
    east: round6(lon[lon.length - 1]),
  };
}

/** The raster's extent (pixel edges), from its coordinates only. */
export function populationExtent(pop: PopulationConfig, cacheDir: string | null): Promise<RasterExtent> {
  return openRaster(pop, cacheDir, async (ds, grid) => {
    peopleVariable(ds, grid, pop.file, pop.variable);
    const b = cellBounds(grid);
    return extentOf(axisEdges(b.lat).edges, axisEdges(b.lon).edges);
  });
}

/** The people of the raster within `window` (degrees; longitudes in any frame), as density per steradian. */
export function readPopulation(pop: PopulationConfig, cacheDir: string | null, window: RasterExtent): Promise<PopulationGrid> {
  return openRaster(pop, cacheDir, async (ds, grid) => {
    const info = peopleVariable(ds, grid, pop.file, pop.variable);
    const b = cellBounds(grid);
    const lat = axisEdges(b.lat);
    const lon = axisEdges(b.lon);
    const rows = [...lat.order.keys()].filter((k) => lat.edges[k + 1] > window.south && lat.edges[k] < window.north);
    const span = lon.edges[lon.edges.length - 1] - lon.edges[0];
    const inWindow = (k: number) =>
      span >= 360 - 1e-9 || window.east - window.west >= 360
        ? true
        : [-360, 0, 360].some((s) => lon.edges[k + 1] + s > window.west && lon.edges[k] + s < window.east);
    const cols = [...lon.order.keys()].filter(inWindow);
    const [r0, r1] = [rows[0] ?? 0, (rows.at(-1) ?? -1) + 1];
    const [c0, c1] = [cols[0] ?? 0, (cols.at(-1) ?? -1) + 1];
    const density = new Float64Array(Math.max(0, r1 - r0) * Math.max(0, c1 - c0));
    const latAxis = info.dimensions.indexOf(grid.latName);
    const lonAxis = info.dimensions.indexOf(grid.lonName);
    // Stored rows and columns may run either way: read the index range that holds the sorted range.
    const sr = lat.order.subarray(r0, r1);
    const sc = lon.order.subarray(c0, c1);
    if (density.length > 0) {
      const [lo, hi] = [Math.min(...sr), Math.max(...sr)];
      const [clo, chi] = [Math.min(...sc), Math.max(...sc)];
      const start = info.shape.map((_, k) => (k === latAxis ? lo : k === lonAxis ? clo : 0));
      const count = info.shape.map((_, k) => (k === latAxis ? hi - lo + 1 : k === lonAxis ? chi - clo + 1 : 1));
      const { values } = decodeCf(info, await ds.readRaw(info.name, start, count));
      const width = chi - clo + 1;
      const latFirst = latAxis < lonAxis;
      const height = hi - lo + 1;
      sr.forEach((y, i) => {
        const sinSpan = Math.abs(Math.sin(lat.edges[r0 + i + 1] * DEG) - Math.sin(lat.edges[r0 + i] * DEG));
        sc.forEach((x, j) => {
          const v = values[latFirst ? (y - lo) * width + (x - clo) : (x - clo) * height + (y - lo)];
          const pixelSr = sinSpan * (lon.edges[c0 + j + 1] - lon.edges[c0 + j]) * DEG;
          const people = v === v && v > 0 ? v : 0;
          density[i * sc.length + j] = pop.values === 'people-per-km2' ? people * KM2_PER_SR : pixelSr > 0 ? people / pixelSr : 0;
        });
      });
    }
    return {
      file: pop.file,
      latEdges: lat.edges.slice(r0, r1 + 1),
      lonEdges: lon.edges.slice(c0, c1 + 1),
      density,
      extent: extentOf(lat.edges, lon.edges),
    };
  });
}
