/**
 * `forelight extract` reads a file as `run` does: `--reference-time` (the forecast date a run takes from the file
 * name) dates end-stamped periods from it and is checked against the file; a monthly-mean file prints one value per
 * month. Files written by netCDF-C's ncgen (test/read/cdl-fixture.ts), values against CDO on the same file within
 * 1e-4. Conventions: src/read/DECISIONS.md §1 (GRIB step semantics, CF 1.11 §7.3) and §4 (monthly values).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { EXIT } from '../../src/core/exit-codes.ts';
import { BOX, CDO_BOX, cdoTable, ncgenFixture, type CdlSpec } from '../read/cdl-fixture.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const BOX_ARG = `${BOX.south},${BOX.north},${BOX.west},${BOX.east}`;
const temperature = (m: number, t: number, y: number, x: number): number => 290 + 5 * Math.sin(0.7 * t + y) + 0.3 * x + 0.5 * m;

function forelight(...args: string[]): { code: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [join(ROOT, 'bin/forelight.mjs'), ...args], { cwd: ROOT, encoding: 'utf8', timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function expectAsCdo(printed: { times: string[]; members: (number | null)[][] }, cdo: { dates: string[]; members: number[][] }) {
  expect(printed.members).toHaveLength(cdo.members.length);
  printed.members.forEach((row, m) =>
    row.forEach((v, t) => expect(Math.abs((v as number) + 273.15 - cdo.members[m][t])).toBeLessThanOrEqual(1e-4)),
  );
}

describe('forelight extract --reference-time and monthly files', () => {
  // 24-h maxima stamped at the end of each day (24, 48, 72 h), no forecast_reference_time in the file.
  const tmax24: CdlSpec = {
    timeUnits: 'hours since 2026-11-23 00:00:00',
    times: [24, 48, 72],
    variables: { mx2t24: { attributes: { units: 'K', cell_methods: 'time: maximum' }, value: temperature } },
  };

  it('--reference-time dates end-stamped maxima as a run does (= cdo daymax after shifttime -1sec); another date is refused in one line', () => {
    const file = ncgenFixture('extract-ref', tmax24);
    const r = forelight('extract', file, '--var', 'mx2t24', '--box', BOX_ARG, '--daily', 'max', '--reference-time', '2026-11-23', '--json');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(EXIT.ok);
    const printed = JSON.parse(r.stdout);
    expect(printed.times).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
    const cdo = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymax', '-shifttime,-1sec'], file);
    expect(cdo.dates).toEqual(printed.times);
    expectAsCdo(printed, cdo);
    const wrong = forelight(
      'extract',
      file,
      '--var',
      'mx2t24',
      '--box',
      BOX_ARG,
      '--daily',
      'max',
      '--reference-time',
      '2026-11-25',
      '--json',
    );
    expect(wrong.code).toBe(EXIT.inputProblem);
    expect(wrong.stderr.trim().split('\n')).toHaveLength(1);
    expect(wrong.stderr).toMatch(/holds the forecast of 2026-11-23T00:00:00Z but 2026-11-25T00:00:00Z was requested/);
  });

  it('--reference-time on one file of a source split by member (NCO: ncks -d number,1,1 then ncwa -a number) = cdo on that member', () => {
    const file = ncgenFixture('extract-ref-members', tmax24);
    const member = file.replace('.nc', '_m01.nc');
    execFileSync('ncks', ['-O', '-d', 'number,1,1', file, member]);
    execFileSync('ncwa', ['-O', '-a', 'number', member, member]);
    expect(execFileSync('ncdump', ['-h', member], { encoding: 'utf8' })).not.toMatch(/number = /);
    const r = forelight(
      'extract',
      member,
      '--var',
      'mx2t24',
      '--box',
      BOX_ARG,
      '--daily',
      'max',
      '--reference-time',
      '2026-11-23',
      '--json',
    );
    expect(r.stderr).toBe('');
    const printed = JSON.parse(r.stdout);
    expect(printed.times).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
    const cdo = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymax', '-shifttime,-1sec'], file);
    expectAsCdo(printed, { dates: cdo.dates, members: [cdo.members[1]] });
  });

  it('a monthly-mean file (360_day, month bounds) prints one value per month labelled YYYY-MM, = cdo fldmean, with or without --daily', () => {
    const file = ncgenFixture('extract-monthly', {
      timeUnits: 'days since 2026-12-01 00:00:00',
      calendar: '360_day',
      reference: 0,
      times: [15, 45, 75],
      bounds: [
        [0, 30],
        [30, 60],
        [60, 90],
      ],
      variables: { t2m: { attributes: { units: 'K', cell_methods: 'time: mean' }, value: temperature } },
    });
    const cdo = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`], file);
    for (const daily of [[], ['--daily', 'mean']]) {
      const r = forelight('extract', file, '--var', 't2m', '--box', BOX_ARG, ...daily, '--json');
      expect(r.code).toBe(EXIT.ok);
      const printed = JSON.parse(r.stdout);
      expect(printed.times).toEqual(['2026-12', '2027-01', '2027-02']);
      expectAsCdo(printed, cdo);
    }
  });
});
