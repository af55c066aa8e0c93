/**
 * `forelight check` on the population raster: every problem one line file:line:column naming what to do. Rasters
 * are GeoTIFFs written by GDAL (gdal_translate from an ESRI ASCII grid, with -a_srs): a projected one (UTM zone
 * 31N), one that does not cover every region, a missing file, and weights: population without any raster.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { cpSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '../..');
const dir = mkdtempSync(join(tmpdir(), 'forelight-population-check-'));

function raster(name: string, srs: string, south: number): string {
  const asc = join(dir, `${name}.asc`);
  const rows = Array.from({ length: 40 }, () => Array.from({ length: 40 }, () => 100).join(' '));
  writeFileSync(asc, ['ncols 40', 'nrows 40', 'xllcorner -6', `yllcorner ${south}`, 'cellsize 0.25', ...rows].join('\n') + '\n');
  execFileSync('gdal_translate', ['-q', '-of', 'GTiff', '-a_srs', srs, asc, join(dir, `${name}.tif`)]);
  return join(dir, `${name}.tif`);
}

/** The shipped configuration in a fresh folder, tmax-3day weighted by population, with `population` as given. */
function configWith(population: string | null): { file: string; text: string } {
  const folder = mkdtempSync(join(dir, 'config-'));
  cpSync(join(ROOT, 'config'), folder, { recursive: true });
  const file = join(folder, 'forelight.yaml');
  let text = readFileSync(file, 'utf8').replace(
    '    kind: tmax-mean\n',
    '    kind: tmax-mean\n    region-value: { weights: population }\n',
  );
  if (population !== null) text += `\npopulation:\n  file: ${population}\n  values: people-per-pixel\n`;
  writeFileSync(file, text);
  return { file, text };
}

const check = (file: string) =>
  spawnSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), 'check', '--config', file], { cwd: ROOT, encoding: 'utf8' });
const lineOf = (text: string, needle: string) => text.split('\n').findIndex((l) => l.includes(needle)) + 1;

describe('forelight check: the population raster', () => {
  it('a projected raster: one line at population.file naming the CRS and the gdalwarp command', () => {
    const { file, text } = configWith(raster('utm', 'EPSG:32631', -16));
    const run = check(file);
    expect(run.status).toBe(2);
    const line = lineOf(text, 'utm.tif');
    expect(run.stderr).toMatch(
      new RegExp(
        `forelight\\.yaml:${line}:\\d+: .*utm\\.tif: population raster is in CRS 'WGS 84 / UTM zone 31N', not WGS 84 longitude/latitude — reproject it once: gdalwarp -t_srs EPSG:4326`,
      ),
    );
  });

  it('a raster not covering a region: one line at that region in regions.yaml', () => {
    const { file } = configWith(raster('north', 'EPSG:4326', -10)); // lat -10..0: the southern regions fall out
    const run = check(file);
    expect(run.status).toBe(2);
    const regions = readFileSync(join(file, '../regions.yaml'), 'utf8');
    expect(run.stderr).toMatch(
      new RegExp(`regions\\.yaml:${lineOf(regions, '- id: tulva-delta')}:\\d+: region tulva-delta is not inside the population raster`),
    );
    expect(run.stderr).not.toMatch(/region marrow-highlands is not inside/);
  });

  it('a missing raster: one line at population.file', () => {
    const { file, text } = configWith('nowhere.tif');
    const run = check(file);
    expect(run.stderr).toMatch(
      new RegExp(`forelight\\.yaml:${lineOf(text, 'nowhere.tif')}:\\d+: .*nowhere\\.tif: population raster not found`),
    );
  });

  it('weights: population without a raster: one line at region-value.weights', () => {
    const { file, text } = configWith(null);
    const run = check(file);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(
      new RegExp(
        `forelight\\.yaml:${lineOf(text, 'region-value: { weights: population }')}:\\d+: indicator tmax-3day weights its regions by population, but no population raster is configured`,
      ),
    );
  });
});
