/**
 * Region sets from boundary files in the YAML: ids and names from feature properties, teams by id and by
 * property, clocks and cell rules, and one clear line (YAML position + file + feature) per bad input.
 * The district file is the sample world's (config/veloria-districts.geojson, invented).
 */
import { copyFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { regionIdOf } from '../../src/config/boundaries/boundary-sets.ts';
import { checkConfigFile } from '../../src/config/load-config.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { minimalVariant } from '../config/helpers.ts';

const DISTRICTS = join(import.meta.dirname, '../../config/veloria-districts.geojson');
const SOUTH = `  - id: south
    name: South
    polygon: [[0, 0], [1, 0], [1, 1], [0, 0]]
    utc-offset-hours: 0
    teams: [south-team]
`;

/** minimal.yaml with its `south` region replaced by `entry`, the district file copied beside it as districts.geojson. */
async function withSet(entry: string, geojson?: object) {
  const file = minimalVariant(SOUTH, entry);
  if (geojson) writeFileSync(join(dirname(file), 'districts.geojson'), JSON.stringify(geojson));
  else copyFileSync(DISTRICTS, join(dirname(file), 'districts.geojson'));
  return lines(await checkConfigFile(file));
}

/** The check's result with its diagnostics as the one-line messages operators read. */
function lines(check: Awaited<ReturnType<typeof checkConfigFile>>) {
  return { config: check.config, problems: check.diagnostics.map(formatDiagnostic) };
}

const polygon = (ring: number[][]) => ({ type: 'Polygon', coordinates: [ring] });
const fc = (...features: object[]) => ({ type: 'FeatureCollection', features });
const feature = (props: object, geometry: object | null) => ({ type: 'Feature', properties: props, geometry });

describe('regions: boundaries: FILE', () => {
  it('one region per feature: id from id-property written as a region id, name, teams by id and by property, schedule.timezone as default clock', async () => {
    const { config, problems } = await withSet(`  - boundaries: districts.geojson
    id-property: district
    name-property: district
    teams: [north-team]
    teams-by-id: { lac-mirel: [south-team] }
    teams-by-property: { property: province, teams: { Orrin: [south-team] } }
`);
    expect(problems).toEqual([]);
    const regions = config!.regions.filter((r) => r.id !== 'north');
    expect(regions.map((r) => r.id)).toEqual([
      'kessan-nord',
      'kessan-sud',
      'lac-mirel',
      'marrow-highlands',
      'tulva-delta',
      'orrin-coast',
      'port-saly',
    ]);
    const byId = new Map(regions.map((r) => [r.id, r]));
    expect(byId.get('port-saly')).toMatchObject({ name: 'Port Saly', teams: ['north-team', 'south-team'], timeZone: 'Etc/GMT-1' });
    expect(byId.get('lac-mirel')!.teams).toEqual(['north-team', 'south-team']);
    expect(byId.get('kessan-nord')!.teams).toEqual(['north-team']);
    const kessanSud = byId.get('kessan-sud')!.shape;
    expect(kessanSud.kind === 'multipolygon' && kessanSud.polygons[0].length).toBe(2); // outer ring + lake
  });

  it('time-zone, utc-offset-hours and cell-rule of the entry apply to every feature; both clocks at once is refused', async () => {
    const zone = await withSet(
      '  - boundaries: districts.geojson\n    id-property: code\n    time-zone: Africa/Cairo\n    cell-rule: centre\n',
    );
    expect(zone.problems).toEqual([]);
    expect(zone.config!.regions[1]).toMatchObject({ id: 'ks-01', name: 'KS-01', timeZone: 'Africa/Cairo', cellRule: 'centre' });
    const both = await withSet(
      '  - boundaries: districts.geojson\n    id-property: code\n    time-zone: Africa/Cairo\n    utc-offset-hours: 2\n',
    );
    expect(both.problems.join('\n')).toMatch(/:\d+:\d+: both time-zone and utc-offset-hours are given/);
    const unknown = await withSet('  - boundaries: districts.geojson\n    id-property: code\n    time-zone: Africa/Veloria\n');
    expect(unknown.problems.join('\n')).toMatch(/unknown IANA time zone "Africa\/Veloria"/);
  });

  it('region-thresholds may name a region of a boundary file', async () => {
    const file = minimalVariant(SOUTH, '  - boundaries: districts.geojson\n    id-property: code\n');
    copyFileSync(DISTRICTS, join(dirname(file), 'districts.geojson'));
    const { readFileSync } = await import('node:fs');
    const text = readFileSync(file, 'utf8');
    expect(text).toContain('threshold:');
    const withOverride = text.replace(/(\n\s+threshold: [^\n]+\n)/, `$1    region-thresholds: { ks-02: { value: 30, units: degC } }\n`);
    writeFileSync(file, withOverride);
    const { problems } = lines(await checkConfigFile(file));
    expect(problems.filter((p) => /unknown region/.test(p))).toEqual([]);
  });

  it.each([
    [
      'a self-intersecting ring (bow tie)',
      polygon([
        [0, 0],
        [1, 1],
        [1, 0],
        [0, 1],
        [0, 0],
      ]),
      /feature 1 \(id "bow"\) ring 0 \(outer\) intersects itself at \[0\.5, 0\.5\]/,
    ],
    [
      'an unclosed ring',
      polygon([
        [0, 0],
        [1, 0],
        [1, 1],
        [0, 1],
      ]),
      /feature 1 \(id "bow"\) ring 0 \(outer\) is not closed: last position \[0, 1\] differs from the first \[0, 0\]/,
    ],
    ['no geometry', null, /feature 1 \(id "bow"\) has no geometry \(empty\)/],
    ['an empty MultiPolygon', { type: 'MultiPolygon', coordinates: [] }, /feature 1 \(id "bow"\) has no polygon \(empty\)/],
    [
      'a line',
      {
        type: 'LineString',
        coordinates: [
          [0, 0],
          [1, 1],
        ],
      },
      /has geometry type LineString; regions need Polygon or MultiPolygon/,
    ],
    [
      'a hole crossing its outer ring',
      {
        type: 'Polygon',
        coordinates: [
          [
            [0, 0],
            [2, 0],
            [2, 2],
            [0, 2],
            [0, 0],
          ],
          [
            [1, 1],
            [3, 1],
            [3, 1.5],
            [1, 1],
          ],
        ],
      },
      /ring [01] \((outer|hole)\) crosses ring [01] \((outer|hole)\) at \[2, 1(\.25)?\]/,
    ],
  ])('%s: one line with the YAML position, file, feature index and id, and how to repair', async (_what, geometry, message) => {
    const { config, problems } = await withSet(
      '  - boundaries: districts.geojson\n    id-property: name\n',
      fc(
        feature(
          { name: 'ok' },
          polygon([
            [5, 5],
            [6, 5],
            [6, 6],
            [5, 5],
          ]),
        ),
        feature({ name: 'bow' }, geometry),
      ),
    );
    expect(config).toBeUndefined();
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(/variant-\d+\.yaml:\d+:\d+: .*districts\.geojson: /);
    expect(problems[0]).toMatch(message);
    expect(problems[0]).toMatch(/— (repair it in the GIS \(e\.g\. ogr2ogr -makevalid|)/);
  });

  it('bad ids, teams and files are named', async () => {
    const twoNames = fc(
      feature(
        { name: 'Kessan' },
        polygon([
          [0, 0],
          [1, 0],
          [1, 1],
          [0, 0],
        ]),
      ),
      feature(
        { name: 'kessan' },
        polygon([
          [2, 0],
          [3, 0],
          [3, 1],
          [2, 0],
        ]),
      ),
      feature(
        { other: 1 },
        polygon([
          [4, 0],
          [5, 0],
          [5, 1],
          [4, 0],
        ]),
      ),
    );
    const ids = await withSet(
      '  - boundaries: districts.geojson\n    id-property: name\n    teams-by-id: { nowhere: [north-team] }\n    teams-by-property: { property: name, teams: { Kessan: [ghost-team], Atlantis: [north-team] } }\n',
      twoNames,
    );
    const text = ids.problems.join('\n');
    expect(text).toMatch(/feature 1 \(id "kessan"\) has region id 'kessan', as feature 0 does/);
    expect(text).toMatch(
      /feature 2 has no usable value of property 'name' — set id-property to a property every feature has \(properties of this feature: other\)/,
    );
    expect(text).toMatch(/no region 'nowhere' in districts\.geojson/);
    expect(text).toMatch(/unknown team "ghost-team"/);
    expect(text).toMatch(/no feature has name = 'Atlantis'/);
    const missing = await withSet('  - boundaries: nowhere.geojson\n');
    expect(missing.problems.join('\n')).toMatch(/boundary file .*nowhere\.geojson cannot be read/);
    const clash = await withSet(
      '  - boundaries: districts.geojson\n    id-property: name\n',
      fc(
        feature(
          { name: 'North' },
          polygon([
            [0, 0],
            [1, 0],
            [1, 1],
            [0, 0],
          ]),
        ),
      ),
    );
    expect(clash.problems.join('\n')).toMatch(/region id 'north' from districts\.geojson is also used by entry 1 of regions/);
  });

  it('a damaged GeoJSON file (a list, a feature whose properties or geometry are not objects) is refused naming the file and feature (RFC 7946 §3.2, §3.3)', async () => {
    const list = await withSet('  - boundaries: districts.geojson\n', [feature({ code: 'OC-01' }, null)]);
    expect(list.problems.join('\n')).toMatch(/boundary file .*districts\.geojson is not a GeoJSON FeatureCollection \(type undefined\)/);
    const damaged = { ...feature({}, null), properties: 'OC-01', geometry: 'Polygon' };
    const bad = await withSet('  - boundaries: districts.geojson\n    id-property: code\n', fc(damaged));
    expect(bad.problems.join('\n')).toMatch(
      /districts\.geojson: feature 0 has no usable value of property 'code' .*\(properties of this feature: none\)/,
    );
    const noShape = await withSet(
      '  - boundaries: districts.geojson\n    id-property: code\n',
      fc({ ...damaged, properties: { code: 'OC-01' } }),
    );
    expect(noShape.problems.join('\n')).toMatch(
      /districts\.geojson: feature 0 \(id "OC-01"\) has no geometry \(empty\) — repair it in the GIS/,
    );
  });

  it('region ids from property values: lower case, accents dropped, hyphens (common practice, no source)', () => {
    expect(regionIdOf('Kessan Nord')).toBe('kessan-nord');
    expect(regionIdOf('Équateur — Sud')).toBe('equateur-sud');
    expect(regionIdOf(710)).toBe('710');
  });
});
