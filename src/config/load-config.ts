/**
 * Loads, validates and resolves the operator configuration. Every problem (YAML syntax, schema, semantics,
 * included files) is collected and reported at once, each as a Diagnostic with file, line and column.
 */
import { checkPatterns } from './check-patterns.ts';
import { dirname, resolve } from 'node:path';
import type { DiagnosticCode } from '../core/diagnostic-codes.ts';
import { byPlace, diagnostic, uniqueDiagnostics, type Diagnostic } from '../core/diagnostics.ts';
import { ConfigError } from '../core/errors.ts';
import { packagePath } from '../core/package-root.ts';
import { loadRegionSets, type RegionSets } from './boundaries/region-sets.ts';
import { buildConfig } from './build-config.ts';
import { checkCombine } from './check-combine.ts';
import { checkIndicators } from './check-indicators.ts';
import { checkVariables } from './check-variables.ts';
import { checkDuplicateIds, checkReferences } from './check-references.ts';
import { checkRules } from './check-rules.ts';
import { checkTexts } from './check-texts.ts';
import { checkValues } from './check-values.ts';
import { pointerOf, problem, type ConfigProblem } from './problem.ts';
import { list, obj, text } from './raw-access.ts';
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
  /** Every problem, in reading order (file, line, column). */
  readonly diagnostics: readonly Diagnostic[];
  /** Positions of every key and value, for later messages (e.g. checkRegionsAgainstGrids). */
  readonly sourceMap: ConfigSourceMap;
}

/**
 * The semantic checks, each with the code its problems carry. They need the included lists: without them every
 * reference would look unknown. The schema's problems let a check skip what the schema already refused; the ids
 * of the regions read from boundary files count as region ids.
 */
const SEMANTIC_CHECKS: readonly (readonly [
  DiagnosticCode,
  (raw: Record<string, unknown>, schemaProblems: readonly ConfigProblem[], setRegionIds: readonly string[]) => ConfigProblem[],
])[] = [
  ['config-duplicate-id', checkDuplicateIds],
  ['config-reference', checkReferences],
  ['config-rule', checkRules],
  ['config-text', checkTexts],
  ['config-value', checkValues],
  ['config-value', checkVariables],
  ['config-indicator', checkIndicators],
  ['config-combine', checkCombine],
  ['config-pattern', checkPatterns],
];

const regionEntries = new WeakMap<Config, ReadonlyMap<string, number>>();

function entryOf(rawRegions: unknown, id: string, byEntry: RegionSets['byEntry']): number {
  for (const [i, regions] of byEntry) if (regions.some((r) => r.id === id)) return i;
  return list(rawRegions).findIndex((r) => obj(r).id === id);
}

/** Index of the `regions:` entry (inline region or boundary file) a region comes from, for YAML positions. */
export function regionEntryOf(config: Config, regionId: string): number {
  return regionEntries.get(config)?.get(regionId) ?? config.regions.findIndex((r) => r.id === regionId);
}

export async function checkConfigFile(path: string = DEFAULT_CONFIG_PATH): Promise<ConfigCheck> {
  const file = resolve(path);
  const sourceMap = new ConfigSourceMap();
  const main = await readYamlFile(file);
  if (!main.ok)
    return { diagnostics: [diagnostic('config-file', main.message, main.fix, { file: displayPath(file), line: 1, column: 1 })], sourceMap };
  sourceMap.addDocument(file, main.doc, main.lineCounter);
  if (main.problems.length > 0) return { diagnostics: main.problems, sourceMap };

  const raw: Record<string, unknown> = { ...obj(main.value) };
  const diagnostics: Diagnostic[] = [];
  const pending: [DiagnosticCode, ConfigProblem][] = [];
  let includesComplete = true;
  const include = obj(raw.include);
  for (const key of INCLUDABLE) {
    const rel = text(include[key]);
    if (rel === undefined) {
      if (raw[key] === undefined)
        pending.push(['config-include', problem('', `no ${key} given`, `add ${key}: inline or include: ${key}: <file>`)]);
      continue;
    }
    const at = pointerOf('include', key);
    if (raw[key] !== undefined) {
      pending.push([
        'config-include',
        problem(at, `${key} are given both inline and in an included file`, `keep one: delete the inline ${key}: or this include`),
      ]);
      continue;
    }
    const includedFile = resolve(dirname(file), rel);
    const read = await readYamlFile(includedFile);
    if (!read.ok) {
      pending.push(['config-file', problem(at, read.message, read.fix)]);
      includesComplete = false;
      continue;
    }
    sourceMap.addDocument(includedFile, read.doc, read.lineCounter, pointerOf(key));
    diagnostics.push(...read.problems);
    if (read.problems.length > 0) includesComplete = false;
    else raw[key] = read.value;
  }

  const schemaProblems = validateAgainstSchema(raw);
  pending.push(...schemaProblems.map((p): [DiagnosticCode, ConfigProblem] => ['config-schema', p]));
  let sets: RegionSets = { byEntry: new Map(), problems: [] };
  if (includesComplete) {
    sets = await loadRegionSets(raw, dirname(file));
    const setIds = [...sets.byEntry.values()].flat().map((r) => r.id);
    pending.push(...sets.problems.map((p): [DiagnosticCode, ConfigProblem] => ['config-boundaries', p]));
    for (const [code, check] of SEMANTIC_CHECKS)
      pending.push(...check(raw, schemaProblems, setIds).map((p): [DiagnosticCode, ConfigProblem] => [code, p]));
  }
  diagnostics.push(...pending.map(([code, p]) => sourceMap.place(code, p)));
  const unique = uniqueDiagnostics(diagnostics).sort(byPlace);
  if (unique.length > 0) return { diagnostics: unique, sourceMap };
  const config = buildConfig(raw, file, sets.byEntry);
  regionEntries.set(config, new Map(config.regions.map((r) => [r.id, entryOf(raw.regions, r.id, sets.byEntry)])));
  return { config, diagnostics: [], sourceMap };
}

/** Loads a configuration (default: the packaged Veloria sample); throws ConfigError listing every problem. */
export async function loadConfig(path?: string): Promise<Config> {
  const { config, diagnostics } = await checkConfigFile(path);
  if (!config) throw new ConfigError(diagnostics);
  return config;
}
