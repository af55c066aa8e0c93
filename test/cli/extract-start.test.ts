/**
 * `forelight extract --start K` on a hindcast file of several starts (cfgrib's layout written by python3-xarray,
 * test/pipeline/multi_start_reference.py; CF 1.11 §4.4 forecast_reference_time along `time`; common practice, no
 * source) prints start K as a run reads it: the box means xarray computes on that start within 1e-4 K. A bad index
 * is one usage line; without --start the file is refused with the hint to use it.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { EXIT } from '../../src/core/exit-codes.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const REFERENCE = join(ROOT, 'test/pipeline/multi_start_reference.py');
const tmp = mkdtempSync(join(tmpdir(), 'forelight-extract-start-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

function forelight(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), ...args], { cwd: ROOT, encoding: 'utf8', timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('forelight extract --start', () => {
  const file = join(tmp, 'all.nc');
  const python = (...args: string[]) => execFileSync('/usr/bin/python3', [REFERENCE, ...args]).toString();
  python('write', file);
  const box = ['--var', 't2m', '--box', '0.5,1.5,-1,1', '--json'];

  it('prints each start as xarray reads it', () => {
    for (const k of [0, 2]) {
      const r = forelight('extract', file, ...box, '--start', String(k));
      expect(r.code, r.stderr).toBe(EXIT.ok);
      const printed = JSON.parse(r.stdout) as { times: string[]; members: number[][]; cells: number };
      expect(printed.times[0]).toBe(`${2010 + k}-11-23T00:00:00Z`);
      expect(printed.cells).toBe(2);
      const expected = JSON.parse(python('boxmean', file, String(k), '1', '-1', '1')) as number[][];
      printed.members.forEach((row, m) => row.forEach((v, t) => expect(Math.abs(v + 273.15 - expected[m][t])).toBeLessThanOrEqual(1e-4)));
    }
  });

  it('an index past the last start, or not a number, is one line; without --start the hint names it', () => {
    const past = forelight('extract', file, ...box, '--start', '3');
    expect(past.code).not.toBe(EXIT.ok);
    expect(past.stderr.trim().split('\n')).toEqual([
      expect.stringContaining(`${file}: start 3 was listed, but 'time' holds only 3 starts`),
    ]);
    const word = forelight('extract', file, ...box, '--start', 'first');
    expect(word.code).toBe(EXIT.usage);
    expect(word.stderr).toMatch(/--start must be a start index 0, 1, … along the file's reference-time dimension, got 'first'/);
    const none = forelight('extract', file, ...box);
    expect(none.stderr).toMatch(/holds 3 forecast reference times .*forelight extract --start K reads start K\)/);
  });
});
