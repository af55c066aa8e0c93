/**
 * Boxes across the 180° meridian (west > east, read eastwards from west, e.g. 172 → -174): valid in the YAML and
 * in `extract --box`, on 0..360 and -180..180 grids. The numbers are checked against Debian's CDO 2.1.1, whose
 * `sellonlatbox,lon1,lon2,…` takes lon1 > lon2 as the box across 180° (CDO reference manual, sellonlatbox).
 * Convention: common practice (CDO, GDAL/OGR bounding boxes), no standard; CF 1.11 does not define boxes.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { checkRegionsAgainstGrids, lonIntervals } from '../../src/config/check-grids.ts';
import { checkConfigFile } from '../../src/config/load-config.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { EXIT } from '../../src/core/exit-codes.ts';
import { minimalVariant } from './helpers.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const REGIONS = join(ROOT, 'test/fixtures/regions');
const BOX_LINE = '    box: { south: 1, north: 2, west: -1, east: 1 }';
const shown = (file: string) => (relative(process.cwd(), file).startsWith('..') ? file : relative(process.cwd(), file));

describe('YAML boxes across 180°', () => {
  it('west 172, east -174 loads without a problem and keeps its edges', async () => {
    const { config, diagnostics } = await checkConfigFile(
      minimalVariant(BOX_LINE, '    box: { south: 1, north: 2, west: 172, east: -174 }'),
    );
    expect(diagnostics).toEqual([]);
    expect(config?.regions[0].shape).toEqual({ kind: 'box', south: 1, north: 2, west: 172, east: -174 });
  });

  it('west equal to east is refused at the east key, with the across-180° form as the fix', async () => {
    const file = minimalVariant(BOX_LINE, '    box: { south: 1, north: 2, west: 5, east: 5 }');
    const { config, diagnostics } = await checkConfigFile(file);
    expect(config).toBeUndefined();
    expect(diagnostics.map(formatDiagnostic)).toEqual([
      `${shown(file)}:13:47: east 5 equals west 5: the box has no width — give the eastern edge (a box across 180° has west > east, e.g. west: 172, east: -174)`,
    ]);
  });
});

describe('region against grid extents for a box across 180°', () => {
  it('the arc 172 → -174 in each grid convention', () => {
    expect(lonIntervals(172, -174, true)).toEqual([[172, 186]]);
    expect(lonIntervals(172, -174, false)).toEqual([
      [172, 180],
      [-180, -174],
    ]);
    expect(lonIntervals(-1.5, 1.5, true)).toEqual([
      [358.5, 360],
      [0, 1.5],
    ]);
    expect(lonIntervals(-1.5, 1.5, false)).toEqual([[-1.5, 1.5]]);
  });

  it('overlaps grids on either side of 180°, and is reported outside a grid that stops short of it', async () => {
    const { config } = await checkConfigFile(minimalVariant(BOX_LINE, '    box: { south: 1, north: 2, west: 172, east: -174 }'));
    if (!config) throw new Error('config did not load');
    const near = [
      { source: 'g360', latMin: -10, latMax: 10, lonMin: 180.5, lonMax: 200, lon360: true },
      { source: 'g180-east', latMin: -10, latMax: 10, lonMin: -180, lonMax: -175, lon360: false },
      { source: 'g180-west', latMin: -10, latMax: 10, lonMin: 170, lonMax: 179.5, lon360: false },
    ];
    // Only the first region (`north`) has the box; `south` lies near 0° and is outside these grids.
    const aboutNorth = (grids: typeof near) =>
      checkRegionsAgainstGrids(config, grids, undefined).filter((p) => p.message.includes('region north '));
    expect(aboutNorth(near)).toEqual([]);
    const far = [{ source: 'europe', latMin: -10, latMax: 10, lonMin: -20, lonMax: 40, lon360: false }];
    expect(aboutNorth(far)).toHaveLength(1);
    expect(formatDiagnostic(aboutNorth(far)[0])).toMatch(/lon 172..-174\) lies outside the grid of source europe/);
  });
});

/** CDO's box mean per member and step, in the file's K. */
function cdoBoxMean(file: string, west: number, east: number, south: number, north: number): number[][] {
  const out = execFileSync(
    'cdo',
    ['-s', '--precision', '12', 'outputtab,lev,value', '-fldmean', `-sellonlatbox,${west},${east},${south},${north}`, file],
    { encoding: 'utf8' },
  );
  const members: number[][] = [];
  for (const line of out.split('\n')) {
    const f = line.trim().split(/\s+/);
    if (line.startsWith('#') || f.length < 2) continue;
    (members[Number(f[0])] ??= []).push(Number(f[1]));
  }
  return members;
}

describe('forelight extract --box S,N,W,E with W > E, against cdo fldmean -sellonlatbox', () => {
  it.each([
    ['grid360.nc', '0..360'],
    ['grid180desc.nc', '-180..180, descending latitude, with bounds'],
  ])('%s (%s grid)', (file, _what) => {
    const path = join(REGIONS, file);
    const r = spawnSync(
      process.execPath,
      [join(ROOT, 'bin/forelight.mjs'), 'extract', path, '--var', 't2m', '--box', '-12,-6,172,-174', '--json'],
      { cwd: ROOT, encoding: 'utf8' },
    );
    expect(r.stderr).toBe('');
    expect(r.status).toBe(EXIT.ok);
    const got = JSON.parse(r.stdout) as { units: string; members: number[][]; cells: number };
    const cdo = cdoBoxMean(path, 172, -174, -12, -6);
    expect(got.units).toBe('degC');
    expect(got.members).toHaveLength(cdo.length);
    got.members.forEach((row, m) => row.forEach((v, t) => expect(Math.abs(v + 273.15 - cdo[m][t])).toBeLessThanOrEqual(1e-4)));
  });

  it('west equal to east is a usage error (exit 64) in one line', () => {
    const r = spawnSync(
      process.execPath,
      [join(ROOT, 'bin/forelight.mjs'), 'extract', join(REGIONS, 'grid360.nc'), '--var', 't2m', '--box', '-12,-6,5,5', '--json'],
      { cwd: ROOT, encoding: 'utf8' },
    );
    expect(r.status).toBe(EXIT.usage);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/west 5 equals east 5/);
  });
});
