/**
 * `forelight check` on `hindcast-files` with the files at hand: a pattern that matches no file while the source's
 * forecasts are there, or that has no `{year}`/`{date}` (no start can be told from the path), is an error at its
 * YAML line; before any file of the source has arrived only the grid check's note names it. The files are copies of
 * the ncgen fixture sixhourly.nc (their content is not read here). Placeholder conventions: common practice of data
 * portals, no source. A file holding every start along a reference-time dimension (cfgrib's layout of C3S-style
 * hindcasts, written by python3-xarray: multi_start_reference.py; CF 1.11 §4.4 forecast_reference_time) is no
 * problem: it is listed as one start per index (multi-start-hindcast.test.ts reads them). Read directly (as a
 * forecast) it is refused, and the NCO split the message suggests is run on it: each part then reads as one start,
 * with the box means xarray computes on the one file (within 1e-4 K).
 */
import { execFileSync } from 'node:child_process';
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { checkConfigFile } from '../../src/config/load-config.ts';
import type { Config } from '../../src/config/types.ts';
import { formatDiagnostic } from '../../src/core/diagnostics.ts';
import { sourceGridExtents } from '../../src/pipeline/grid-extents.ts';
import { hindcastPatternProblems } from '../../src/pipeline/pattern-check.ts';
import { listHindcasts } from '../../src/pipeline/hindcast-list.ts';
import { extractBoxJson } from '../../src/read/extract.ts';
import type { ForelightError } from '../../src/core/errors.ts';

const SIXHOURLY = join(import.meta.dirname, '../fixtures/regions/sixhourly.nc');
const MINIMAL = join(import.meta.dirname, '../config/fixtures/minimal.yaml');
const REFERENCE = join(import.meta.dirname, 'multi_start_reference.py');
const tmp = mkdtempSync(join(tmpdir(), 'forelight-hcpattern-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

let n = 0;
/** minimal.yaml (forecast-files on line 7) with `hindcast-files: <pattern>` on line 8 and the given files in its folder. */
async function checked(pattern: string, files: string[], write = (dir: string) => void dir) {
  const dir = join(tmp, `c${++n}`);
  mkdirSync(dir, { recursive: true });
  for (const f of files) {
    mkdirSync(dirname(join(dir, f)), { recursive: true });
    copyFileSync(SIXHOURLY, join(dir, f));
  }
  write(dir);
  const text = readFileSync(MINIMAL, 'utf8').replace(
    'forecast-files: data/w_{date}.nc',
    `forecast-files: data/w_{date}.nc\n    hindcast-files: ${pattern}`,
  );
  writeFileSync(join(dir, 'forelight.yaml'), text);
  const { config, sourceMap, diagnostics } = await checkConfigFile(join(dir, 'forelight.yaml'));
  expect(diagnostics.map(formatDiagnostic)).toEqual([]);
  return { config: config as Config, lines: (await hindcastPatternProblems(config as Config, sourceMap)).map(formatDiagnostic) };
}

describe('forelight check on hindcast-files', () => {
  it('a pattern matching no file while the forecasts are there is an error at its line, naming the key', async () => {
    const { lines } = await checked('hc/w_{year}{mmdd}.nc', ['data/w_20261123.nc', 'hc/w_2010-1123.nc']);
    expect(lines, lines.join('\n')).toHaveLength(1);
    expect(lines[0]).toMatch(/forelight\.yaml:8:\d+: source weekly: hindcast-files \S+hc\/w_\{year\}\{mmdd\}\.nc matches no file, /);
    expect(lines[0]).toMatch(/ — check the spelling and folders of hindcast-files \(placeholders \{date\}, \{year\}, \{mmdd\}/);
  });

  it('a pattern without {year} or {date} that is not read as starts is an error at its line', async () => {
    const { lines } = await checked('hc/w_all.nc', ['data/w_20261123.nc', 'hc/w_all.nc']);
    expect(lines, lines.join('\n')).toHaveLength(1);
    expect(lines[0]).toMatch(
      /:8:\d+: source weekly: hindcast-files \S+hc\/w_all\.nc has no \{year\} or \{date\}, so the start of its 1 file\(s\) cannot be told/,
    );
  });

  it('{mmdd} alone tells no year: an error too', async () => {
    const { lines } = await checked('hc/w_{mmdd}.nc', ['data/w_20261123.nc', 'hc/w_1123.nc']);
    expect(lines, lines.join('\n')).toHaveLength(1);
    expect(lines[0]).toMatch(/:8:\d+: .*has no \{year\} or \{date\}/);
  });

  it('{year}{mmdd} in a folder and the name, {date}: no problem when files match', async () => {
    expect((await checked('hc/{year}/w_{year}{mmdd}.nc', ['data/w_20261123.nc', 'hc/2010/w_20101123.nc'])).lines).toEqual([]);
    expect((await checked('hc/w_{date}.nc', ['data/w_20261123.nc', 'hc/w_20101123.nc'])).lines).toEqual([]);
  });

  it('before any file of the source has arrived: no error, and the grid note names the hindcast pattern too', async () => {
    const { config, lines } = await checked('hc/w_{year}{mmdd}.nc', []);
    expect(lines).toEqual([]);
    const { notes } = await sourceGridExtents(config);
    expect(notes.map((d) => d.message)).toEqual([
      expect.stringMatching(
        /^source 'weekly': no forecast file yet matches \S+w_\{date\}\.nc, nor any hindcast file \S+hc\/w_\{year\}\{mmdd\}\.nc; its grid/,
      ),
    ]);
  });

  it('one file of several starts is no problem (read as one start per index); the split a forecast file is told to make reads as one start per file (vs xarray)', async () => {
    const python = (...args: string[]) => execFileSync('/usr/bin/python3', [REFERENCE, ...args]).toString();
    const { config, lines } = await checked('hc/all.nc', ['data/w_20261123.nc'], (dir) => {
      mkdirSync(join(dir, 'hc'), { recursive: true });
      python('write', join(dir, 'hc/all.nc'));
    });
    expect(lines).toEqual([]);
    const all = join(dirname(config.file), 'hc/all.nc');
    expect((await listHindcasts(config.sources[0])).map((h) => [h.start, h.startIndex])).toEqual([
      ['2010-11-23', 0],
      ['2011-11-23', 1],
      ['2012-11-23', 2],
    ]);
    const err = (await extractBoxJson(all, { variable: 't2m', box: { south: 0.5, north: 1.5, west: -1, east: 1 } }).catch(
      (e: unknown) => e,
    )) as ForelightError;
    const fix =
      /e\.g\. (ncks -d time,K,K \S+ \S+_YYYYMMDD\.nc) for each start K \(0 = 20101123 … 2 = 20121123\), and point forecast-files at (\S+_\{date\}\.nc) \(hindcast-files reads such a file as it is; forelight extract --start K reads start K\)$/.exec(
        err.diagnostic.hint,
      );
    expect(fix, err.diagnostic.hint).not.toBeNull();
    const starts = ['20101123', '20111123', '20121123'];
    starts.forEach((date, k) => {
      const [tool, ...args] = fix![1].replace('time,K,K', `time,${k},${k}`).replace('YYYYMMDD', date).split(' ');
      execFileSync(tool, args);
    });
    const split = { ...config.sources[0], hindcast: fix![2] };
    expect((await hindcastPatternProblems({ ...config, sources: [split] }, undefined)).map((d) => d.message)).toEqual([]);
    const found = await listHindcasts(split);
    expect(found.map((h) => h.start)).toEqual(['2010-11-23', '2011-11-23', '2012-11-23']);
    for (const [k, h] of found.entries()) {
      const expected = JSON.parse(python('boxmean', all, String(k), '1', '-1', '1')) as number[][];
      const got = await extractBoxJson(h.path, { variable: 't2m', box: { south: 0.5, north: 1.5, west: -1, east: 1 } });
      expect(got.cells).toBe(2);
      expect(got.times[0]).toBe(`${h.start}T00:00:00Z`);
      expect(got.members).toHaveLength(2);
      got.members.forEach((series, m) =>
        series.forEach((v, step) => expect(Math.abs((v as number) + 273.15 - expected[m][step])).toBeLessThanOrEqual(1e-4)),
      );
    }
  });

  it('reading the one file directly is refused with the same split suggestion', async () => {
    const file = join(tmp, 'direct.nc');
    execFileSync('/usr/bin/python3', [REFERENCE, 'write', file]);
    const err = (await extractBoxJson(file, { variable: 't2m', box: { south: 0.5, north: 1.5, west: -1, east: 1 } }).catch(
      (e: unknown) => e,
    )) as ForelightError;
    expect(err.code).toBe('reference-several');
    expect(err.message).toMatch(/'time' holds 3 forecast reference times \(one file of several starts\)/);
    expect(err.diagnostic.hint).toBe(
      `split it into one file per start, e.g. ncks -d time,K,K ${file} ${tmp}/direct_YYYYMMDD.nc for each start K (0 = 20101123 … 2 = 20121123), and point forecast-files at ${tmp}/direct_{date}.nc (hindcast-files reads such a file as it is; forelight extract --start K reads start K)`,
    );
  });
});
