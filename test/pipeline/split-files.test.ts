/**
 * Forecasts split as portals deliver them (`forecast-files` with `{var}` and `{member}`, or a list of patterns):
 * one file per variable, per member, per member group. The files are cut by NCO (`ncpdq`, `ncrcat`, `ncap2`,
 * `ncks`, `ncwa`) from the ncgen fixture sixhourly.nc made into a 4-member, 2-variable ensemble; every layout
 * must give, per member, the daily means and maxima CDO computes on each member's file
 * (`cdo fldmean -daymean`/`-daymax -shifttime,-1sec -sellonlatbox`, within 1e-4 K). The layouts are common
 * practice of data portals, no source; the period rules are src/read/DECISIONS.md §1 (CF 1.11 §7.3).
 */
import { execFileSync } from 'node:child_process';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, unlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkConfigFile, loadConfig } from '../../src/config/load-config.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { unmatchedPatterns } from '../../src/pipeline/pattern-check.ts';
import { minimalVariant } from '../config/helpers.ts';
import type { Config } from '../../src/config/types.ts';
import { resolveInputs } from '../../src/pipeline/inputs.ts';
import { listHindcasts } from '../../src/pipeline/hindcast-list.ts';
import { readAll, type ReadResult } from '../../src/pipeline/read-stage.ts';
import { readStart, startRequest } from '../../src/pipeline/hindcast-starts.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import type { ForelightError } from '../../src/core/errors.ts';

const SIXHOURLY = join(import.meta.dirname, '../fixtures/regions/sixhourly.nc');
const MINIMAL = join(import.meta.dirname, '../config/fixtures/minimal.yaml');
const KESSAN = '-3.5,-0.5,-12,-9'; // cdo sellonlatbox lon1,lon2,lat1,lat2
const MEMBERS = 4;
const DAYS = ['2026-11-23', '2026-11-24', '2026-11-25'];
const tmp = mkdtempSync(join(tmpdir(), 'forelight-split-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const run = (tool: string, ...args: string[]) => execFileSync(tool, args, { cwd: tmp, stdio: ['ignore', 'pipe', 'pipe'] }).toString();

/** ens.nc: members 0-1 of sixhourly.nc and the same + 1.5 K as members 2-3 (along `number`), t2m and tx = t2m + 2 K. */
function makeEnsemble(): void {
  run('ncpdq', '-O', '-a', 'number,time', SIXHOURLY, 'a.nc');
  run('ncks', '-O', '--mk_rec_dmn', 'number', 'a.nc', 'a.nc');
  run('ncap2', '-O', '-s', 't2m=t2m+1.5f;number=number+2', 'a.nc', 'b.nc');
  run('ncrcat', '-O', 'a.nc', 'b.nc', 'ens.nc');
  run('ncap2', '-O', '-s', 'tx=t2m+2.0f', 'ens.nc', 'ens.nc');
  run('ncatted', '-O', '-a', 'cell_methods,,d,,', 'ens.nc');
}

/** `variable` of members first..last of ens.nc into `out` (one member: no ensemble dimension left, as portals write it). */
function cut(out: string, variables: string, first: number, last: number, from = 'ens.nc'): void {
  mkdirSync(dirname(resolve(tmp, out)), { recursive: true });
  run('ncks', '-O', '-v', variables, '-d', `number,${first},${last}`, from, out);
  if (first === last) run('ncwa', '-O', '--no_cll_mth', '-a', 'number', out, out);
}

/** CDO's box mean per day of one member's file: date → K. */
function cdoDaily(file: string, operator: string[]): Map<string, number> {
  const out = new Map<string, number>();
  for (const line of run(
    'cdo',
    '-s',
    '--precision',
    '12',
    'outputtab,date,value',
    '-fldmean',
    ...operator,
    `-sellonlatbox,${KESSAN}`,
    file,
  ).split('\n')) {
    const f = line.trim().split(/\s+/);
    if (f.length === 2 && !line.includes('#')) out.set(f[0], Number(f[1]));
  }
  return out;
}

/** Per member, the reference daily values: mean of t2m (instantaneous), maximum of tx (period before each stamp). */
const reference: { tmean: Map<string, number>[]; tmax: Map<string, number>[] } = { tmean: [], tmax: [] };

beforeAll(() => {
  makeEnsemble();
  for (let m = 0; m < MEMBERS; m++) {
    cut(`ref/t2m_${m}.nc`, 't2m', m, m);
    cut(`ref/tx_${m}.nc`, 'tx', m, m);
    reference.tmean.push(cdoDaily(join(tmp, `ref/t2m_${m}.nc`), ['-daymean']));
    reference.tmax.push(cdoDaily(join(tmp, `ref/tx_${m}.nc`), ['-daymax', '-shifttime,-1sec']));
  }
}, 120_000);

let configs = 0;
/** minimal.yaml with one days source reading `forecastFiles` (YAML text) and one centre-rule region over the Kessan box. */
async function configWith(forecastFiles: string): Promise<Config> {
  const dir = join(tmp, `c${++configs}`);
  mkdirSync(dir, { recursive: true });
  const text = readFileSync(MINIMAL, 'utf8')
    .replace('forecast-files: data/w_{date}.nc', `forecast-files: ${forecastFiles}`)
    .replace('variables: { tmax: tasmax, dewpoint: tdps }', 'variables: { tmean: t2m, tmax: tx }')
    .replace('kind: heat-index', 'kind: tmax-mean')
    .replace(
      'box: { south: 1, north: 2, west: -1, east: 1 }',
      'box: { south: -12, north: -9, west: -3.5, east: -0.5 }\n    cell-rule: centre',
    );
  writeFileSync(join(dir, 'forelight.yaml'), text);
  return loadConfig(join(dir, 'forelight.yaml'));
}

/** The folder of the config's data (patterns are relative to the YAML). */
const dataOf = (config: Config) => join(config.file, '..', 'data');

async function readOn(config: Config, date = '2026-11-23'): Promise<ReadResult> {
  return readAll(config, date, await resolveInputs(config, date));
}

function expectAsCdo(read: ReadResult): void {
  const [source] = read.sources;
  expect(source, read.problems.map((p) => p.message).join('\n')).toBeDefined();
  const north = source.series.get('north');
  for (const quantity of ['tmean', 'tmax'] as const) {
    const s = north?.get(quantity);
    expect(s?.members).toBe(MEMBERS);
    expect(s?.days.slice(0, DAYS.length)).toEqual(DAYS);
    for (let m = 0; m < MEMBERS; m++) {
      DAYS.forEach((day, d) => {
        const cdo = reference[quantity][m].get(day) as number;
        expect(Math.abs((s?.data[m * (s?.days.length ?? 0) + d] as number) + 273.15 - cdo)).toBeLessThanOrEqual(1e-4);
      });
    }
  }
}

describe('forecasts split by variable and member read as one ensemble (vs cdo per member)', () => {
  it('{var} and {member}: one file per variable and member, no ensemble dimension, unpadded numbers (m10 after m9)', async () => {
    const config = await configWith('data/{var}_{date}_m{member}.nc');
    for (let m = 0; m < MEMBERS; m++) for (const v of ['t2m', 'tx']) cut(join(dataOf(config), `${v}_20261123_m${m + 8}.nc`), v, m, m);
    const read = await readOn(config);
    expectAsCdo(read);
    expect(read.sources[0].files).toHaveLength(2 * MEMBERS);
  });

  it('{member} groups (00-01, 02-03), concatenated by their first member number', async () => {
    const config = await configWith('data/ens_{date}_{member}.nc');
    cut(join(dataOf(config), 'ens_20261123_02-03.nc'), 't2m,tx', 2, 3);
    cut(join(dataOf(config), 'ens_20261123_00-01.nc'), 't2m,tx', 0, 1);
    expectAsCdo(await readOn(config));
  });

  it('a list of patterns, one per variable (the file holding each variable is found by its header)', async () => {
    const config = await configWith("['data/{date}/mean.nc', 'data/{date}/max.nc']");
    cut(join(dataOf(config), '20261123/mean.nc'), 't2m', 0, MEMBERS - 1);
    cut(join(dataOf(config), '20261123/max.nc'), 'tx', 0, MEMBERS - 1);
    expectAsCdo(await readOn(config));
  });

  it('a list of patterns holding the same variables: member groups in list order', async () => {
    const config = await configWith("['data/first/ens_{date}.nc', 'data/second/ens_{date}.nc']");
    cut(join(dataOf(config), 'first/ens_20261123.nc'), 't2m,tx', 0, 2);
    cut(join(dataOf(config), 'second/ens_20261123.nc'), 't2m,tx', 3, 3);
    expectAsCdo(await readOn(config));
  });
});

describe('incomplete or inconsistent split forecasts', () => {
  /** The {var}/{member} layout of the 23rd, and a complete forecast of the 22nd (times 24 h earlier) to fall back on. */
  async function twoIssues(): Promise<Config> {
    const config = await configWith('data/{var}_{date}_m{member}.nc');
    const data = dataOf(config);
    for (let m = 0; m < MEMBERS; m++) {
      for (const v of ['t2m', 'tx']) {
        cut(join(data, `${v}_20261123_m0${m}.nc`), v, m, m);
        cpSync(join(data, `${v}_20261123_m0${m}.nc`), join(data, `${v}_20261122_m0${m}.nc`));
        run('ncatted', '-O', '-a', 'units,time,o,c,hours since 2026-11-22 00:00:00', join(data, `${v}_20261122_m0${m}.nc`));
      }
    }
    return config;
  }

  it('a member file missing between others is named; the source falls back to the older complete forecast', async () => {
    const config = await twoIssues();
    unlinkSync(join(dataOf(config), 't2m_20261123_m02.nc'));
    const read = await readOn(config);
    const lines = read.problems.map((p) => p.message);
    expect(
      lines.some((l) => /t2m_20261123_m02\.nc: is missing: member 2 of the forecast lies between .*m01\.nc and .*m03\.nc/.test(l)),
      lines.join('\n'),
    ).toBe(true);
    expect(read.sources[0]).toMatchObject({ date: '2026-11-22', stale: true });
    expect(read.sources[0].series.get('north')?.get('tmean')?.members).toBe(MEMBERS);
    expect(read.problems.some((p) => p.code === 'forecast-fallback')).toBe(true);
  });

  it('a last member one variable has and another lacks is named (the ensemble is never cut to fewer members)', async () => {
    const config = await twoIssues();
    unlinkSync(join(dataOf(config), 'tx_20261123_m03.nc'));
    const read = await readOn(config);
    const lines = read.problems.map((p) => p.message);
    expect(
      lines.some((l) => /tx_20261123_m03\.nc: is missing: 't2m' has member file 03, 'tx' has not/.test(l)),
      lines.join('\n'),
    ).toBe(true);
    expect(read.sources[0].date).toBe('2026-11-22');
  });

  it('a member file on another grid is refused naming both files; the older forecast is used', async () => {
    const config = await twoIssues();
    const odd = join(dataOf(config), 't2m_20261123_m01.nc');
    run('ncap2', '-O', '-s', 'lat=lat+0.5', odd, odd);
    const read = await readOn(config);
    const differ = read.problems.find((p) => p.code === 'members-differ');
    expect(differ?.diagnostic.place.file).toBe(odd);
    expect(differ?.message).toMatch(/the values of 'lat' differs from .*t2m_20261123_m00\.nc/);
    expect(read.sources[0].date).toBe('2026-11-22');
  });

  it('a member file with other times is refused naming both files', async () => {
    const config = await twoIssues();
    const odd = join(dataOf(config), 'tx_20261123_m03.nc');
    run('ncap2', '-O', '-s', 'time=time+6', odd, odd);
    const read = await readOn(config);
    const differ = read.problems.find((p) => p.code === 'members-differ');
    expect(differ?.diagnostic.place.file).toBe(odd);
    expect(differ?.message).toMatch(/'time' differs from .*tx_20261123_m00\.nc/);
  });
});

describe('forelight check on split patterns', () => {
  it('an unknown placeholder is an error at its YAML line and column', async () => {
    const file = minimalVariant('forecast-files: data/w_{date}.nc', "forecast-files: ['data/{var}_{date}.nc', 'data/x_{data}.nc']");
    const problems = (await checkConfigFile(file)).diagnostics.map(formatDiagnostic);
    expect(problems, problems.join('\n')).toHaveLength(1);
    expect(problems[0]).toMatch(/:7:\d+: unknown placeholder \{data\} in "data\/x_\{data\}\.nc" — use one of \{date\}/);
  });

  it("a pattern (or one variable's {var} file) matching nothing while the source's others match is reported at its line", async () => {
    const dir = join(tmp, 'check');
    mkdirSync(join(dir, 'data'), { recursive: true });
    const text = readFileSync(MINIMAL, 'utf8')
      .replace('forecast-files: data/w_{date}.nc', "forecast-files: ['data/{var}_{date}_m{member}.nc', 'data/extra_{date}.nc']")
      .replace('variables: { tmax: tasmax, dewpoint: tdps }', 'variables: { tmax: tx, dewpoint: td }');
    writeFileSync(join(dir, 'forelight.yaml'), text);
    cut(join(dir, 'data/tx_20261123_m00.nc'), 'tx', 0, 0);
    const { config, sourceMap } = await checkConfigFile(join(dir, 'forelight.yaml'));
    const lines = unmatchedPatterns(config as Config, sourceMap).map(formatDiagnostic);
    expect(lines, lines.join('\n')).toHaveLength(2);
    expect(lines[0]).toMatch(
      /:7:\d+: source weekly: .*data\/td_\{date\}_m\{member\}\.nc matches no file \(for variable 'td'\), while .*tx_\{date\}_m\{member\}\.nc matches 1/,
    );
    expect(lines[1]).toMatch(/:7:\d+: source weekly: .*data\/extra_\{date\}\.nc matches no file, while/);
  });
});

describe('hindcasts split by variable and member', () => {
  it('hindcast-files with {var}, {year}{mmdd} and {member}: one start per date, its members stacked (vs cdo)', async () => {
    const config = await configWith('data/{var}_{date}_m{member}.nc');
    const source = { ...config.sources[0], hindcast: join(dataOf(config), 'hc/{year}/{var}_{year}{mmdd}_m{member}.nc') };
    for (const year of [2010, 2011])
      for (let m = 0; m < MEMBERS; m++)
        for (const v of ['t2m', 'tx']) {
          const file = join(dataOf(config), `hc/${year}/${v}_${year}1123_m${m}.nc`);
          cut(file, v, m, m);
          run('ncatted', '-O', '-a', `units,time,o,c,hours since ${year}-11-23 00:00:00`, file);
        }
    const starts = await listHindcasts(source);
    expect(starts.map((h) => [h.start, h.files.existing.length])).toEqual([
      ['2010-11-23', 2 * MEMBERS],
      ['2011-11-23', 2 * MEMBERS],
    ]);
    const problems: ForelightError[] = [];
    const read = [];
    for (const h of starts) read.push(await readStart(extractRegionSeries, startRequest(config, source, h, new Map()), problems));
    // Only region 'south' of minimal.yaml, which lies off this grid, is a problem (once per variable file).
    expect(problems.filter((p) => !p.message.includes("region 'south'")).map((p) => p.message)).toEqual([]);
    for (const h of read) {
      const s = h?.series.get('north')?.get('tmax');
      expect(s?.members).toBe(MEMBERS);
      for (let m = 0; m < MEMBERS; m++) {
        const cdo = [...reference.tmax[m].values()].slice(1, 4); // 23..25 November (the day before is step 0's)
        cdo.forEach((v, d) => expect(Math.abs((s?.data[m * (s?.days.length ?? 0) + d] as number) + 273.15 - v)).toBeLessThanOrEqual(1e-4));
      }
    }
  });
});
