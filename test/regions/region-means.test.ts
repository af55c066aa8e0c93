/**
 * Region means end to end (`forelight extract FILE --var tas --regions B.geojson --json`) against numpy means
 * with shapely cell weights, within 1e-4 relative, on a file written by netCDF4-python: the sample districts
 * (a hole, an enclave, an island, a district smaller than a cell) and Natural Earth countries across 180°.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { regionIdOf } from '../../src/config/boundaries/boundary-sets.ts';
import { naturalEarthCountries } from './natural-earth.ts';

const ROOT = join(import.meta.dirname, '../..');
const DISTRICTS = join(ROOT, 'config/veloria-districts.geojson');
const dir = mkdtempSync(join(tmpdir(), 'forelight-means-'));
const forelight = (...args: string[]) =>
  JSON.parse(execFileSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), ...args], { cwd: ROOT }).toString());

describe('forelight extract --regions vs numpy + shapely', () => {
  const countries = {
    type: 'FeatureCollection',
    features: naturalEarthCountries().features.filter((f) =>
      ['Fiji', 'New Zealand', 'Lesotho', 'South Africa'].includes(f.properties.name),
    ),
  };
  const countriesFile = join(dir, 'countries.geojson');
  writeFileSync(countriesFile, JSON.stringify(countries));
  const nc = join(dir, 'tas.nc');
  const regions = [
    ...(JSON.parse(execFileSync('cat', [DISTRICTS]).toString()).features as { properties: { code: string }; geometry: object }[]).map(
      (f) => ({ id: regionIdOf(f.properties.code), geometry: f.geometry }),
    ),
    ...countries.features.map((f) => ({ id: regionIdOf(f.properties.name), geometry: f.geometry })),
  ];
  const ref = JSON.parse(
    execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'region_means_reference.py'), nc], {
      input: JSON.stringify({ regions }),
      cwd: import.meta.dirname,
    }).toString(),
  ) as Record<string, number[]>;

  it.each([
    ['sample districts', DISTRICTS, 'code'],
    ['Natural Earth countries', countriesFile, 'name'],
  ])('%s: every region, every day within 1e-4 relative', (_label, file, idProperty) => {
    const got = forelight('extract', nc, '--var', 'tas', '--regions', file, '--id-property', idProperty, '--json') as {
      units: string;
      times: string[];
      regions: Record<string, { members: number[][]; cells: number }>;
      problems: string[];
    };
    expect(got.units).toBe('degC');
    expect(got.problems).toEqual([]);
    expect(got.times).toHaveLength(3);
    for (const [id, series] of Object.entries(got.regions)) {
      ref[id].forEach((v, t) => expect(Math.abs(series.members[0][t] - v) / Math.abs(v), `${id} day ${t}`).toBeLessThan(1e-4));
    }
    expect(Object.keys(got.regions).length).toBe(idProperty === 'code' ? 7 : 4);
  });

  it('the district smaller than a cell (OC-02, Port Saly) gets a value from its one cell', () => {
    const got = forelight('extract', nc, '--var', 'tas', '--regions', DISTRICTS, '--id-property', 'code', '--json');
    expect(got.regions['oc-02'].cells).toBe(1);
    const centre = forelight('extract', nc, '--var', 'tas', '--regions', DISTRICTS, '--id-property', 'code', '--cells', 'centre', '--json');
    expect(centre.regions['oc-02']).toBeUndefined();
    expect(centre.problems.join('\n')).toMatch(/region 'oc-02' .* has no grid cell/);
  });
});
