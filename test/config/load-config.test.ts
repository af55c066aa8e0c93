/** Loader: shipped configuration, schema, includes, bounds (size, aliases, tags), secrets, positions. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Ajv2020 } from 'ajv/dist/2020.js';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { ConfigError } from '../../src/core/errors.ts';
import { checkConfigFile, DEFAULT_CONFIG_PATH, loadConfig } from '../../src/config/load-config.ts';
import { MAX_CONFIG_BYTES } from '../../src/config/read-yaml.ts';
import { displayPath } from '../../src/config/source-map.ts';
import { SCHEMA_URL } from '../../src/config/validate-schema.ts';
import { fixture, minimalVariant, writeTemp } from './helpers.ts';

const problemsOf = async (file: string) => (await checkConfigFile(file)).diagnostics.map(formatDiagnostic);

describe('shipped configuration (config/forelight.yaml)', () => {
  it('loads with zero problems through the default path', async () => {
    const check = await checkConfigFile();
    expect(check.diagnostics).toEqual([]);
    const config = await loadConfig();
    expect(config.file).toBe(DEFAULT_CONFIG_PATH);
    expect(config.regions.map((r) => r.id)).toEqual(['kessan-lowlands', 'marrow-highlands', 'tulva-delta', 'orrin-coast']);
    expect(config.teams.map((t) => t.id)).toEqual(['kessan-health', 'marrow-health', 'tulva-health', 'orrin-health', 'national-desk']);
    expect(config.stages.map((s) => s.id)).toEqual(['quiet', 'mindful', 'brace', 'act-now']);
    expect(config.stages.map((s) => s.label.fr)).toEqual(['Calme', 'Vigilant', 'Se préparer', 'Agir maintenant']);
    expect(config.decision).toMatchObject({
      tierCaps: { months: 'mindful', weeks: 'brace' },
      escalateAfterRuns: 2,
      relaxAfterRuns: 2,
      topStageImmediate: true,
    });
    expect(config.decision.skillGate).toEqual({
      floor: 0,
      minEvents: 5,
      poolLeads: { days: 7, weeks: 1, months: 1 },
      resamples: 1000,
      seed: 1,
      action: 'say-no-skill',
    });
    expect(config.delivery.smtp).toBeNull();
    expect(config.ledger).toBe(join(config.file, '../../forelight-ledger.sqlite'));
    expect(config.sources[1].hindcast).toBe(join(config.file, '../../sample-inputs/data/subseasonal/hindcast/subs_{year}{mmdd}.nc'));
    expect(config.indicators[1].regionThresholds['marrow-highlands']).toEqual({ kind: 'absolute', value: 36, units: 'degC' });
    expect(config.indicators[3].params).toEqual({ species: 'falciparum', lagMonths: 1, temperatureModel: 'mordecai-2013' });
    expect(config.rules.find((r) => r.id === 'heat-index-days-mindful')).toMatchObject({ costLoss: 0.2 });
    expect(config.probabilityWords.at(-1)?.below).toBe(Number.POSITIVE_INFINITY);
  });

  it('validates against config/forelight.schema.json as written and names the schema on line 1', () => {
    const text = readFileSync(DEFAULT_CONFIG_PATH, 'utf8');
    expect(text.split('\n')[0]).toBe('# yaml-language-server: $schema=./forelight.schema.json');
    const schema = JSON.parse(readFileSync(SCHEMA_URL, 'utf8'));
    const validate = new Ajv2020({ allErrors: true, allowUnionTypes: true }).compile(schema);
    expect(validate(parse(text)), JSON.stringify(validate.errors)).toBe(true);
  });

  it('the included regions.yaml and teams.yaml name their own schemas on line 1 and validate against them', () => {
    const main = JSON.parse(readFileSync(SCHEMA_URL, 'utf8')) as { $id: string };
    const ajv = new Ajv2020({ allErrors: true, allowUnionTypes: true });
    ajv.addSchema(main);
    for (const name of ['regions', 'teams']) {
      const text = readFileSync(join(DEFAULT_CONFIG_PATH, '..', `${name}.yaml`), 'utf8');
      expect(text.split('\n')[0]).toBe(`# yaml-language-server: $schema=./${name}.schema.json`);
      const sub = JSON.parse(readFileSync(join(DEFAULT_CONFIG_PATH, '..', `${name}.schema.json`), 'utf8'));
      const validate = ajv.compile({ ...sub, $id: new URL(`${name}.schema.json`, main.$id).href });
      expect(validate(parse(text)), JSON.stringify(validate.errors)).toBe(true);
      expect(validate([{ id: 'x', unknownKey: 1 }])).toBe(false); // unknown keys are errors here too
    }
  });

  it('gives every schema property a description (editor help)', () => {
    const missing: string[] = [];
    const walk = (node: unknown, path: string) => {
      if (!node || typeof node !== 'object') return;
      const o = node as Record<string, unknown>;
      for (const key of ['properties', 'patternProperties']) {
        for (const [name, sub] of Object.entries((o[key] ?? {}) as Record<string, Record<string, unknown>>)) {
          if (typeof sub.description !== 'string') missing.push(`${path}/${name}`);
        }
      }
      for (const [k, v] of Object.entries(o)) walk(v, `${path}/${k}`);
    };
    walk(JSON.parse(readFileSync(SCHEMA_URL, 'utf8')), '');
    expect(missing).toEqual([]);
  });
});

describe('problems located at file:line:column', () => {
  it('unknown key is an error at the key', async () => {
    const file = minimalVariant('    priority: 1\n', '    priority: 1\n    prioritty: 2\n');
    expect(await problemsOf(file)).toEqual([
      `${displayPath(file)}:9:5: unknown key "prioritty" — remove it or fix the spelling; allowed here: id, name, tier, forecast-files, hindcast-files, variables, priority, look-back-days`,
    ]);
  });

  it('missing key is placed at the nearest existing ancestor (its key)', async () => {
    const file = minimalVariant('  relax-after-runs: 2\n', '');
    expect(await problemsOf(file)).toEqual([
      `${displayPath(file)}:54:1: missing key "relax-after-runs" — add relax-after-runs: Runs in a row below the issued stage before it is lowered (1 = at once).`,
    ]);
  });

  it('a literal password is refused without echoing it', async () => {
    const file = minimalVariant(
      '  smtp: null',
      '  smtp: { host: mail.team.example, port: 587, security: starttls, password: hunter2-secret }',
    );
    const problems = await problemsOf(file);
    expect(problems).toEqual([
      `${displayPath(file)}:65:67: a secret must not be written in the configuration ("password") — put the password in an environment variable and name it in password-env`,
    ]);
    expect(problems.join('\n')).not.toContain('hunter2');
  });

  it('a password written as password-env is refused without echoing it', async () => {
    const file = minimalVariant(
      '  smtp: null',
      '  smtp: { host: mail.team.example, port: 587, security: starttls, password-env: "hunter2 secret!" }',
    );
    const problems = await problemsOf(file);
    expect(problems).toEqual([
      `${displayPath(file)}:65:81: password-env must be the NAME of an environment variable, not the password — NAME of the environment variable that holds the password (never the password itself).`,
    ]);
    expect(problems.join('\n')).not.toContain('hunter2');
  });

  it('password-env is accepted and reaches Config as passwordEnv', async () => {
    const file = minimalVariant(
      '  smtp: null',
      '  smtp: { host: mail.team.example, port: 587, security: starttls, user: fl, password-env: FL_SMTP_PASSWORD }',
    );
    const config = await loadConfig(file);
    expect(config.delivery.smtp).toEqual({
      host: 'mail.team.example',
      port: 587,
      security: 'starttls',
      user: 'fl',
      passwordEnv: 'FL_SMTP_PASSWORD',
      timeoutSeconds: 30,
    });
  });

  it('a rule on the lowest stage, a rule above its tier cap and the removed ROC-area skill gate are refused', async () => {
    const file = minimalVariant('  tier-caps: {}\n', '  tier-caps: { weeks: calm }\n');
    expect(await problemsOf(file)).toEqual([
      `${displayPath(file)}:53:73: rule raises alert but tier weeks is capped at calm — lower the rule's stage to calm or raise the cap in escalation.tier-caps`,
    ]);
    const low = minimalVariant('stage: alert, probability: 0.6', 'stage: calm, probability: 0.6');
    expect(await problemsOf(low)).toEqual([
      `${displayPath(low)}:53:73: rule raises the lowest stage "calm", which is never raised — name a higher stage or delete the rule`,
    ]);
    // The ROC-area gate was removed (ROC area measures discrimination, not improvement over a normal year).
    const roc = minimalVariant('skill-gate: { action: say-no-skill }', 'skill-gate: { score: roc-area, floor: 0.6, action: say-no-skill }');
    expect(await problemsOf(roc)).toEqual([
      `${displayPath(roc)}:60:17: unknown key "score" — remove it or fix the spelling; allowed here: floor, min-events, pool-leads, resamples, seed, action`,
    ]);
  });

  it('problems inside an included file name that file and line', async () => {
    expect(await problemsOf(fixture('with-includes.yaml'))).toEqual([
      'test/config/fixtures/bad-regions.yaml:11:11: unknown team "nobody" — use one of: north-team',
    ]);
  });

  it('a missing included file is reported at the include key', async () => {
    const text = readFileSync(fixture('with-includes.yaml'), 'utf8')
      .replace('regions: bad-regions.yaml', 'regions: nowhere.yaml')
      .replace('teams: teams.yaml', `teams: ${fixture('teams.yaml')}`);
    const file = writeTemp('missing-include.yaml', text);
    const problems = await problemsOf(file);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(
      /^.*missing-include\.yaml:11:12: cannot read .*nowhere\.yaml \(ENOENT\) — check the path \(relative to the including file\)$/,
    );
  });

  it('YAML syntax errors and custom tags are reported with their position', async () => {
    const bad = minimalVariant('country: Testland', 'country: [Testland');
    expect((await problemsOf(bad))[0]).toMatch(new RegExp(`^${displayPath(bad)}:\\d+:\\d+: YAML syntax: `));
    const tagged = minimalVariant('country: Testland', 'country: !!js/function "return 1"');
    expect(await problemsOf(tagged)).toEqual([
      `${displayPath(tagged)}:2:10: custom YAML tags are not allowed (Unresolved tag: tag:yaml.org,2002:js/function) — write plain values without tags`,
    ]);
  });
});

describe('resolution', () => {
  it('converts temperature thresholds to degC (95 degF = 35 degC, 308.15 K = 35 degC)', async () => {
    const f = await loadConfig(minimalVariant('{ value: 35, units: degC }', '{ value: 95, units: degF }'));
    expect(f.indicators[0].threshold).toEqual({ kind: 'absolute', value: 35, units: 'degC' });
    const k = await loadConfig(minimalVariant('{ value: 35, units: degC }', '{ value: 308.15, units: K }'));
    expect(k.indicators[0].threshold.kind === 'absolute' && k.indicators[0].threshold.value).toBeCloseTo(35, 10);
  });

  it('duplicate keys are a YAML error at the second key', async () => {
    const file = minimalVariant('country: Testland', 'country: Testland\ncountry: Otherland');
    expect(await problemsOf(file)).toEqual([
      `${displayPath(file)}:3:1: YAML syntax: Map keys must be unique — fix the YAML at this position`,
    ]);
  });

  it('regions both inline and included is an error at the include', async () => {
    const file = minimalVariant('country: Testland', `country: Testland\ninclude:\n  regions: ${fixture('bad-regions.yaml')}`);
    expect(await problemsOf(file)).toEqual([
      `${displayPath(file)}:4:12: regions are given both inline and in an included file — keep one: delete the inline regions: or this include`,
    ]);
  });
});

describe('bounded parsing', () => {
  it('refuses an alias bomb', async () => {
    const problems = await problemsOf(fixture('alias-bomb.yaml'));
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(
      /^test\/config\/fixtures\/alias-bomb\.yaml:1:1: YAML aliases expand too much \(.*limit 100\) — write the values out instead of nesting \*aliases$/,
    );
  });

  it('refuses a file over the size limit before reading it', async () => {
    const file = writeTemp('huge.yaml', Buffer.alloc(MAX_CONFIG_BYTES + 1, 0x20));
    expect(await problemsOf(file)).toEqual([
      `${displayPath(file)}:1:1: ${displayPath(file)} is ${MAX_CONFIG_BYTES + 1} bytes, over the ${MAX_CONFIG_BYTES}-byte limit for configuration files — remove the bulk or split regions and teams into included files`,
    ]);
  });

  it('loadConfig throws ConfigError carrying every problem', async () => {
    const err = await loadConfig(fixture('many-problems.yaml')).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ConfigError);
    expect((err as ConfigError).diagnostics.length).toBe(27);
  });
});
