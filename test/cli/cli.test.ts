/**
 * The `forelight` command as a user runs it (a real child process): help, `extract --json` on a file written by
 * netCDF-C's ncgen, one-line errors with the documented exit codes (src/core/exit-codes.ts).
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { extractBoxJson, extractRegionSeries } from '../../src/read/extract.ts';
import { EXIT } from '../../src/core/exit-codes.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const GRID = join(ROOT, 'test/fixtures/regions/grid360.nc');
const MARROW = '-9,-6.5,-1.5,1.5';

function forelight(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), ...args], { cwd: ROOT, encoding: 'utf8', timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('forelight CLI', () => {
  it('--help lists every command and exits 0', () => {
    const r = forelight('--help');
    expect(r.code).toBe(EXIT.ok);
    for (const c of ['demo', 'run', 'check', 'extract', 'skill', 'explain', 'diff', 'backtest', 'serve', 'status'])
      expect(r.stdout).toMatch(new RegExp(`^  ${c} `, 'm'));
  });

  it('extract --json prints {units, times, members, cells} exactly as the library computes it (canonical °C)', async () => {
    const r = forelight('extract', GRID, '--var', 't2m', '--box', MARROW, '--json');
    expect(r.code).toBe(EXIT.ok);
    const printed = JSON.parse(r.stdout) as { units: string; times: string[]; members: (number | null)[][]; cells: number };
    expect(Object.keys(printed).sort()).toEqual(['cells', 'members', 'times', 'units']);
    expect(printed.units).toBe('degC');
    const direct = await extractBoxJson(GRID, { variable: 't2m', box: { south: -9, north: -6.5, west: -1.5, east: 1.5 } });
    expect(printed).toEqual(JSON.parse(JSON.stringify(direct)));
  });

  it('a file that is not NetCDF: exit 3 and one stderr line naming the file and what to do', () => {
    const notNetcdf = join(ROOT, 'package.json');
    const r = forelight('extract', notNetcdf, '--var', 't2m', '--box', MARROW, '--json');
    expect(r.code).toBe(EXIT.inputProblem);
    const lines = r.stderr.trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toContain('package.json');
    expect(lines[0]).toMatch(/not a NetCDF file/);
  });

  it('a variable without units: extract refuses (exit 3) with the same one line as a run, and the suggested ncatted fix works on that file', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-nounits-'));
    const file = join(dir, 'nounits.nc');
    const cdl = readFileSync(join(ROOT, 'test/fixtures/regions/grid360.cdl'), 'utf8').replace(/^\s*t2m:units = "K" ;\n/m, '');
    writeFileSync(join(dir, 'nounits.cdl'), cdl);
    expect(spawnSync('ncgen', ['-o', file, join(dir, 'nounits.cdl')]).status).toBe(0);
    const r = forelight('extract', file, '--var', 't2m', '--box', MARROW, '--json');
    expect(r.code).toBe(EXIT.inputProblem);
    expect(r.stdout).toBe('');
    const lines = r.stderr.trim().split('\n');
    expect(lines).toHaveLength(1);
    const run = await extractRegionSeries(file, {
      quantities: { tmean: 't2m' },
      regions: [
        { id: 'm', name: 'm', utcOffsetHours: 0, teams: [], shape: { kind: 'box', south: -9, north: -6.5, west: -1.5, east: 1.5 } },
      ],
    });
    expect(run.problems).toHaveLength(1);
    expect(lines[0]).toContain(run.problems[0].message);
    const fix = /\(e\.g\. (ncatted [^)]*)\)/.exec(lines[0])![1].replace('<units>', 'K');
    expect(spawnSync('sh', ['-c', fix]).status).toBe(0);
    const fixed = forelight('extract', file, '--var', 't2m', '--box', MARROW, '--json');
    expect(fixed.code).toBe(EXIT.ok);
    expect(JSON.parse(fixed.stdout).units).toBe('degC');
  });

  it('a missing variable names the variables the file has', () => {
    const r = forelight('extract', GRID, '--var', 'tas', '--box', MARROW, '--json');
    expect(r.code).toBe(EXIT.inputProblem);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/'tas'.*t2m/);
  });

  it('a bad option or box is a usage error (exit 64), one line', () => {
    expect(forelight('extract', GRID, '--var', 't2m', '--bx', MARROW, '--json').code).toBe(EXIT.usage);
    const r = forelight('extract', GRID, '--var', 't2m', '--box', '-6.5,-9,-1.5,1.5', '--json');
    expect(r.code).toBe(EXIT.usage);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/south -6.5 is north of north -9/);
  });

  it('check: the shipped configuration is valid (exit 0); status prints the next scheduled run', () => {
    const c = forelight('check');
    expect(c.code).toBe(EXIT.ok);
    expect(c.stdout).toMatch(/ok — 3 sources, 4 regions, 5 teams/);
    const s = forelight('status');
    expect(s.code).toBe(EXIT.ok);
    expect(s.stdout).toMatch(/^next scheduled run: \d{4}-\d{2}-\d{2}T06:30:00\.000Z \(30 7 \* \* 1,4, Etc\/GMT-1\)/m);
  });

  it('a folder where a file is expected: extract exits 3, check exits 2, each with one line naming it', () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-cli-dir-'));
    const e = forelight('extract', dir, '--var', 't2m', '--box', MARROW, '--json');
    expect(e.code).toBe(EXIT.inputProblem);
    expect(e.stderr.trim().split('\n')).toEqual([
      `forelight: ${dir}: is a folder, not a NetCDF file — point sources[].forecast-files (or the command line) at a file; remove the folder if a download created it by mistake`,
    ]);
    const c = forelight('check', '--config', dir);
    expect(c.code).toBe(EXIT.configInvalid);
    expect(c.stderr.trim().split('\n')[0]).toMatch(/:1:1: cannot read .* \(it is a folder\) — name the YAML file inside it$/);
  });

  it('check: a YAML file that is not UTF-8 (Latin-1 "é") is an error at the first bad byte (YAML 1.2 §5.2)', () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-cli-latin1-'));
    const file = join(dir, 'forelight.yaml');
    writeFileSync(
      file,
      Buffer.concat([
        Buffer.from('country: Republic of Veloria\n# notes: '),
        Buffer.from([0x63, 0x61, 0x66, 0xe9]),
        Buffer.from(' au port\n'),
      ]),
    );
    const r = forelight('check', '--config', file);
    expect(r.code).toBe(EXIT.configInvalid);
    expect(r.stderr.trim().split('\n')[0]).toBe(
      `${file}:2:13: byte 0xe9 is not UTF-8 (YAML 1.2 §5.2 requires Unicode) — save the file as UTF-8 (e.g. iconv -f latin1 -t utf-8)`,
    );
  });

  it('check on a configuration with errors: every problem as file:line:column, then exit 2', () => {
    const r = forelight('check', '--config', join(ROOT, 'test/config/fixtures/many-problems.yaml'));
    expect(r.code).toBe(EXIT.configInvalid);
    const lines = r.stderr.trim().split('\n');
    expect(lines.length).toBeGreaterThan(5);
    for (const line of lines.slice(0, -1)) expect(line).toMatch(/^\S+\.yaml:\d+:\d+: .+ — .+/);
    expect(lines.at(-1)).toMatch(/problem\(s\) in the configuration/);
  });

  it("check opens each source's newest file: a region off every grid is reported at its line in regions.yaml", () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-check-'));
    for (const f of ['forelight.yaml', 'teams.yaml', 'forelight.schema.json']) copyFileSync(join(ROOT, 'config', f), join(dir, f));
    // Every source reads the ncgen fixture (latitudes 14°S..4°S); one region is moved to 40°N.
    const main = readFileSync(join(dir, 'forelight.yaml'), 'utf8').replace(/forecast-files: \S+/g, `forecast-files: ${GRID}`);
    writeFileSync(join(dir, 'forelight.yaml'), main);
    const regions = readFileSync(join(ROOT, 'config/regions.yaml'), 'utf8').replace(
      'box: { south: -8.5, north: -6, west: 2, east: 4 }',
      'box: { south: 40, north: 42, west: 2, east: 4 }',
    );
    writeFileSync(join(dir, 'regions.yaml'), regions);
    const line = regions.split('\n').findIndex((l) => l.includes('south: 40')) + 1;
    const r = forelight('check', '--config', join(dir, 'forelight.yaml'));
    expect(r.code).toBe(EXIT.configInvalid);
    expect(r.stderr).toMatch(new RegExp(`regions\\.yaml:${line - 2}:\\d+: .*orrin-coast.*`));
  });
});
