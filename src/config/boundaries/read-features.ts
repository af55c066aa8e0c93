/**
 * Reads a boundary file into raw features (geometry as written, properties): GeoJSON FeatureCollection
 * (RFC 7946) or ESRI shapefile (.shp + .dbf, with the .prj checked by prj.ts). Chosen by file extension.
 * Problems are one line each naming the file (and feature) and what to do.
 */
import { readFile } from 'node:fs/promises';
import { basename, extname } from 'node:path';
import { open } from 'shapefile';
import { isRecord } from '../../core/json-shape.ts';
import { prjProblem } from './prj.ts';
import { errorMessage } from '../../core/errors.ts';

export interface RawFeature {
  /** 0-based position in the file. */
  readonly index: number;
  /** GeoJSON Feature `id`, when given. */
  readonly featureId?: string | number;
  readonly properties: Readonly<Record<string, unknown>>;
  readonly geometry: { readonly type: string; readonly coordinates?: unknown } | null;
}

export type FeatureRead =
  { readonly ok: true; readonly features: RawFeature[] } | { readonly ok: false; readonly message: string; readonly fix: string };

const fail = (message: string, fix: string): FeatureRead => ({ ok: false, message, fix });

/** A GeoJSON Feature (RFC 7946 §3.2) as read: a member of another type than the RFC's counts as absent. */
function rawFeature(f: unknown, index: number): RawFeature {
  const { id, properties, geometry } = isRecord(f) ? f : {};
  return {
    index,
    ...(typeof id === 'string' || typeof id === 'number' ? { featureId: id } : {}),
    properties: isRecord(properties) ? properties : {},
    geometry: isRecord(geometry) && typeof geometry.type === 'string' ? { type: geometry.type, coordinates: geometry.coordinates } : null,
  };
}

async function readGeoJson(file: string): Promise<FeatureRead> {
  let doc: unknown;
  try {
    doc = JSON.parse(await readFile(file, 'utf8'));
  } catch (err) {
    const why = err instanceof SyntaxError ? `is not valid JSON (${err.message})` : `cannot be read (${errorMessage(err)})`;
    return fail(`boundary file ${file} ${why}`, 'export the boundaries again as GeoJSON (e.g. ogr2ogr -f GeoJSON out.geojson in.shp)');
  }
  if (!isRecord(doc) || doc.type !== 'FeatureCollection' || !Array.isArray(doc.features)) {
    return fail(
      `boundary file ${file} is not a GeoJSON FeatureCollection (type ${JSON.stringify(isRecord(doc) ? doc.type : undefined)})`,
      'give a FeatureCollection with one Feature per region',
    );
  }
  return { ok: true, features: doc.features.map(rawFeature) };
}

async function readShapefile(file: string): Promise<FeatureRead> {
  const stem = file.slice(0, -extname(file).length);
  const prj = await readFile(`${stem}.prj`, 'utf8').catch(() => null);
  const crs = prjProblem(file, prj);
  if (crs) return fail(crs.message, crs.fix);
  try {
    const source = await open(file, `${stem}.dbf`, { encoding: 'utf-8' });
    const features: RawFeature[] = [];
    for (let r = await source.read(); !r.done; r = await source.read()) {
      features.push({ index: features.length, properties: r.value.properties ?? {}, geometry: r.value.geometry });
    }
    return { ok: true, features };
  } catch (err) {
    return fail(
      `shapefile ${file} (with ${basename(stem)}.dbf) cannot be read (${errorMessage(err)})`,
      'keep the .shp, .shx, .dbf and .prj files together, or export GeoJSON instead',
    );
  }
}

/** Reads `file` (.geojson/.json or .shp). */
export function readBoundaryFeatures(file: string): Promise<FeatureRead> {
  const ext = extname(file).toLowerCase();
  if (ext === '.shp') return readShapefile(file);
  if (ext === '.geojson' || ext === '.json') return readGeoJson(file);
  return Promise.resolve(
    fail(
      `boundary file ${file} has extension '${ext}'; Forelight reads .geojson/.json and .shp`,
      'convert it, e.g. ogr2ogr -f GeoJSON -t_srs EPSG:4326 districts.geojson <your file>',
    ),
  );
}
