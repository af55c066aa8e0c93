/**
 * Region sets from boundary files: a `regions:` entry with `boundaries: FILE` becomes one region per feature.
 * Ids come from `id-property` (else the GeoJSON Feature id), written as region ids (lowercase, digits and
 * hyphens: "Kessan North" → kessan-north); names from `name-property` (else the id). Teams: `teams` for every
 * feature, plus `teams-by-id` and `teams-by-property` (e.g. every district of a province to its team).
 * Every problem names the YAML entry, the file, the feature's index and id, and what to do.
 */
import { resolve } from 'node:path';
import { pointerOf, problem, type ConfigProblem } from '../problem.ts';
import { list, obj, text, type RawObject } from '../raw-access.ts';
import type { RegionConfig } from '../types.ts';
import { featurePolygons } from './feature-geometry.ts';
import { readBoundaryFeatures, type RawFeature } from './read-features.ts';

/** Region id from a property value: lower case, accents dropped, other characters to single hyphens. */
export function regionIdOf(value: unknown): string {
  return String(value)
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '');
}

/** The region fields a set gives each of its features (clock, rule). */
export type SetDefaults = Pick<RegionConfig, 'utcOffsetHours' | 'timeZone' | 'cellRule'>;

interface Loaded {
  readonly regions: RegionConfig[];
  readonly problems: ConfigProblem[];
}

const strings = (v: unknown): string[] => list(v).filter((t): t is string => typeof t === 'string');

function featureId(f: RawFeature, idProperty: string | undefined): unknown {
  return idProperty !== undefined ? f.properties[idProperty] : f.featureId;
}

function label(f: RawFeature, id: unknown): string {
  return id === undefined || id === null ? `feature ${f.index}` : `feature ${f.index} (id ${JSON.stringify(id)})`;
}

/** Team ids for a feature from `teams`, `teams-by-id` and `teams-by-property`. */
function teamsOf(entry: RawObject, id: string, f: RawFeature): string[] {
  const byProperty = obj(entry['teams-by-property']);
  const property = text(byProperty.property);
  const value = property !== undefined ? f.properties[property] : undefined;
  const fromProperty = value === undefined || value === null ? [] : strings(obj(byProperty.teams)[String(value)]);
  return [...new Set([...strings(entry.teams), ...strings(obj(entry['teams-by-id'])[id]), ...fromProperty])];
}

/** Regions of one set entry (`regions[index]`), paths relative to `dir`. */
export async function loadBoundarySet(entry: RawObject, index: number, dir: string, defaults: SetDefaults): Promise<Loaded> {
  const at = (...p: (string | number)[]) => pointerOf('regions', index, ...p);
  const file = resolve(dir, text(entry.boundaries) ?? '');
  const read = await readBoundaryFeatures(file);
  if (!read.ok) return { regions: [], problems: [problem(at('boundaries'), read.message, read.fix)] };
  const idProperty = text(entry['id-property']);
  const nameProperty = text(entry['name-property']);
  const problems: ConfigProblem[] = [];
  const regions: RegionConfig[] = [];
  const seen = new Map<string, number>();
  const fixGeometry = `repair it in the GIS (e.g. ogr2ogr -makevalid fixed.geojson ${file}) or remove the feature`;
  for (const f of read.features) {
    const raw = featureId(f, idProperty);
    const id = raw === undefined || raw === null ? '' : regionIdOf(raw);
    if (id === '') {
      const what = idProperty !== undefined ? `has no usable value of property '${idProperty}'` : 'has no Feature id';
      problems.push(
        problem(
          at(idProperty !== undefined ? 'id-property' : 'boundaries'),
          `${file}: ${label(f, raw)} ${what}`,
          `set id-property to a property every feature has (properties of this feature: ${Object.keys(f.properties).join(', ') || 'none'})`,
        ),
      );
      continue;
    }
    const geometry = featurePolygons(f.geometry);
    if ('problem' in geometry) {
      problems.push(problem(at('boundaries'), `${file}: ${label(f, raw)} ${geometry.problem}`, fixGeometry));
      continue;
    }
    const twin = seen.get(id);
    if (twin !== undefined) {
      problems.push(
        problem(
          at('id-property'),
          `${file}: ${label(f, raw)} has region id '${id}', as feature ${twin} does`,
          'choose an id-property that is unique per feature (or merge the two features)',
        ),
      );
      continue;
    }
    seen.set(id, f.index);
    const name = nameProperty !== undefined ? f.properties[nameProperty] : undefined;
    regions.push({
      id,
      name: name === undefined || name === null ? String(raw) : String(name),
      shape: { kind: 'multipolygon', polygons: geometry.polygons },
      teams: teamsOf(entry, id, f),
      ...defaults,
    });
  }
  if (nameProperty !== undefined && read.features.length > 0 && read.features.every((f) => f.properties[nameProperty] === undefined)) {
    problems.push(
      problem(
        at('name-property'),
        `${file}: no feature has property '${nameProperty}'`,
        `use one of: ${Object.keys(read.features[0].properties).join(', ')}`,
      ),
    );
  }
  problems.push(...checkTeamKeys(entry, index, read.features, new Set(seen.keys())));
  return { regions, problems };
}

/** `teams-by-id` keys must be ids of the set; `teams-by-property` values must occur (a typo would drop a team). */
function checkTeamKeys(entry: RawObject, index: number, features: readonly RawFeature[], ids: ReadonlySet<string>): ConfigProblem[] {
  const out: ConfigProblem[] = [];
  for (const key of Object.keys(obj(entry['teams-by-id']))) {
    if (!ids.has(key))
      out.push(
        problem(
          pointerOf('regions', index, 'teams-by-id', key),
          `no region '${key}' in ${text(entry.boundaries)}`,
          `use region ids of the file: ${[...ids].slice(0, 8).join(', ')}${ids.size > 8 ? ', …' : ''}`,
          'key',
        ),
      );
  }
  const byProperty = obj(entry['teams-by-property']);
  const property = text(byProperty.property);
  if (property === undefined) return out;
  const values = new Set(
    features
      .map((f) => f.properties[property])
      .filter((v) => v !== undefined && v !== null)
      .map(String),
  );
  for (const key of Object.keys(obj(byProperty.teams))) {
    if (!values.has(key))
      out.push(
        problem(
          pointerOf('regions', index, 'teams-by-property', 'teams', key),
          `no feature has ${property} = '${key}'`,
          `use values of ${property}: ${[...values].slice(0, 8).join(', ')}`,
          'key',
        ),
      );
  }
  return out;
}

/** Team ids named in the set's `teams-by-id` and `teams-by-property`, with their pointers (for reference checks). */
export function setTeamReferences(entry: RawObject, index: number): { team: string; pointer: string }[] {
  const out: { team: string; pointer: string }[] = [];
  for (const [key, teams] of Object.entries(obj(entry['teams-by-id'])))
    strings(teams).forEach((team, j) => out.push({ team, pointer: pointerOf('regions', index, 'teams-by-id', key, j) }));
  for (const [key, teams] of Object.entries(obj(obj(entry['teams-by-property']).teams)))
    strings(teams).forEach((team, j) => out.push({ team, pointer: pointerOf('regions', index, 'teams-by-property', 'teams', key, j) }));
  return out;
}
