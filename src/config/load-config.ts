/**
 * Loads, validates and resolves the operator configuration. Every problem (YAML syntax, schema, semantics,
 * included files) is collected and reported at once as `file:line:column: message — fix`.
 */
import { dirname, resolve } from 'node:path';
import { ConfigError } from '../core/errors.ts';
import { packagePath } from '../core/package-root.ts';
import { loadRegionSets, type RegionSets } from './boundaries/region-sets.ts';
import { buildConfig } from './build-config.ts';
import { checkCombine } from './check-combine.ts';
import { checkIndicators } from './check-indicators.ts';
import { checkDuplicateIds, checkReferences } from './check-references.ts';
import { checkRules } from './check-rules.ts';
import { checkTexts } from './check-texts.ts';
import { checkValues } from './check-values.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';
import { obj, text } from './raw-access.ts';
import { readYamlFile } from './read-yaml.ts';
import { ConfigSourceMap, displayPath } from './source-map.ts';
import type { Config } from './types.ts';
import { validateAgainstSchema } from './validate-schema.ts';

/** The configuration shipped with the package (the Veloria sample). */
export const DEFAULT_CONFIG_PATH = packagePath('config/forelight.yaml');

const INCLUDABLE = ['regions', 'teams'] as const;

export interface ConfigCheck {
  /** Present when there are no problems. */
  readonly config?: Config;
  readonly problems: readonly string[];
  /** Positions of every key and value, for later messages (e.g. checkRegionsAgainstGrids). */
  readonly sourceMap: ConfigSourceMap;
}

const sourceMaps = new WeakMap<Config, ConfigSourceMap>();

const regionEntries = new WeakMap<Config, ReadonlyMap<string, number>>();

function entryOf(rawRegions: unknown, id: string, byEntry: RegionSets['byEntry']): number {
  for (const [i, regions] of byEntry) if (regions.some((r) => r.id === id)) return i;
  return (rawRegions as { id?: string }[]).findIndex((r) => r.id === id);
}

/** Index of the `regions:` entry (inline region or boundary file) a region comes from, for YAML positions. */
export function regionEntryOf(config: Config, regionId: string): number {
  return regionEntries.get(config)?.get(regionId) ?? config.regions.findIndex((r) => r.id === regionId);
}

/** The source map of a config returned by loadConfig/checkConfigFile (undefined for hand-made configs). */
export function sourceMapOf(config: Config): ConfigSourceMap | undefined {
  return sourceMaps.get(config);
}

/** Sort key `file:line:col` so that problems come out in reading order. */
function byPosition(a: string, b: string): number {
  const pa = /^(.*?):(\d+):(\d+):/.exec(a);
  const pb = /^(.*?):(\d+):(\d+):/.exec(b);
  if (!pa || !pb) return 0;
  return pa[1].localeCompare(pb[1]) || Number(pa[2]) - Number(pb[2]) || Number(pa[3]) - Number(pb[3]);
}

export async function checkConfigFile(path: string = DEFAULT_CONFIG_PATH): Promise<ConfigCheck> {
  const file = resolve(path);
  const sourceMap = new ConfigSourceMap();
  const main = await readYamlFile(file);
  if (!main.ok) return { problems: [`${displayPath(file)}:1:1: ${main.message} — ${main.fix}`], sourceMap };
  sourceMap.addDocument(file, main.doc, main.lineCounter);
  if (main.problems.length > 0) return { problems: main.problems, sourceMap };

  const raw: Record<string, unknown> = { ...obj(main.value) };
  const problems: string[] = [];
  const pending: ConfigProblem[] = [];
  let includesComplete = true;
  const include = obj(raw.include);
  for (const key of INCLUDABLE) {
    const rel = text(include[key]);
    if (rel === undefined) {
      if (raw[key] === undefined) pending.push(problem('', `no ${key} given`, `add ${key}: inline or include: ${key}: <file>`));
      continue;
    }
    const at = pointerOf('include', key);
    if (raw[key] !== undefined) {
      pending.push(problem(at, `${key} are given both inline and in an included file`, `keep one: delete the inline ${key}: or this include`));
      continue;
    }
    const includedFile = resolve(dirname(file), rel);
    const read = await readYamlFile(includedFile);
    if (!read.ok) {
      pending.push(problem(at, read.message, read.fix));
      includesComplete = false;
      continue;
    }
    sourceMap.addDocument(includedFile, read.doc, read.lineCounter, pointerOf(key));
    problems.push(...read.problems);
    if (read.problems.length > 0) includesComplete = false;
    else raw[key] = read.value;
  }

  pending.push(...validateAgainstSchema(raw));
  // Semantic checks need the included lists: without them every reference would look unknown.
  let sets: RegionSets = { byEntry: new Map(), problems: [] };
  if (includesComplete) {
    sets = await loadRegionSets(raw, dirname(file));
    const setIds = [...sets.byEntry.values()].flat().map((r) => r.id);
    pending.push(...sets.problems, ...checkDuplicateIds(raw), ...checkReferences(raw, setIds), ...checkRules(raw), ...checkTexts(raw), ...checkValues(raw), ...checkIndicators(raw), ...checkCombine(raw));
  }
  problems.push(...pending.map((p) => sourceMap.format(p)));
  const unique = [...new Set(problems)].sort(byPosition);
  if (unique.length > 0) return { problems: unique, sourceMap };
  const config = buildConfig(raw, file, sets.byEntry);
  sourceMaps.set(config, sourceMap);
  regionEntries.set(config, new Map(config.regions.map((r) => [r.id, raw.regions === undefined ? 0 : entryOf(raw.regions, r.id, sets.byEntry)])));
  return { config, problems: [], sourceMap };
}

/** Loads a configuration (default: the packaged Veloria sample); throws ConfigError listing every problem. */
export async function loadConfig(path?: string): Promise<Config> {
  const { config, problems } = await checkConfigFile(path);
  if (!config) throw new ConfigError(problems);
  return config;
}
