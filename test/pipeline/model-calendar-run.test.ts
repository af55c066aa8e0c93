/**
 * A whole run (runOnce, as `forelight run` calls it) on the Veloria sample whose seasonal source is a 360_day model:
 * the seasonal forecast and its 20 hindcasts get `calendar = "360_day"` from NCO (`ncatted`), so the same hours
 * since the reference are model time (CF 1.11 §4.4.1). Checks (src/read/DECISIONS.md §3): the run issues without
 * contradictions; run.json notes state the placement rule for the file; every seasonal month lead is a model month
 * of 30 days shown by its real dates (model December 2026 to April 2027, the 5 whole model months of 184 days
 * from 26 November), calibrated on hindcasts of the same model months; malaria suitability's month leads too.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import type { RunOutcome } from '../../src/pipeline/run-once.ts';
import { generateSample } from '../../src/sample/generate.ts';
import { exerciseRun, onSample, outputsIn } from '../support/sample-run-config.ts';

const ISSUE = '2026-11-26';
const DAY_MS = 86_400_000;
const dir = mkdtempSync(join(tmpdir(), 'forelight-360-run-'));

/**
 * Model months December 2026 to April 2027 and the real date of each one's first day by the elapsed-time rule,
 * computed with cftime (python3-netCDF4): 26 November 2026 plus the 360_day time from 26 November to day 1.
 */
function cftimeMonthStarts(): [string, string][] {
  const script = [
    'import cftime, datetime, json',
    'a = cftime.Datetime360Day(2026, 11, 26)',
    'ms = [(2026, 12)] + [(2027, m) for m in range(1, 5)]',
    "print(json.dumps([[f'{y}-{m:02d}', (datetime.datetime(2026, 11, 26) + (cftime.Datetime360Day(y, m, 1) - a)).strftime('%Y-%m-%d')] for y, m in ms]))",
  ].join('\n');
  return JSON.parse(execFileSync('/usr/bin/python3', ['-c', script], { encoding: 'utf8' }));
}

interface Probability {
  source: string;
  indicator: string;
  lead: { tier: string; index: number; start: string; end: string; modelMonth?: string };
  calibrated: boolean;
}
let config: Config;
let outcome: RunOutcome;
let runJson: { notes: string[]; regions: { id: string; tiers: { probabilities: Probability[] }[] }[] };

beforeAll(async () => {
  const data = join(dir, 'data');
  await generateSample(data);
  const seasonal = join(data, 'seasonal');
  const files = [
    ...readdirSync(seasonal)
      .filter((f) => f.endsWith('.nc'))
      .map((f) => join(seasonal, f)),
    ...readdirSync(join(seasonal, 'hindcast')).map((f) => join(seasonal, 'hindcast', f)),
  ];
  expect(files).toHaveLength(21);
  for (const f of files)
    execFileSync('ncatted', ['-O', '-a', 'calendar,time,o,c,360_day', '-a', 'calendar,forecast_reference_time,o,c,360_day', f]);
  const base = await loadConfig();
  config = outputsIn(onSample(base, data), dir);
  ({ outcome, runJson } = await exerciseRun<typeof runJson>(config, ISSUE));
}, 600_000);

describe('a run whose seasonal model runs in the 360_day calendar', () => {
  it('issues without contradictions, and run.json states how the 360_day times were placed', () => {
    expect([0, 3]).toContain(outcome.exitCode);
    expect(outcome.contradictions ?? []).toEqual([]);
    expect(runJson.notes).toContainEqual(
      expect.stringMatching(
        /seas_20261126\.nc: times in the 360_day calendar are placed on real dates by elapsed time from 2026-11-26 \(model\) = 2026-11-26 \(real\), so lead days, weeks and months are the model's/,
      ),
    );
  });

  it('every seasonal month lead is a 30-day model month, calibrated on hindcasts of the same model month', () => {
    const leads = runJson.regions.flatMap((r) => r.tiers.flatMap((t) => t.probabilities)).filter((p) => p.source === 'seasonal');
    expect(leads.length).toBeGreaterThan(0);
    const indicators = new Set(leads.map((p) => p.indicator));
    expect(indicators.has('malaria-pf')).toBe(true);
    for (const p of leads) {
      expect(p.lead.tier).toBe('months');
      expect((Date.parse(p.lead.end) - Date.parse(p.lead.start)) / DAY_MS + 1).toBe(30);
      expect(p.calibrated).toBe(true);
    }
    const tmax = leads.filter((p) => p.indicator === 'tmax-3day');
    const byIndex = new Map(tmax.map((p) => [p.lead.index, p.lead]));
    expect([...byIndex.values()].sort((a, b) => a.index - b.index).map((l) => [l.modelMonth, l.start])).toEqual(cftimeMonthStarts());
  });
});
