/**
 * The coordinate reference system of a shapefile, from its .prj (OGC WKT 1, ESRI flavour, or WKT 2
 * ISO 19162:2019). Forelight reads longitude/latitude on WGS 84 only; anything else is refused with the
 * ogr2ogr command that reprojects it (GDAL's `-t_srs EPSG:4326`).
 */
import { basename, extname } from 'node:path';
import { shellWord, wgs84Copy } from '../../core/shell-command.ts';

/** Name of the top-level CRS and its kind keyword (GEOGCS, PROJCS, GEOGCRS, PROJCRS, …). */
function topCrs(wkt: string): { keyword: string; name: string } | null {
  const m = /^\s*([A-Z_0-9]+)\s*\[\s*"([^"]*)"/i.exec(wkt);
  return m ? { keyword: m[1].toUpperCase(), name: m[2] } : null;
}

const GEOGRAPHIC = ['GEOGCS', 'GEOGCRS', 'GEODCRS', 'GEOGRAPHICCRS'];

/** True for WGS 84 geographic (any realisation name: WGS_1984, WGS 84, D_WGS_1984; Greenwich; degrees). */
function isWgs84Geographic(wkt: string): boolean {
  const top = topCrs(wkt);
  if (!top || !GEOGRAPHIC.includes(top.keyword)) return false;
  const datum = /DATUM\s*\[\s*"([^"]*)"/i.exec(wkt)?.[1] ?? '';
  const primem = /PRIMEM\s*\[\s*"[^"]*"\s*,\s*([-0-9.eE]+)/i.exec(wkt)?.[1];
  const unit = /(?:ANGLEUNIT|UNIT)\s*\[\s*"([^"]*)"/i.exec(wkt)?.[1] ?? '';
  return /WGS[ _]?(19)?84/i.test(datum) && (primem === undefined || Number(primem) === 0) && /degree/i.test(unit);
}

/** Null when the .prj says WGS 84 longitude/latitude; otherwise what is wrong and the command that fixes it. */
export function prjProblem(shp: string, prjText: string | null): { message: string; fix: string } | null {
  const stem = basename(shp, extname(shp));
  // Full paths both ways: the command works from any directory and writes beside the original.
  const out = basename(wgs84Copy(shp));
  const [from, to] = [shellWord(shp), shellWord(wgs84Copy(shp))];
  if (prjText === null) {
    return {
      message: `shapefile ${shp} has no ${stem}.prj, so its coordinate reference system is unknown`,
      fix: `if it is longitude/latitude on WGS 84, declare it: ogr2ogr -a_srs EPSG:4326 ${to} ${from}; otherwise reproject: ogr2ogr -s_srs <its CRS> -t_srs EPSG:4326 ${to} ${from}; then point the region set at ${out}`,
    };
  }
  if (isWgs84Geographic(prjText)) return null;
  const found = topCrs(prjText)?.name ?? prjText.trim().slice(0, 60);
  return {
    message: `shapefile ${shp} is in '${found}' (from ${stem}.prj), not WGS 84 longitude/latitude`,
    fix: `reproject it: ogr2ogr -t_srs EPSG:4326 ${to} ${from} and point the region set at ${out} (written beside ${basename(shp)})`,
  };
}
