/**
 * `forelight run` on the Veloria sample with the short-range hindcasts in one file of every start: the 20 per-start
 * files stacked by NCO along a reference-time dimension `start` (`ncrename`/`ncatted` make each file's time a lead
 * in hours and its forecast_reference_time absolute, `ncecat -u start` stacks them; CF 1.11 §4.4 forecast_period and
 * forecast_reference_time). The run must be the one the per-start files give: the same run.json probabilities,
 * decisions and problems (common practice of hindcast portals, no source; the hindcast holds 10 members, the
 * forecast 50).
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { listHindcasts } from '../../src/pipeline/hindcast-list.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { exerciseRun } from '../support/sample-run-config.ts';

const ISSUE = '2026-11-26';
const tmp = mkdtempSync(join(tmpdir(), 'forelight-multistart-run-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
const nco = (tool: string, ...args: string[]) => execFileSync(tool, args, { cwd: tmp, stdio: ['ignore', 'pipe', 'pipe'] });

/** Every per-start hindcast of `folder` as one file of all starts along `start` (see the module comment). */
function stackStarts(folder: string, out: string): void {
  const parts: string[] = [];
  for (const name of readdirSync(folder)
    .filter((f) => f.endsWith('.nc'))
    .sort()) {
    const year = name.slice(6, 10);
    const part = join(tmp, `lead_${year}.nc`);
    nco('ncrename', '-O', '-d', 'time,lead', '-v', 'time,lead', '-v', 'time_bnds,lead_bnds', join(folder, name), part);
    nco(
      'ncatted',
      '-O',
      '-a',
      'units,lead,o,c,hours',
      '-a',
      'standard_name,lead,o,c,forecast_period',
      '-a',
      'axis,lead,d,,',
      '-a',
      'calendar,lead,d,,',
      '-a',
      'bounds,lead,o,c,lead_bnds',
      part,
    );
    const hours = (Date.parse(`${year}-11-26T00:00:00Z`) - Date.parse('2000-01-01T00:00:00Z')) / 3_600_000;
    nco('ncap2', '-O', '-s', `forecast_reference_time=${hours}.0`, part, part);
    nco('ncatted', '-O', '-a', 'units,forecast_reference_time,o,c,hours since 2000-01-01 00:00:00', part);
    parts.push(part);
  }
  nco('ncecat', '-O', '-u', 'start', ...parts, out);
}

function isolated(base: Config, sampleDir: string, dir: string, shortHindcast?: string): Config {
  const move = (p: string) => p.replace(/.*sample-inputs\/data/, sampleDir);
  return {
    ...base,
    sources: base.sources.map((s) => ({
      ...s,
      forecast: s.forecast.map(move),
      hindcast: s.id === 'short' && shortHindcast ? shortHindcast : s.hindcast && move(s.hindcast),
    })),
    observations: base.observations && { ...base.observations, path: move(base.observations.path) },
    ledger: join(dir, 'ledger.sqlite'),
    delivery: { ...base.delivery, outbox: join(dir, 'outbox'), archive: join(dir, 'archive') },
    calibration: { ...base.calibration, cacheDir: join(dir, 'cache') },
  };
}

interface RunJson {
  regions: unknown[];
  problems: unknown[];
  capAlerts: { region: string; indicator: string; msgType: string; stageId: string }[];
}

async function runJsonOf(config: Config): Promise<RunJson> {
  return (await exerciseRun<RunJson>(config, ISSUE)).runJson;
}

describe('forelight run with the short-range hindcasts in one file of all starts', () => {
  let perStart: RunJson;
  let oneFile: RunJson;
  let all: string;
  let ledger: string;

  beforeAll(async () => {
    const sampleDir = join(tmp, 'data');
    await generateSample(sampleDir);
    all = join(tmp, 'hc', 'short_all_starts.nc');
    mkdirSync(join(tmp, 'hc'));
    stackStarts(join(sampleDir, 'short', 'hindcast'), all);
    const base = await loadConfig();
    perStart = await runJsonOf(isolated(base, sampleDir, join(tmp, 'a')));
    ledger = isolated(base, sampleDir, join(tmp, 'b'), all).ledger;
    oneFile = await runJsonOf(isolated(base, sampleDir, join(tmp, 'b'), all));
  }, 600_000);

  it('lists the 20 starts of the one file', async () => {
    const base = await loadConfig();
    const short = { ...base.sources.find((s) => s.id === 'short')!, hindcast: all };
    const starts = await listHindcasts(short);
    expect(starts.map((h) => h.start)).toEqual(Array.from({ length: 20 }, (_, k) => `${2006 + k}-11-26`));
    expect(starts.map((h) => h.startIndex)).toEqual(Array.from({ length: 20 }, (_, k) => k));
  });

  it('gives the run.json probabilities, decisions, problems and CAP alerts of the per-start files', () => {
    expect(perStart.regions.length).toBeGreaterThan(0);
    expect(JSON.stringify(perStart.regions)).toContain('"probability"');
    expect(oneFile.regions).toEqual(perStart.regions);
    expect(oneFile.problems).toEqual(perStart.problems);
    const db = new Database(ledger, { readonly: true });
    try {
      // One input, with its sha256 and first start (the audit trail names the file once, not once per start).
      const rows = db.prepare('SELECT source, reference_time, length(sha256) AS n FROM input_files WHERE path = ?').all(all);
      expect(rows).toEqual([{ source: 'short hindcast', reference_time: '2006-11-26T00:00:00Z', n: 64 }]);
    } finally {
      db.close();
    }
    expect(oneFile.capAlerts.map(({ region, indicator, msgType, stageId }) => [region, indicator, msgType, stageId])).toEqual(
      perStart.capAlerts.map(({ region, indicator, msgType, stageId }) => [region, indicator, msgType, stageId]),
    );
  });
});
