/**
 * Hindcasts with every start in one file along a reference-time dimension (CF 1.11 §4.4 forecast_reference_time
 * as the coordinate of a dimension), read natively as one hindcast start per index, exactly as the per-start files
 * `ncks -d <dim>,K,K` cuts from it. Two layouts, both common practice of hindcast portals (no source):
 * cfgrib's `(number, time, step, latitude, longitude)` written by python3-xarray (step in hours, 6-hourly), and
 * `(lead, init, member, lat, lon)` stacked by NCO (`ncecat -u init`, `ncap2`, `ncpdq`) from per-start files
 * python3-xarray wrote (lead in days, daily means with bounds, CF 1.11 §7.1). Daily and weekly box means per start
 * are compared with numpy (multi_start_layouts.py) within 1e-4 K.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkConfigFile } from '../../src/config/load-config.ts';
import type { Config, SourceConfig } from '../../src/config/types.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import type { ForelightError } from '../../src/core/errors.ts';
import { jobId } from '../../src/cluster/coordinator.ts';
import { fromWire, toWire, type ExtractJob } from '../../src/cluster/wire.ts';
import { listHindcasts } from '../../src/pipeline/hindcast-list.ts';
import { hindcastsFor } from '../../src/pipeline/inputs.ts';
import { hindcastPatternProblems } from '../../src/pipeline/pattern-check.ts';
import { eachStart, readStart, startRequest } from '../../src/pipeline/hindcast-starts.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import type { HindcastRead } from '../../src/types.ts';

const SCRIPT = join(import.meta.dirname, 'multi_start_layouts.py');
const MINIMAL = join(import.meta.dirname, '../config/fixtures/minimal.yaml');
const STARTS = ['2010-11-23', '2011-11-23', '2012-11-23'];
const tmp = mkdtempSync(join(tmpdir(), 'forelight-multistart-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const run = (tool: string, ...args: string[]) => execFileSync(tool, args, { cwd: tmp, stdio: ['ignore', 'pipe', 'pipe'] }).toString();
const python = (...args: string[]) => run('/usr/bin/python3', SCRIPT, ...args);
/** numpy's daily box means of start K (row lat 1, lon -1..1: the centre-rule cells of region north below), K. */
const numpyDaily = (file: string, k: number) => JSON.parse(python('daily', file, String(k), '1', '-1', '1')) as number[][];

/** Days since 2000-01-01 of each start, for the `init` coordinate NCO writes. */
const daysSince2000 = STARTS.map((d) => (Date.parse(`${d}T00:00:00Z`) - Date.parse('2000-01-01T00:00:00Z')) / 86_400_000);

beforeAll(() => {
  mkdirSync(join(tmp, 'hc'), { recursive: true });
  python('cfgrib', 'hc/cfgrib.nc');
  python('parts', '.');
  run('ncecat', '-O', '-u', 'init', 'part_0.nc', 'part_1.nc', 'part_2.nc', 'stack.nc');
  const init = `init[$init]={${daysSince2000.map((d) => d.toFixed(1)).join(',')}};init@standard_name="forecast_reference_time";init@units="days since 2000-01-01 00:00:00";init@calendar="standard"`;
  run('ncap2', '-O', '-s', init, 'stack.nc', 'stack.nc');
  run('ncks', '-O', '-x', '-v', 'forecast_reference_time', 'stack.nc', 'stack.nc');
  run('ncatted', '-O', '-a', 'coordinates,,d,,', 'stack.nc');
  run('ncpdq', '-O', '-a', 'lead,init,member', 'stack.nc', 'hc/init.nc'); // any dimension order
}, 120_000);

let configs = 0;
/** minimal.yaml with `hindcast-files` and one centre-rule region over latitude row 1, lon -0.5 and 0.5 (equal weights). */
async function configWith(hindcast: string, variables = '{ tmean: t2m }'): Promise<Config> {
  const dir = join(tmp, `c${++configs}`);
  mkdirSync(dir, { recursive: true });
  const text = readFileSync(MINIMAL, 'utf8')
    .replace('forecast-files: data/w_{date}.nc', `forecast-files: data/w_{date}.nc\n    hindcast-files: ${hindcast}`)
    .replace('variables: { tmax: tasmax, dewpoint: tdps }', `variables: ${variables}`)
    .replace('kind: heat-index', 'kind: tmean-mean')
    .replace('box: { south: 1, north: 2, west: -1, east: 1 }', 'box: { south: 0.5, north: 1.5, west: -1, east: 1 }\n    cell-rule: centre');
  writeFileSync(join(dir, 'forelight.yaml'), text);
  const { config, diagnostics } = await checkConfigFile(join(dir, 'forelight.yaml'));
  expect(diagnostics.map(formatDiagnostic)).toEqual([]);
  return config as Config;
}

async function readAllStarts(source: SourceConfig, config: Config) {
  const starts = await listHindcasts(source);
  const problems: ForelightError[] = [];
  const one = { ...config, regions: config.regions.slice(0, 1) };
  const read = await eachStart(
    starts,
    1,
    async (h) => {
      const own: ForelightError[] = [];
      return { value: await readStart(extractRegionSeries, startRequest(one, source, h, new Map()), own), problems: own };
    },
    problems,
  );
  return { starts, read, problems: problems.map((p) => p.message) };
}

/** Forelight's daily tmean (degC) of member m of one start, back in K. */
const dailyK = (h: HindcastRead, m: number): number[] => {
  const s = h.series.get('north')!.get('tmean')!;
  return Array.from(s.data.subarray(m * s.days.length, (m + 1) * s.days.length), (v) => v + 273.15);
};
const weekly = (days: readonly number[]) => [0, 7].map((w) => days.slice(w, w + 7).reduce((a, b) => a + b, 0) / 7);

describe.each([
  { layout: 'cfgrib (number, time, step) with time = forecast_reference_time, step in hours', file: 'hc/cfgrib.nc', dim: 'time' },
  { layout: '(lead, init, member) stacked by NCO, lead in days', file: 'hc/init.nc', dim: 'init' },
])('one file of 3 starts: $layout', ({ file, dim }) => {
  it('each start is one hindcast start; daily and weekly box means per start equal numpy within 1e-4 K', async () => {
    const config = await configWith(join(tmp, file));
    expect((await hindcastPatternProblems(config, undefined)).map(formatDiagnostic)).toEqual([]);
    const { starts, read, problems } = await readAllStarts(config.sources[0], config);
    expect(problems).toEqual([]);
    expect(starts.map((h) => [h.start, h.startIndex])).toEqual(STARTS.map((s, k) => [s, k]));
    expect(read.map((h) => h.start)).toEqual(STARTS);
    for (const [k, h] of read.entries()) {
      const s = h.series.get('north')!.get('tmean')!;
      expect(s.members).toBe(2);
      expect(s.cells).toBe(2);
      expect(s.days.slice(0, 2)).toEqual([STARTS[k], STARTS[k].replace('-23', '-24')]);
      expect(s.days).toHaveLength(14);
      expect(s.provenance.referenceTime).toBe(`${STARTS[k]}T00:00:00Z`);
      const expected = numpyDaily(join(tmp, file), k);
      for (let m = 0; m < 2; m++) {
        const got = dailyK(h, m);
        got.forEach((v, d) => expect(Math.abs(v - expected[m][d]), `start ${k} member ${m} day ${d}`).toBeLessThanOrEqual(1e-4));
        weekly(got).forEach((v, w) => expect(Math.abs(v - weekly(expected[m])[w])).toBeLessThanOrEqual(1e-4));
      }
    }
  });

  it('reads exactly as the per-start files ncks cuts from it', async () => {
    const config = await configWith(join(tmp, file));
    const { read } = await readAllStarts(config.sources[0], config);
    const stem = file.replace('.nc', '');
    STARTS.forEach((s, k) => run('ncks', '-O', '-d', `${dim},${k},${k}`, file, `${stem}_${s.replaceAll('-', '')}.nc`));
    const split = await configWith(join(tmp, `${stem}_{date}.nc`));
    const perStart = await readAllStarts(split.sources[0], split);
    expect(perStart.problems).toEqual([]);
    expect(perStart.starts.every((h) => h.startIndex === undefined)).toBe(true);
    perStart.read.forEach((h, k) => {
      const a = h.series.get('north')!.get('tmean')!;
      const b = read[k].series.get('north')!.get('tmean')!;
      expect([...b.data]).toEqual([...a.data]);
      expect(b.days).toEqual(a.days);
    });
  });

  it('the start index travels in the cluster job: the key differs per start and a worker reads the same slice', async () => {
    const config = await configWith(join(tmp, file));
    const [first, second] = await listHindcasts(config.sources[0]);
    const job = (startIndex: number | undefined): ExtractJob => ({
      path: first.path,
      request: {
        quantities: { tmean: 't2m' },
        regions: config.regions.slice(0, 1),
        referenceTime: STARTS[1],
        ...(startIndex !== undefined ? { startIndex } : {}),
      },
    });
    expect(jobId('sum', job(second.startIndex).request)).not.toBe(jobId('sum', job(first.startIndex).request));
    const wired = JSON.parse(JSON.stringify(job(second.startIndex))) as ExtractJob;
    expect(wired.request.startIndex).toBe(1);
    const worker = fromWire(JSON.parse(JSON.stringify(toWire(await extractRegionSeries(wired.path, wired.request)))));
    const local = (await readAllStarts(config.sources[0], config)).read[1].series.get('north')!.get('tmean')!;
    expect([...worker.series[0].data]).toEqual([...local.data]);
    // Without the index the file is refused as several starts (a forecast file must hold one).
    await expect(extractRegionSeries(wired.path, job(undefined).request)).rejects.toThrow(/holds 3 forecast reference times/);
  });
});

describe('{year} without {mmdd}: the start is the reference time inside the file', () => {
  it('each year file gives its own start; one outside the forecast start window, or in another year, is one line naming it', async () => {
    mkdirSync(join(tmp, 'hc/y'), { recursive: true });
    STARTS.forEach((s, k) => run('ncks', '-O', '-d', `time,${k},${k}`, 'hc/cfgrib.nc', `hc/y/t2m_${s.slice(0, 4)}.nc`));
    const config = await configWith(join(tmp, 'hc/y/t2m_{year}.nc'));
    expect((await hindcastPatternProblems(config, undefined)).map(formatDiagnostic)).toEqual([]);
    const source = config.sources[0];
    const used = await hindcastsFor(config, source, '2026-11-26');
    expect(used.map((h) => [h.start, h.refused])).toEqual(STARTS.map((s) => [s, undefined])); // not 1 January
    const { read, problems } = await readAllStarts(source, config);
    expect(problems).toEqual([]);
    expect(read.map((h) => h.series.get('north')!.get('tmean')!.provenance.referenceTime)).toEqual(STARTS.map((s) => `${s}T00:00:00Z`));

    const june = await hindcastsFor(config, source, '2026-06-01');
    expect(june.map((h) => h.refused?.message)).toEqual([
      `${join(tmp, 'hc/y/t2m_2010.nc')}: starts on 2010-11-23 (its forecast reference time), outside the calibration window of ±15 days around the forecast's 06-01, as do 2 other hindcast file(s) of source 'weekly': they do not calibrate this forecast — point hindcast-files at the hindcasts started near the forecast's day of year (or widen calibration.window-days)`,
    ]);

    run('cp', 'hc/y/t2m_2011.nc', 'hc/y/t2m_2013.nc');
    const all = await listHindcasts(source);
    const wrong = all.filter((h) => h.refused);
    expect(wrong.map((h) => formatDiagnostic(h.refused!.diagnostic))).toEqual([
      `${join(tmp, 'hc/y/t2m_2013.nc')}: its forecast reference time 2011-11-23T00:00:00Z is not in 2013, the year its path gives — rename the file or correct hindcast-files: with {year} and no {mmdd} the start is the reference time inside the file`,
    ]);
  });
});

describe('truncated or contradictory files of several starts: one line naming file, variable, what to do', () => {
  const lines = async (file: string, variables?: string) => {
    const config = await configWith(join(tmp, file), variables);
    return (await readAllStarts(config.sources[0], config)).problems;
  };

  it('a data variable without the starts dimension', async () => {
    run('ncap2', '-O', '-s', 'flat=t2m(:,0,:,:,:)', 'hc/init.nc', 'hc/flat.nc'); // ncap2 drops the degenerate init
    const got = await lines('hc/flat.nc', '{ tmean: flat }');
    expect(got).toEqual([
      `${join(tmp, 'hc/flat.nc')}: variable 'flat' (lead, member, lat, lon) lacks the dimension 'init' of the file's forecast starts — give 'flat' one slice per start along 'init' (e.g. rewrite the file with ncecat -u init over the per-start files), or provide one file per start named with {date}`,
    ]); // every start refused, said once
  });

  it('a reference time that is a fill value, or two starts on one day', async () => {
    run('cp', 'hc/init.nc', 'hc/fill.nc');
    run('ncatted', '-O', '-a', `_FillValue,init,o,d,${daysSince2000[1].toFixed(1)}`, 'hc/fill.nc');
    expect(await lines('hc/fill.nc')).toEqual([
      `${join(tmp, 'hc/fill.nc')}: time variable 'init': time value NaN at index 1 cannot be decoded with units 'days since 2000-01-01 00:00:00' — mask missing times before decoding`,
    ]);
    run('ncap2', '-O', '-s', 'init(2)=init(1)', 'hc/init.nc', 'hc/twice.nc');
    expect(await lines('hc/twice.nc')).toEqual([
      `${join(tmp, 'hc/twice.nc')}: its forecast reference times 1 and 2 fall on the same day 2011-11-23 — replace the file (a damaged or truncated download), or provide one file per start named with {date}`,
    ]);
  });

  it('a file that changed after it was listed: the start index is no longer there', async () => {
    const request = (startIndex: number) => ({ quantities: { tmean: 't2m' }, regions: [], startIndex });
    await expect(extractRegionSeries(join(tmp, 'hc/init.nc'), request(3))).rejects.toThrow(
      `${join(tmp, 'hc/init.nc')}: start 3 was listed, but 'init' holds only 3 starts — the file changed after it was listed (a truncated or replaced download): run again once the download has finished`,
    );
    run('ncks', '-O', '-d', 'init,0,0', 'hc/init.nc', 'hc/one.nc');
    await expect(extractRegionSeries(join(tmp, 'hc/one.nc'), request(1))).rejects.toThrow(
      `${join(tmp, 'hc/one.nc')}: start 1 was listed in this file, but it no longer holds several forecast reference times`,
    );
  });

  it('a truncated download', async () => {
    run('cp', 'hc/init.nc', 'hc/cut.nc');
    run('truncate', '-s', '20000', 'hc/cut.nc');
    const got = await lines('hc/cut.nc');
    expect(got).toHaveLength(1);
    expect(got[0]).toContain(join(tmp, 'hc/cut.nc'));
  });
});
