/**
 * Shapefiles: read by Forelight (npm `shapefile`) against GDAL 3.6 (Debian gdal-bin) on the same files —
 * `ogr2ogr` writes them from the sample district GeoJSON and converts them back, `ogrinfo` names their CRS.
 * A projected or missing .prj is refused with the ogr2ogr command that fixes it; the test pastes that command into
 * sh from another directory, with a folder name that needs quoting, and reads the result.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { featurePolygons } from '../../src/config/boundaries/feature-geometry.ts';
import { readBoundaryFeatures, type RawFeature } from '../../src/config/boundaries/read-features.ts';

const DISTRICTS = join(import.meta.dirname, '../../config/veloria-districts.geojson');
const dir = mkdtempSync(join(tmpdir(), 'forelight-shp-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const run = (cmd: string, args: string[]) => execFileSync(cmd, args, { cwd: dir }).toString();

/** Every ring of a feature as a sorted list of its distinct vertices (ring start and winding differ between writers). */
function ringSets(f: { geometry: RawFeature['geometry'] }): string[] {
  const g = featurePolygons(f.geometry);
  if ('problem' in g) throw new Error(g.problem);
  return g.polygons
    .flat()
    .map((ring) =>
      ring
        .slice(1)
        .map(([x, y]) => `${x.toFixed(9)},${y.toFixed(9)}`)
        .sort()
        .join(' '),
    )
    .sort();
}

async function features(file: string): Promise<RawFeature[]> {
  const r = await readBoundaryFeatures(file);
  if (!r.ok) throw new Error(r.message);
  return r.features;
}

describe('shapefile boundaries vs GDAL', () => {
  it('same features, properties and rings as ogr2ogr converting the same .shp back to GeoJSON', async () => {
    run('ogr2ogr', ['-f', 'ESRI Shapefile', 'districts.shp', DISTRICTS]);
    const mine = await features(join(dir, 'districts.shp'));
    const gdal = JSON.parse(run('ogr2ogr', ['-f', 'GeoJSON', '/vsistdout/', 'districts.shp'])) as {
      features: { properties: Record<string, unknown>; geometry: RawFeature['geometry'] }[];
    };
    expect(mine.length).toBe(gdal.features.length);
    expect(mine.length).toBe(7);
    mine.forEach((f, i) => {
      expect(f.properties).toEqual(gdal.features[i].properties);
      expect(ringSets(f)).toEqual(ringSets(gdal.features[i]));
    });
    expect(run('ogrinfo', ['-so', '-al', 'districts.shp'])).toMatch(/Feature Count: 7/);
  });

  it('a projected shapefile is refused naming the file, the CRS ogrinfo reports, and the ogr2ogr fix — which works from any directory', async () => {
    // A ministry folder whose name needs quoting in a shell; the operator pastes the command elsewhere (sh -c, cwd /).
    const folder = join(dir, "ministry's files");
    mkdirSync(folder);
    run('ogr2ogr', ['-f', 'ESRI Shapefile', '-t_srs', 'EPSG:32631', join(folder, 'utm.shp'), DISTRICTS]);
    const shp = join(folder, 'utm.shp');
    const r = await readBoundaryFeatures(shp);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    // GDAL reads the .prj as the projected CRS EPSG:32631; the message quotes the name written in the .prj (ESRI form).
    expect(/PROJCRS\["([^"]+)"/.exec(execFileSync('ogrinfo', ['-so', '-al', shp]).toString())?.[1]).toBe('WGS 84 / UTM zone 31N');
    const crsName = /^PROJCS\["([^"]+)"/.exec(readFileSync(join(folder, 'utm.prj'), 'utf8'))?.[1];
    expect(crsName).toBe('WGS_1984_UTM_Zone_31N');
    expect(r.message).toBe(`shapefile ${shp} is in '${crsName}' (from utm.prj), not WGS 84 longitude/latitude`);
    const command = /reproject it: (ogr2ogr .+) and point the region set at utm-wgs84\.shp \(written beside utm\.shp\)$/.exec(r.fix)?.[1];
    expect(command).toMatch(/^ogr2ogr -t_srs EPSG:4326 /);
    execFileSync('sh', ['-c', command!], { cwd: '/' });
    const back = await features(join(folder, 'utm-wgs84.shp'));
    const original = (
      JSON.parse(execFileSync('ogr2ogr', ['-f', 'GeoJSON', '/vsistdout/', DISTRICTS]).toString()) as {
        features: { geometry: RawFeature['geometry'] }[];
      }
    ).features;
    back.forEach((f, i) => {
      const a = featurePolygons(f.geometry);
      const b = featurePolygons(original[i].geometry);
      if ('problem' in a || 'problem' in b) throw new Error('invalid');
      // UTM round trip through PROJ: within 1e-6° (0.1 m), common practice, no source.
      const flat = (p: typeof a.polygons) =>
        p
          .flat(2)
          .flat()
          .sort((x, y) => x - y);
      const [fa, fb] = [flat(a.polygons), flat(b.polygons)];
      expect(fa.length).toBe(fb.length);
      fa.forEach((v, k) => expect(Math.abs(v - fb[k])).toBeLessThan(1e-6));
    });
  });

  it('no .prj: refused, with ogr2ogr -a_srs to declare WGS 84 when that is what the coordinates are — which works', async () => {
    run('ogr2ogr', ['-f', 'ESRI Shapefile', 'noprj.shp', DISTRICTS]);
    rmSync(join(dir, 'noprj.prj'));
    const r = await readBoundaryFeatures(join(dir, 'noprj.shp'));
    const text = r.ok ? '' : `${r.message} — ${r.fix}`;
    expect(text).toMatch(
      /has no noprj\.prj, so its coordinate reference system is unknown — if it is longitude\/latitude on WGS 84, declare it: /,
    );
    const command = /declare it: (ogr2ogr -a_srs EPSG:4326 \S+ \S+);/.exec(text)?.[1];
    expect(command).toBe(`ogr2ogr -a_srs EPSG:4326 ${join(dir, 'noprj-wgs84.shp')} ${join(dir, 'noprj.shp')}`);
    execFileSync('sh', ['-c', command!], { cwd: '/' });
    expect((await features(join(dir, 'noprj-wgs84.shp'))).length).toBe(7);
  });
});
