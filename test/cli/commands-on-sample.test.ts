/**
 * The operators' inspection commands on the invented Veloria sample, as a user runs them (child processes, the
 * shipped configuration): skill table, dry-run diff, explain, backtest. The sample is generated into
 * sample-inputs/data when missing (as `forelight demo` does); nothing is stored or sent by these commands.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { generateSample } from '../../src/sample/generate.ts';
import { EXIT } from '../../src/core/exit-codes.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const DATE = ['--date', '2026-11-26'];

function forelight(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), ...args], {
    cwd: ROOT,
    encoding: 'utf8',
    timeout: 120_000,
    env: { ...process.env, FORELIGHT_LOG_LEVEL: 'error' },
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

beforeAll(async () => {
  if (!existsSync(join(ROOT, 'sample-inputs/data/manifest.json'))) await generateSample();
}, 120_000);

describe('inspection commands on the sample', () => {
  it('skill --csv: one row per source, region, indicator and lead with BS, BSS and ROC area (RFC 4180 CSV)', () => {
    const r = forelight('skill', '--csv', ...DATE);
    expect(r.code).toBe(EXIT.ok);
    const lines = r.stdout.trim().split('\r\n');
    expect(lines[0]).toBe(
      'source,region,indicator,lead,basis,years,events,BS,BSS,BSS 90%,fair BSS,ROC area,ROC 90%,REL,RES,gate window,gate events,gate low,skilful',
    );
    expect(
      lines.some((l) => /^subseasonal,kessan-lowlands,tmax-3day,week 2,observed,20,\d+,[-0-9.]+,[-0-9.]+,[-0-9.]+\.\.[-0-9.]+,/.test(l)),
    ).toBe(true);
    // A row is skilful only where its gate window's lower bound is above 0 with at least 5 events.
    for (const l of lines.slice(1)) {
      const f = l.split(',');
      if (f[18] === 'yes') expect(f[4] === 'observed' && Number(f[16]) >= 5 && Number(f[17]) > 0).toBe(true);
    }
    // Not a terminal: progress as one JSON object per line (src/cli/progress.ts); the last says all 4 steps are done.
    const progress = r.stderr
      .split('\n')
      .filter((l) => l.includes('"stage":"skill"'))
      .map((l) => JSON.parse(l) as Record<string, unknown>);
    expect(progress.at(-1)).toMatchObject({ run: null, issueDate: DATE[1], stage: 'skill', done: 4, total: 4, label: 'done' });
  });

  it('skill --region/--indicator filters rows; an unknown id is refused naming the configured ones; text has the legend', () => {
    const r = forelight('skill', '--region', 'orrin-coast', '--indicator', 'heat-index', ...DATE);
    expect(r.code).toBe(EXIT.ok);
    const rows = r.stdout.split('\n').filter((l) => /^(short|subseasonal|seasonal) /.test(l));
    expect(rows.length).toBeGreaterThan(0);
    for (const l of rows) expect(l).toMatch(/^\S+ +orrin-coast +heat-index /);
    expect(r.stdout).toContain('gate low = lower end of the 90 % interval');
    const bad = forelight('skill', '--region', 'atlantis', ...DATE);
    expect(bad.code).not.toBe(EXIT.ok);
    expect(bad.stderr).toContain("--region 'atlantis' is not a configured region; use one of: kessan-lowlands");
  });

  it('skill --detail: value curve in sample and leave-one-year-out with its 90 % interval; the cost/loss trigger judged out of sample', () => {
    const r = forelight('skill', '--detail', '--region', 'kessan-lowlands', '--indicator', 'heat-index', ...DATE);
    expect(r.code).toBe(EXIT.ok);
    expect(r.stdout).toContain(
      'value-loyo (x = cost/loss ratio; a = value with each year judged by the threshold chosen on the other years',
    );
    const loyo = r.stdout.split('\n').filter((l) => /^short +kessan-lowlands +heat-index +day 1 +value-loyo /.test(l));
    expect(loyo.length).toBe(19); // cost/loss 0.05 .. 0.95
    for (const l of loyo) {
      const [a, low, high] = l.trim().split(/ +/).slice(7, 10).map(Number);
      if (Number.isFinite(a) && Number.isFinite(low)) expect(low <= a + 1e-9 && a <= high + 1e-9).toBe(true);
    }
    // The shipped cost/loss rule (0.2) on the days tier: k of 10 hindcast members, the forecast's fraction, the value
    // judged year by year with its interval beside the optimistic in-sample one.
    expect(r.stdout).toMatch(
      /heat-index-days-mindful · short · kessan-lowlands · heat-index: warn when at least \d+ of \d+ hindcast members exceed \(a forecast: member fraction >= 0\.\d{3}\); value judged year by year on thresholds chosen on the other years -?\d\.\d\d \(90 % interval -?\d\.\d\d to -?\d\.\d\d\), in sample -?\d\.\d\d; observed, leads 1–7, 20 years, \d+ events/,
    );
  });

  it('diff: the region stages a run would issue, nothing stored (dry run)', () => {
    const r = forelight('diff', ...DATE);
    expect(r.code).toBe(EXIT.ok);
    expect(r.stdout).toMatch(/^dry run for 2026-11-26 \(nothing stored or sent\)/);
    for (const name of ['Kessan Lowlands', 'Marrow Highlands', 'Tulva Delta', 'Orrin Coast']) expect(r.stdout).toContain(name);
  });

  it('explain: threshold and its origin, probability with base rate and skill per lead, the rule, persistence, stage', () => {
    const r = forelight('explain', '--region', 'tulva-delta', '--indicator', 'heat-index', '--tier', 'days', ...DATE);
    expect(r.code).toBe(EXIT.ok);
    expect(r.stdout).toMatch(/^Tulva Delta · Heat Index \(Rothfusz regression\) · days$/m);
    expect(r.stdout).toMatch(/^threshold: .*absolute 39 degC/m);
    expect(r.stdout).toMatch(
      /^day 1 \(2026-11-26\.\.2026-11-26\): values min .* P\(> threshold\) = .* base rate .* skill BSS .* fair BSS .* events in \d+ years\); gate days 1–7: /m,
    );
    expect(r.stdout).toMatch(/^persistence before this run: /m);
    expect(r.stdout).toMatch(/issued stage/);
  });

  it('backtest --csv: stage counts with hits, misses and false alarms per region, indicator and tier', () => {
    const r = forelight('backtest', '--csv', ...DATE);
    expect(r.code).toBe(EXIT.ok);
    const [head, ...rows] = r.stdout.trim().split(/\r?\n/);
    expect(head).toBe('region,indicator,tier,cases,quiet,mindful,brace,act-now,hits,misses,false_alarms,correct_negatives,unverified');
    expect(rows.length).toBeGreaterThan(10);
  });

  it('explain with an unknown region is a usage error naming the valid ids', () => {
    const r = forelight('explain', '--region', 'nowhere', '--indicator', 'heat-index', '--tier', 'days', ...DATE);
    expect(r.code).toBe(EXIT.usage);
    expect(r.stderr).toMatch(/--region must be one of kessan-lowlands, marrow-highlands, tulva-delta, orrin-coast/);
  });
});
