/**
 * `forelight regions` on the Veloria sample with the sample district file (config/veloria-districts.geojson,
 * invented): per source, cell counts and areas, a warning for the district smaller than a cell, and a GeoJSON
 * preview and SVG map an operator can open (SVG checked as well-formed XML by xmllint, Debian libxml2-utils).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { generateSample } from '../../src/sample/generate.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'forelight-regions-'));

beforeAll(async () => {
  if (!existsSync(join(ROOT, 'sample-inputs/data/manifest.json'))) await generateSample();
  const main = readFileSync(join(ROOT, 'config/forelight.yaml'), 'utf8')
    .replaceAll('../sample-inputs/', `${join(ROOT, 'sample-inputs')}/`)
    .replaceAll('../templates', join(ROOT, 'templates'));
  writeFileSync(join(dir, 'forelight.yaml'), main);
  writeFileSync(join(dir, 'teams.yaml'), readFileSync(join(ROOT, 'config/teams.yaml')));
  // The sample's own regions (the rules name them) and, beside them, its district file.
  writeFileSync(
    join(dir, 'regions.yaml'),
    `${readFileSync(join(ROOT, 'config/regions.yaml'), 'utf8')}
- boundaries: ${join(ROOT, 'config/veloria-districts.geojson')}
  id-property: code
  name-property: district
  time-zone: Africa/Lagos
  teams-by-property: { property: province, teams: { Kessan: [kessan-health], Marrow: [marrow-health], Tulva: [tulva-health], Orrin: [orrin-health] } }
`,
  );
}, 120_000);

describe('forelight regions', () => {
  it('prints cells and areas per source grid, warns about the district smaller than a cell, writes preview and map', () => {
    const out = join(dir, 'out');
    const r = spawnSync(
      process.execPath,
      [join(ROOT, 'bin/forelight.mjs'), 'regions', '--config', join(dir, 'forelight.yaml'), '--out', out],
      { cwd: ROOT, encoding: 'utf8', env: { ...process.env, FORELIGHT_LOG_LEVEL: 'error' } },
    );
    expect(r.stderr).not.toMatch(/problem:/);
    expect(r.status).toBe(0);
    for (const source of ['short', 'subseasonal', 'seasonal']) expect(r.stdout).toContain(`source ${source} (`);
    expect(r.stdout).toMatch(/\n {2}oc-02 +1 /); // Port Saly: one cell on every grid
    expect(r.stderr).toMatch(/warning: region 'oc-02' \([\d.]+ km²\) is much smaller than a grid cell of source seasonal/);
    expect(r.stderr).not.toMatch(/warning: region 'ks-01'/);
    const preview = JSON.parse(readFileSync(join(out, 'seasonal.geojson'), 'utf8')) as {
      features: { properties: Record<string, unknown>; geometry: { type: string } }[];
    };
    const regions = preview.features.filter((f) => f.properties.kind === 'region');
    expect(regions.map((f) => f.properties.id)).toEqual([
      'kessan-lowlands',
      'marrow-highlands',
      'tulva-delta',
      'orrin-coast',
      'ks-01',
      'ks-02',
      'ks-03',
      'mh-01',
      'td-01',
      'oc-01',
      'oc-02',
    ]);
    for (const id of regions.map((f) => f.properties.id)) {
      const cells = preview.features.filter((f) => f.properties.kind === 'cell' && f.properties.region === id);
      expect(cells.reduce((a, f) => a + (f.properties.weight as number), 0)).toBeCloseTo(1, 6);
      expect(cells.every((f) => f.geometry.type === 'Polygon')).toBe(true);
    }
    // Kessan Sud's covered area excludes its lake (the Lac Mirel enclave): region area = covered area on a grid covering it.
    const ks02 = regions.find((f) => f.properties.id === 'ks-02')!.properties;
    expect(Math.abs((ks02.covered_km2 as number) - (ks02.area_km2 as number)) / (ks02.area_km2 as number)).toBeLessThan(1e-6);
    execFileSync('xmllint', ['--noout', join(out, 'seasonal.svg')]);
    expect(readFileSync(join(out, 'seasonal.svg'), 'utf8')).toContain('<title>Republic of Veloria');
  });

  it('with no forecast file yet: a note per source, no empty preview claimed, exit 3 (input problem)', () => {
    const empty = join(dir, 'empty.yaml');
    writeFileSync(
      empty,
      readFileSync(join(dir, 'forelight.yaml'), 'utf8').replaceAll(join(ROOT, 'sample-inputs'), join(dir, 'nothing-here')),
    );
    const out = join(dir, 'out-empty');
    const r = spawnSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), 'regions', '--config', empty, '--out', out], {
      cwd: ROOT,
      encoding: 'utf8',
      env: { ...process.env, FORELIGHT_LOG_LEVEL: 'error' },
    });
    expect(r.status).toBe(3);
    for (const source of ['short', 'subseasonal', 'seasonal'])
      expect(r.stderr).toMatch(new RegExp(`note: source '${source}': no forecast file yet`));
    expect(r.stdout).toMatch(/no preview written: no source has a forecast file yet/);
    expect(r.stdout).not.toMatch(/preview: /);
    expect(existsSync(out)).toBe(false);
  });
});
