/**
 * The indicator registry: every kind module declares what the rest of Forelight derives from it, the derived files
 * are current, and adding a kind is one module (the worked example of DEVELOPERS.md, built here in a copy of the
 * tree) plus the generator run.
 */
import { cpSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Ajv2020 } from 'ajv/dist/2020.js';
import { describe, expect, it } from 'vitest';
import { generatedFiles, kindModules, TABLE_END, TABLE_START } from '../../scripts/update-indicator-registry.ts';
import { UNIT_FAMILIES } from '../../src/config/threshold-units.ts';
import type { IndicatorDefinition, JsonSchema } from '../../src/indicators/definition.ts';
import { REFERENCES } from '../../src/indicators/references.ts';
import { INDICATOR_DEFINITIONS, INDICATOR_KINDS } from '../../src/indicators/registry.ts';
import { CANONICAL_UNITS } from '../../src/types.ts';
import { dayList, inputsOf, regionSeries } from './fixtures.ts';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const here = fileURLToPath(new URL('.', import.meta.url));
const testTexts = readdirSync(here)
  .filter((f) => f.endsWith('.test.ts') && f !== 'registry.test.ts')
  .map((f) => readFileSync(join(here, f), 'utf8'));
const ajv = () => new Ajv2020({ strict: true, allErrors: true });

describe('derived files are current (node bin/run-ts.mjs scripts/update-indicator-registry.ts)', async () => {
  const files = await generatedFiles();
  it.each(files.map((f) => [f.path, f] as const))('%s', (path, f) => {
    expect(
      f.same(readFileSync(join(ROOT, path), 'utf8')),
      `${path} is stale: run node bin/run-ts.mjs scripts/update-indicator-registry.ts`,
    ).toBe(true);
  });
  it('and would notice a stale file', () => {
    const [index, schema, readme] = files;
    expect(index.same(index.text.replace(/^import .*heat-index.*$/m, ''))).toBe(false);
    expect(schema.same(schema.text.replace('"humidex",', ''))).toBe(false);
    expect(readme.same(readme.text.replace('| `humidex` |', '| `humid` |'))).toBe(false);
    expect(readme.same(readme.text.replace(/ \| /g, '   |   '))).toBe(true); // a reflowed table is the same table
  });
});

describe.each(INDICATOR_DEFINITIONS.map((d) => [d.kind, d] as const))('kind %s', (kind, d) => {
  it('lives in src/indicators/kinds/<kind>.ts and the registry lists it', () => {
    expect(kindModules()).toContain(`${kind}.ts`);
    expect(INDICATOR_KINDS.filter((k) => k === kind)).toHaveLength(1);
  });
  it('declares units with a threshold unit family, and needs of known quantities', () => {
    expect(Object.keys(UNIT_FAMILIES)).toContain(d.units);
    expect(d.needs.length).toBeGreaterThan(0);
    for (const anyOf of d.needs) {
      expect(anyOf.length).toBeGreaterThan(0);
      for (const q of anyOf) expect(Object.keys(CANONICAL_UNITS)).toContain(q);
    }
  });
  it('has a params schema ajv compiles in strict mode: a closed mapping, every key described, kebab-case', () => {
    expect(() => ajv().compile(d.params)).not.toThrow();
    expect(d.params).toMatchObject({ type: 'object', additionalProperties: false });
    for (const [key, p] of Object.entries((d.params.properties ?? {}) as Record<string, JsonSchema>)) {
      expect(key).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
      expect(typeof p.description).toBe('string');
    }
  });
  it('describes itself for the docs with known references', () => {
    expect(d.describe.name.length).toBeGreaterThan(0);
    expect(d.describe.description.length).toBeGreaterThan(0);
    for (const r of d.describe.references) expect(Object.keys(REFERENCES)).toContain(r);
  });
  it('is exercised by a test of test/indicators/', () => {
    expect(testTexts.some((t) => t.includes(`indicator('${kind}'`))).toBe(true);
  });
});

describe('adding a kind is one module: the worked example of DEVELOPERS.md, in a copy of the tree', async () => {
  const guide = readFileSync(join(ROOT, 'DEVELOPERS.md'), 'utf8');
  const example = /```ts\n(\/\*\* Indicator kind humidex-days[\s\S]*?)```/.exec(guide)?.[1];
  const tree = mkdtempSync(join(tmpdir(), 'forelight-registry-'));
  for (const p of ['src', 'config/forelight.schema.json', 'README.md']) cpSync(join(ROOT, p), join(tree, p), { recursive: true });
  writeFileSync(join(tree, 'src/indicators/kinds/humidex-days.ts'), example ?? '');
  const files = Object.fromEntries((await generatedFiles(tree)).map((f) => [f.path, f.text]));

  it('the guide holds the example', () => expect(example).toBeDefined());

  it('the generator lists it, puts its kind and params schema into the configuration schema and its row into the README', () => {
    expect(files['src/indicators/kinds/all.ts']).toContain("import { definition as humidexDays } from './humidex-days.ts';");
    const schema = JSON.parse(files['config/forelight.schema.json']) as {
      $id: string;
      $defs: Record<string, JsonSchema & { properties: Record<string, JsonSchema> }>;
    };
    expect(schema.$defs.indicator.properties.kind.enum).toContain('humidex-days');
    const check = ajv().addSchema(schema).getSchema(`${schema.$id}#/$defs/indicator`);
    if (!check) throw new Error('no $defs/indicator in the generated schema');
    const ind = (params: object) => ({
      id: 'muggy',
      name: 'Muggy days',
      kind: 'humidex-days',
      threshold: { value: 3, units: 'days' },
      aggregate: 'max',
      tiers: ['weeks'],
      params,
    });
    expect(check(ind({ 'at-least': 45 }))).toBe(true);
    expect(check(ind({ 'at-least': 90 }))).toBe(false);
    expect(check.errors?.map((e) => e.instancePath)).toContain('/params/at-least');
    expect(check(ind({ 'at-least': 45, basis: 'tmax' }))).toBe(false);
    const table = files['README.md'].slice(files['README.md'].indexOf(TABLE_START), files['README.md'].indexOf(TABLE_END));
    expect(table).toContain(
      '| `humidex-days` | Humidex days. Days in the window with daily humidex ≥ at-least. | tmax; dewpoint | days | `at-least`: 20–60 (default 40) | Masterton & Richardson 1979 |',
    );
  });

  it('its definition computes: a count per window, unknown where a window is incomplete or a day is missing', async () => {
    const mod = (await import(pathToFileURL(join(tree, 'src/indicators/kinds/humidex-days.ts')).href)) as {
      definition: IndicatorDefinition<'humidex-days', { atLeast?: number }>;
    };
    const days = dayList('2026-12-01', 4);
    // Tmax 35 °C with Td 25 °C: humidex ≈ 47 (≥ 40); with Td 10 °C: ≈ 35.
    const tmax = regionSeries('tmax', days, 1, Float64Array.from([35, 35, 35, 35]));
    const dew = regionSeries('dewpoint', days, 1, Float64Array.from([25, 10, 25, NaN]));
    const out = mod.definition.compute({ id: 'muggy', kind: 'humidex-days', windowDays: 2, params: {} }, inputsOf(tmax, dew), {});
    expect(Array.from(out.data)).toEqual([NaN, 1, 1, NaN]);
    expect(mod.definition.units).toBe('days');
  });
});
