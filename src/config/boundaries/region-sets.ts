/**
 * Every `regions:` entry that names a boundary file, loaded (boundary-sets.ts), with the checks that need the
 * features: region ids unique across files and inline regions, and teams named in teams-by-id/-by-property known.
 */
import { pointerOf, problem, type ConfigProblem } from '../problem.ts';
import { ids, known, list, num, obj, oneOf, text, type RawObject } from '../raw-access.ts';
import type { CellRule, RegionConfig } from '../types.ts';
import { loadBoundarySet, setTeamReferences, type SetDefaults } from './boundary-sets.ts';

export interface RegionSets {
  /** regions[] entry index → its regions. */
  readonly byEntry: ReadonlyMap<number, readonly RegionConfig[]>;
  readonly problems: readonly ConfigProblem[];
}

/** Clock and cell rule of an entry: its time-zone or utc-offset-hours, else `defaultZone` (schedule.timezone). */
export function entryDefaults(entry: RawObject, defaultZone: string | undefined): SetDefaults {
  const rule = text(entry['cell-rule']) as CellRule | undefined; // the schema's enum lists the cell rules
  const offset = num(entry['utc-offset-hours']);
  const zone = text(entry['time-zone']) ?? (offset === undefined ? defaultZone : undefined);
  return {
    utcOffsetHours: offset ?? 0,
    ...(zone !== undefined ? { timeZone: zone } : {}),
    ...(rule !== undefined ? { cellRule: rule } : {}),
  };
}

export async function loadRegionSets(raw: RawObject, dir: string): Promise<RegionSets> {
  const byEntry = new Map<number, RegionConfig[]>();
  const problems: ConfigProblem[] = [];
  const defaultZone = text(obj(raw.schedule).timezone);
  const teams = known(ids(raw.teams));
  const owner = new Map<string, string>();
  ids(raw.regions).forEach((id, i) => id !== undefined && owner.set(id, `entry ${i + 1} of regions`));
  const entries = list(raw.regions);
  for (let i = 0; i < entries.length; i++) {
    const entry = obj(entries[i]);
    if (text(entry.boundaries) === undefined) continue;
    const loaded = await loadBoundarySet(entry, i, dir, entryDefaults(entry, defaultZone));
    problems.push(...loaded.problems);
    for (const r of loaded.regions) {
      const other = owner.get(r.id);
      if (other)
        problems.push(
          problem(
            pointerOf('regions', i, 'boundaries'),
            `region id '${r.id}' from ${text(entry.boundaries)} is also used by ${other}`,
            'give each region its own id (id-property, or rename the inline region)',
          ),
        );
      else owner.set(r.id, `${text(entry.boundaries)}`);
    }
    for (const ref of setTeamReferences(entry, i))
      if (!teams.has(ref.team)) problems.push(problem(ref.pointer, `unknown team "${ref.team}"`, oneOf(teams)));
    byEntry.set(i, loaded.regions);
  }
  return { byEntry, problems };
}
