/**
 * `forelight check` on a box region that falls between the cell centres of a source grid (a NetCDF file written by
 * netCDF-C's ncgen, centres every 2°): a warning at the region's YAML line saying which cell rule is in use — with
 * `cell-rule: centre` the box gets no cells (as `cdo sellonlatbox` would select none), with the default overlap rule
 * it is valid and its value is that of the cells it touches. A box holding a centre, or one on an edge, gets no
 * warning; the warning does not make the configuration invalid (exit 0).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { checkBoxesBetweenCentres, checkRegionsAgainstGrids } from '../../src/config/check-grids.ts';
import { checkConfigFile } from '../../src/config/load-config.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { EXIT } from '../../src/core/exit-codes.ts';
import { sourceGridExtents } from '../../src/pipeline/grid-extents.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
let file: string;

/** Regions of the test: between centres (centre rule and default), holding a centre, a centre on its edge. */
const REGIONS = `regions:
  - id: north
    name: North
    box: { south: 1, north: 3, west: -1, east: 1 }
    utc-offset-hours: 0
    teams: [north-team]
  - id: gap-centre
    name: Gap (centre rule)
    box: { south: 0.5, north: 1.5, west: 0.5, east: 1.5 }
    cell-rule: centre
    utc-offset-hours: 0
    teams: [north-team]
  - id: gap-overlap
    name: Gap (overlap rule)
    box: { south: 2.5, north: 3.5, west: 2.5, east: 3.5 }
    utc-offset-hours: 0
    teams: [north-team]
  - id: edge
    name: Edge
    box: { south: 2, north: 3, west: 2, east: 3 }
    cell-rule: centre
    utc-offset-hours: 0
    teams: [south-team]
teams:`;

const CDL = `netcdf w {
dimensions: time = 1 ; lat = 3 ; lon = 4 ;
variables:
  double time(time) ; time:units = "days since 2026-11-30" ; time:standard_name = "time" ;
  double lat(lat) ; lat:units = "degrees_north" ; lat:standard_name = "latitude" ;
  double lon(lon) ; lon:units = "degrees_east" ; lon:standard_name = "longitude" ;
  float tasmax(time, lat, lon) ; tasmax:units = "K" ;
data:
  time = 0 ; lat = 0, 2, 4 ; lon = -2, 0, 2, 4 ;
  tasmax = 300, 300, 300, 300, 300, 300, 300, 300, 300, 300, 300, 300 ;
}
`;

beforeAll(() => {
  const dir = mkdtempSync(join(tmpdir(), 'forelight-gap-'));
  mkdirSync(join(dir, 'data'));
  writeFileSync(join(dir, 'w.cdl'), CDL);
  execFileSync('ncgen', ['-o', join(dir, 'data', 'w_20261130.nc'), join(dir, 'w.cdl')]);
  const minimal = readFileSync(join(ROOT, 'test/config/fixtures/minimal.yaml'), 'utf8');
  const start = minimal.indexOf('regions:');
  const end = minimal.indexOf('\nteams:') + 1;
  file = join(dir, 'forelight.yaml');
  writeFileSync(file, minimal.slice(0, start) + REGIONS + minimal.slice(end + 'teams:'.length));
});

describe('box regions between cell centres', () => {
  it('warns at the region line for the two boxes without a centre, naming the rule in use; not for the others', async () => {
    const { config, sourceMap, diagnostics } = await checkConfigFile(file);
    expect(diagnostics.map(formatDiagnostic)).toEqual([]);
    const { grids } = await sourceGridExtents(config!);
    expect(checkRegionsAgainstGrids(config!, grids, sourceMap)).toEqual([]);
    const found = checkBoxesBetweenCentres(config!, grids, sourceMap);
    expect(found.map((d) => [d.code, d.severity, d.place.line])).toEqual([
      ['region-between-centres', 'warning', 16],
      ['region-between-centres', 'warning', 22],
    ]);
    expect(found[0].message).toBe(
      "box region gap-centre (lat 0.5..1.5, lon 0.5..1.5) contains no cell centre of source weekly's grid (spacing 2° × 2°): with cell-rule: centre it gets no cells, so this source gives it no value",
    );
    expect(found[1].message).toMatch(
      /^box region gap-overlap .*: cell-rule overlap \(the default\) is in use, so its value is the area-weighted mean/,
    );
  });

  it('forelight check prints the warnings with file:line:column and still exits 0', () => {
    const r = spawnSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), 'check', '--config', file], {
      cwd: ROOT,
      encoding: 'utf8',
      timeout: 120_000,
    });
    expect(r.status).toBe(EXIT.ok);
    const warnings = r.stderr.split('\n').filter((l) => l.startsWith('warning: '));
    expect(warnings).toHaveLength(2);
    expect(warnings[0]).toMatch(/^warning: .*forelight\.yaml:16:\d+: box region gap-centre .* — remove cell-rule: centre/);
  });
});
