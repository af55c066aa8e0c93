/**
 * A GeoTIFF population raster made readable: its CRS checked with `gdalinfo -json` (geographic WGS 84 only), then
 * converted once with `gdal_translate -of netCDF` (Debian gdal-bin) into a NetCDF copy named by its sha256.
 */
import { execFile } from 'node:child_process';
import { existsSync, mkdirSync, renameSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { errnoCode, errorMessage, InputError, stderrOf } from '../core/errors.ts';
import { sha256File } from '../core/file-checksums.ts';
import { jsonShape, parseShaped } from '../core/json-shape.ts';
import { shellWord, wgs84Copy } from '../core/shell-command.ts';

const run = promisify(execFile);

export const isGeoTiff = (path: string) => /\.tiff?$/i.test(path);

async function gdal(tool: string, args: string[], file: string): Promise<string> {
  try {
    return (await run(tool, args, { maxBuffer: 64 * 1024 * 1024 })).stdout;
  } catch (err) {
    const why =
      errnoCode(err) === 'ENOENT' ? `GDAL's ${tool} is not installed` : (stderrOf(err) || errorMessage(err)).trim().split('\n')[0];
    throw new InputError(
      'population-raster',
      file,
      `population raster cannot be read as GeoTIFF (${why})`,
      'install the Debian package gdal-bin, or convert the raster to NetCDF (gdal_translate -of netCDF)',
      { cause: err },
    );
  }
}

/** The fix for a raster not on WGS 84 longitude/latitude: a gdalwarp line writing a GeoTIFF beside it (`source`: GDAL's name of the data). */
export function reprojectFix(file: string, source = file): string {
  const out = wgs84Copy(file, '.tif');
  return `reproject it once: gdalwarp -t_srs EPSG:4326 ${shellWord(source)} ${shellWord(out)}, and name ${out} in population.file`;
}

/** The part of `gdalinfo -json` read here (GDAL's gdalinfo output schema: `coordinateSystem.wkt`). */
const isGdalInfo = jsonShape<{ coordinateSystem?: { wkt?: string } }>({
  type: 'object',
  properties: { coordinateSystem: { type: 'object', properties: { wkt: { type: 'string' } } } },
});

/** The CRS of a GeoTIFF from `gdalinfo -json`, refused unless geographic WGS 84. */
async function checkGeoTiffCrs(file: string): Promise<void> {
  const info = parseShaped(await gdal('gdalinfo', ['-json', file], file), isGdalInfo);
  if (!info.ok) {
    throw new InputError(
      'population-raster',
      file,
      `gdalinfo -json gave no usable description of the population raster (${info.why})`,
      'check the GDAL installation (gdalinfo --version), or convert the raster to NetCDF (gdal_translate -of netCDF)',
    );
  }
  const wkt = info.value.coordinateSystem?.wkt ?? '';
  const name = /^\w+\["([^"]*)"/.exec(wkt)?.[1] ?? 'none';
  const geographic = /^GEOG(CRS|CS)\[/.test(wkt);
  const wgs84 = /ID\["EPSG",4326\]\s*\]$/.test(wkt) || /DATUM\["World Geodetic System 1984"/.test(wkt) || /DATUM\["WGS_1984"/.test(wkt);
  if (geographic && wgs84) return;
  throw new InputError('population-crs', file, `population raster is in CRS '${name}', not WGS 84 longitude/latitude`, reprojectFix(file));
}

/** The NetCDF copy of a GeoTIFF: `<cacheDir>/population/<sha256>.nc`, or in the system temp folder without a cache dir. */
export async function geoTiffAsNetcdf(file: string, cacheDir: string | null): Promise<string> {
  if (!existsSync(file)) throw missingRaster(file);
  await checkGeoTiffCrs(file);
  const dir = join(cacheDir ?? join(tmpdir(), 'forelight-cache'), 'population');
  const target = join(dir, `${await sha256File(file)}.nc`);
  if (existsSync(target)) return target;
  mkdirSync(dir, { recursive: true });
  const work = `${target}.tmp-${process.pid}`;
  rmSync(work, { force: true });
  await gdal('gdal_translate', ['-q', '-of', 'netCDF', file, work], file);
  renameSync(work, target);
  return target;
}

export function missingRaster(file: string): InputError {
  return new InputError(
    'population-raster',
    file,
    'population raster not found',
    'check population.file in the YAML (relative to the YAML file)',
  );
}
