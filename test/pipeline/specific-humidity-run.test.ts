/**
 * A whole run (runOnce, as `forelight run` calls it, on a YAML copy of the sample configuration) whose short-range
 * source delivers humidity as 2 m specific humidity with surface pressure instead of a dewpoint: every short file,
 * forecasts and hindcasts, rewritten by python3-netCDF4 and NCO (test/pipeline/specific_humidity_run.py: q from the
 * sample's dewpoint and an invented terrain pressure, then `ncks -x -v tdps`). Checks: the run issues; run.json names
 * the derivation; the dewpoint and the NWS Heat Index (WPC "The Heat Index Equation": Rothfusz 1990 with the NWS
 * adjustments, capped at the chart's 137 °F) that numpy computes from the region means the run reads, with
 * e = q p / (ε + (1 − ε) q) (WMO-No. 8 Annex 4.B) and the inverse Magnus form (Alduchov & Eskridge 1996), equal
 * Forelight's heat index within 1e-4 °C; and every heat-index probability of the short source in run.json is
 * numpy's share of members above the threshold run.json states.
 */
import { cpSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { regionIndicator } from '../../src/calibrate/region-indicator.ts';
import { loadConfig } from '../../src/config/load-config.ts';
import { readRegions } from '../../src/config/region-views.ts';
import type { Config } from '../../src/config/types.ts';
import { readFile } from '../../src/pipeline/read-file.ts';
import type { RunOutcome } from '../../src/pipeline/run-once.ts';
import { exerciseRun } from '../support/sample-run-config.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import { generateSample } from '../../src/sample/generate.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const SCRIPT = join(import.meta.dirname, 'specific_humidity_run.py');
const ISSUE = '2026-11-26';
const dir = mkdtempSync(join(tmpdir(), 'forelight-q-run-'));
const SHORT_VARIABLES = '{ tmax: tasmax, tmin: tasmin, dewpoint: tdps, precip: pr }';

let config: Config;
let outcome: RunOutcome;
let runJson: {
  notes: string[];
  regions: { id: string; tiers: { indicator: { id: string }; probabilities: Probability[] }[] }[];
};
interface Probability {
  source: string;
  lead: { tier: string; index: number; start: string };
  probability: number | null;
  validMembers: number;
  threshold: { value: number };
}

beforeAll(async () => {
  const data = join(dir, 'sample-inputs', 'data');
  await generateSample(data);
  const short = join(data, 'short');
  const files = [
    ...readdirSync(short)
      .filter((f) => f.endsWith('.nc'))
      .map((f) => join(short, f)),
    ...readdirSync(join(short, 'hindcast')).map((f) => join(short, 'hindcast', f)),
  ];
  execFileSync('/usr/bin/python3', [SCRIPT, 'convert', ...files]);
  cpSync(join(ROOT, 'config'), join(dir, 'config'), { recursive: true });
  const yaml = readFileSync(join(dir, 'config', 'forelight.yaml'), 'utf8');
  expect(yaml.indexOf(SHORT_VARIABLES)).toBeGreaterThan(0); // the short source's line, the first of its kind
  const copy = yaml
    .replace(SHORT_VARIABLES, '{ tmax: tasmax, tmin: tasmin, specific-humidity: huss, surface-pressure: ps, precip: pr }')
    .replace('templates: ../templates', `templates: ${join(ROOT, 'templates')}`);
  writeFileSync(join(dir, 'config', 'forelight.yaml'), copy);
  config = await loadConfig(join(dir, 'config', 'forelight.yaml'));
  ({ outcome, runJson } = await exerciseRun<typeof runJson>(config, ISSUE));
}, 600_000);

describe('a run whose humidity is specific humidity with surface pressure', () => {
  it('issues, and run.json names the dewpoint derivation for the short source', () => {
    expect([0, 3]).toContain(outcome.exitCode);
    expect(config.sources.find((s) => s.id === 'short')!.variables).toMatchObject({
      'specific-humidity': 'huss',
      'surface-pressure': 'ps',
    });
    expect(runJson.notes).toContainEqual(
      expect.stringMatching(
        /^source short: humidity from specific humidity 'huss' with surface pressure 'ps': dewpoint of the day's mean vapour pressure e = q p \/ \(ε \+ \(1 − ε\) q\), ε = 0\.62198 \(WMO-No\. 8, Annex 4\.B\), by the inverse Magnus form of Alduchov & Eskridge \(1996\)$/,
      ),
    );
  });

  it("the heat index from the region means the run reads equals numpy's, and so do run.json's probabilities", async () => {
    const source = config.sources.find((s) => s.id === 'short')!;
    const file = source.forecast[0].replace('{date}', ISSUE.replaceAll('-', ''));
    const series = (await readFile(extractRegionSeries, file, source.variables, readRegions(config), {}, []))!;
    const heat = config.indicators.find((i) => i.id === 'heat-index')!;
    let compared = 0;
    for (const region of config.regions) {
      const inputs = series.get(region.id)!;
      const [tmax, q, p] = ['tmax', 'specific-humidity', 'surface-pressure'].map((k) => inputs.get(k as 'tmax')!);
      expect([q.units, p.units]).toEqual(['kg/kg', 'hPa']);
      const rows = (s: typeof tmax) =>
        Array.from({ length: s.members }, (_, m) => Array.from(s.data.subarray(m * s.days.length, (m + 1) * s.days.length)));
      const want = JSON.parse(
        execFileSync('/usr/bin/python3', [SCRIPT, 'heat'], {
          input: JSON.stringify({ tmax: rows(tmax), q: rows(q), p: rows(p) }),
          encoding: 'utf8',
        }).replaceAll('NaN', 'null'),
      ) as { td: number[][]; hi: (number | null)[][] };
      expect(want.td.flat().every(Number.isFinite)).toBe(true);
      const got = regionIndicator(heat, inputs, region.id, {});
      const days = tmax.days.length;
      want.hi.forEach((row, m) =>
        row.forEach((v, d) => {
          const x = got.data[m * days + d];
          if (v === null) expect(x).toBeNaN();
          else expect(Math.abs(x - v)).toBeLessThanOrEqual(1e-4);
        }),
      );
      // run.json: lead day k of the short source is local day k; P = members above the stated threshold / valid.
      const probabilities = runJson.regions
        .find((r) => r.id === region.id)!
        .tiers.filter((t) => t.indicator.id === 'heat-index')
        .flatMap((t) => t.probabilities)
        .filter((pr) => pr.source === 'short' && pr.lead.tier === 'days' && pr.probability !== null);
      for (const pr of probabilities) {
        const d = tmax.days.indexOf(pr.lead.start);
        const values = want.hi.map((row) => row[d]).filter((v): v is number => v !== null);
        expect(pr.validMembers).toBe(values.length);
        expect(pr.probability).toBeCloseTo(values.filter((v) => v > pr.threshold.value).length / values.length, 12);
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(10);
  });
});
