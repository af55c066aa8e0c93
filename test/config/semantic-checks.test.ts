/**
 * Every semantic check, with its exact message and 1-based line:column in fixtures/many-problems.yaml
 * (positions counted by hand in that file; the first column of a line is 1). All problems come at once.
 */
import { describe, expect, it } from 'vitest';
import { checkConfigFile } from '../../src/config/load-config.ts';
import { DIAGNOSTIC_CODES } from '../../src/core/diagnostic-codes.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { relative } from 'node:path';
import { fixture, minimalVariant } from './helpers.ts';

const F = 'test/config/fixtures/many-problems.yaml';
const EXPECTED: readonly [check: string, line: string][] = [
  [
    'unknown variable: heat index without humidity',
    `${F}:9:16: indicator hot (heat-index) needs dewpoint or rh or specific-humidity, which source weekly does not map — add dewpoint: <variable name in the file> under variables`,
  ],
  ['box south above north', `${F}:13:29: north 1 is not north of south 2 — swap south and north`],
  ['unknown team reference', `${F}:15:25: unknown team "west-team" — use one of: north-team, south-team`],
  [
    'polygon not closed',
    `${F}:18:39: polygon is not closed: last point [0, 1] differs from the first [0, 0] — repeat the first point at the end`,
  ],
  [
    'malformed e-mail address',
    `${F}:25:18: malformed e-mail address "north-at-team.example" — write it as name@domain, e.g. duty-officer@health.veloria.example`,
  ],
  [
    'threshold units incompatible with the indicator',
    `${F}:34:36: units "mm/day" do not fit indicator hot (heat-index) — use degC, K, degF`,
  ],
  ['unknown region reference', `${F}:36:7: unknown region "east" — use one of: north, south`],
  [
    'percentile outside (0,100)',
    `${F}:37:28: percentile must be strictly between 0 and 100, got 100 — use e.g. 90 for the 90th percentile, or an absolute { value, units } threshold`,
  ],
  [
    'indicator tier without a source',
    `${F}:39:20: no source has tier days — add a source with tier: days or remove days from this indicator's tiers`,
  ],
  ['stage without a label for a team locale', `${F}:42:12: stage calm has no label in fr (read by team south-team) — add fr: under label`],
  ['stage without actions', `${F}:46:14: stage calm has no actions — add actions: default: with a text per locale`],
  [
    'team-specific action without the team locale',
    `${F}:55:19: actions for team south-team have no text in fr, the team's locale — add fr: under actions: south-team:`,
  ],
  ['unknown team in actions', `${F}:56:7: unknown team "east-team" in actions — use default or a team id: north-team, south-team`],
  [
    'stage order (CAP severity decreasing up the ladder)',
    `${F}:57:22: CAP severity Minor is lower than Moderate of the lower stage calm — order stages lowest first and give higher stages an equal or higher severity`,
  ],
  [
    'non-monotonic rule probabilities',
    `${F}:67:89: rule hot-act raises act at P ≥ 0.5, not above rule hot-alert (alert) at P ≥ 0.6 on the same indicator, tier and leads — give the higher stage a higher probability than 0.6`,
  ],
  ['duplicate id', `${F}:68:11: duplicate rule id "hot-act" (also entry 2 of trigger-rules) — give each rule its own id`],
  ['unknown indicator reference', `${F}:68:31: unknown indicator "warm" — use one of: hot`],
  ['unknown stage reference', `${F}:68:57: unknown stage "alarm" — use one of: calm, alert, act`],
  ['probability outside 0..1', `${F}:68:77: probability expected 0–1, got 70 — write 0.7 (probabilities are fractions, not percent)`],
  [
    'both probability and cost-loss',
    `${F}:69:5: rule gives both probability and cost-loss — keep exactly one: probability (fixed) or cost-loss (tuned on the hindcasts)`,
  ],
  ['unknown stage in tier caps', `${F}:71:23: unknown stage "top" — use one of: calm, alert, act`],
  [
    'invalid cron expression (croner refuses it)',
    `${F}:78:19: "61 7 * * 1,4" is not a valid cron expression — use 5 fields (min hour day month weekday) or 6 with seconds first, e.g. "30 7 * * 1,4" for Monday and Thursday 07:30`,
  ],
  [
    'invalid IANA time zone',
    `${F}:78:45: unknown IANA time zone "Mars/Olympus" — use a zone name such as Etc/GMT-1 (fixed UTC+1) or Africa/Lagos`,
  ],
  [
    'team locale without cautions',
    `${F}:87:1: no cautions in fr (read by team south-team) — add fr: with the caution paragraphs in that language`,
  ],
  ['cautions empty', `${F}:88:7: cautions in en are empty — write at least one caution paragraph; bulletins never go out without cautions`],
  [
    'probability words missing a team locale',
    `${F}:91:5: probability band 2 has no word in fr (read by team south-team) — add fr: to this band`,
  ],
  [
    'probability word bands not ascending',
    `${F}:91:14: band bound 0.4 is not above the previous bound 0.5 — list bands lowest first with increasing bounds`,
  ],
];

describe('semantic checks on fixtures/many-problems.yaml', async () => {
  const result = await checkConfigFile(fixture('many-problems.yaml'));

  it('reports every problem at once, in reading order, and no config', () => {
    expect(result.config).toBeUndefined();
    expect(result.diagnostics.map(formatDiagnostic)).toEqual(EXPECTED.map(([, line]) => line));
  });

  it('each problem is data: a config code from the catalogue, the pointer, and the line and column the text shows', () => {
    for (const d of result.diagnostics) {
      expect(DIAGNOSTIC_CODES[d.code].stage).toBe('config');
      expect(d.severity).toBe('error');
      expect(d.place.pointer).toMatch(/^(\/|$)/);
      expect(formatDiagnostic(d).startsWith(`${d.place.file}:${d.place.line}:${d.place.column}: ${d.message} — `)).toBe(true);
    }
    expect(result.diagnostics[0]).toMatchObject({ code: 'config-indicator', place: { file: F, line: 9, column: 16 } });
  });

  it.each(EXPECTED)('%s', (_check, line) => {
    expect(result.diagnostics.map(formatDiagnostic)).toContain(line);
  });
});

describe('combination matrix (escalation.combine.matrix)', () => {
  it('unknown or doubled indicators and a table entry that would hide a warning: exact messages and positions', async () => {
    const file = minimalVariant(
      '  combine: highest',
      [
        '  combine:',
        '    matrix:',
        '      rows: [hot]',
        '      columns: [hot, cold]',
        '      table:',
        '        - [calm, alert]',
        '        - [calm, alert]',
      ].join('\n'),
    );
    const { config, diagnostics } = await checkConfigFile(file);
    const problems = diagnostics.map(formatDiagnostic);
    expect(config).toBeUndefined();
    const name = relative(process.cwd(), file).startsWith('..') ? file : relative(process.cwd(), file);
    expect(problems).toEqual([
      `${name}:62:17: indicator 'hot' is on both axes of the matrix — put each indicator in rows or in columns, not both`,
      `${name}:62:22: unknown indicator 'cold' — use one of: hot`,
      `${name}:65:12: 'calm' is lower than an input stage (row alert, column calm): the matrix would hide a warning — use alert or higher`,
    ]);
  });

  it('a well-formed matrix loads', async () => {
    const file = minimalVariant(
      '  combine: highest',
      [
        '  combine:',
        '    matrix:',
        '      rows: [hot]',
        '      columns: []',
        '      table:',
        '        - [calm, alert]',
        '        - [alert, alert]',
      ].join('\n'),
    );
    const { config, diagnostics } = await checkConfigFile(file);
    const problems = diagnostics.map(formatDiagnostic);
    expect(problems).toEqual([]);
    expect(config?.decision.combine).toEqual({
      matrix: {
        rows: ['hot'],
        columns: [],
        table: [
          ['calm', 'alert'],
          ['alert', 'alert'],
        ],
      },
    });
  });
});

describe('humidity as specific humidity with surface pressure (variables:)', () => {
  // Column 53 is the value q2m in `    variables: { tmax: tasmax, 'specific-humidity': q2m }`.
  it('specific-humidity without surface-pressure is refused at its line:column; with both it loads', async () => {
    const half = minimalVariant('dewpoint: tdps }', "'specific-humidity': q2m }");
    const { diagnostics } = await checkConfigFile(half);
    expect(diagnostics.map(formatDiagnostic)).toEqual([
      `${half}:9:53: source weekly maps specific-humidity but not surface-pressure: the dewpoint is derived from the two together — add surface-pressure: <variable name in the file> under variables (e.g. sp for surface pressure, q2m for 2 m specific humidity), or map dewpoint or rh instead`,
    ]);
    // The suggested fix, applied to that file, loads.
    const whole = minimalVariant('dewpoint: tdps }', "'specific-humidity': q2m, surface-pressure: sp }");
    const fixed = await checkConfigFile(whole);
    expect(fixed.diagnostics.map(formatDiagnostic)).toEqual([]);
    expect(fixed.config?.sources[0].variables).toEqual({ tmax: 'tasmax', 'specific-humidity': 'q2m', 'surface-pressure': 'sp' });
  });
});
