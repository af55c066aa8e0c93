/**
 * A time axis out of order or repeating: CF 1.11 §5 requires a coordinate variable to be strictly monotonic, and
 * a step read out of order would put values on the wrong day or difference an accumulation against a later one.
 * Files written by netCDF-C's `ncgen` (test/read/cdl-fixture.ts); the refusal's suggested fix (`cdo sorttimestamp`)
 * is run on the very file, and the sorted file is read like CDO reads it (Debian cdo 2.1), within 1e-4.
 */
import { execFileSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { extractRegionSeries } from '../../src/read/extract.ts';
import { BOX, CDO_BOX, cdoTable, ncgenFixture, type CdlSpec } from './cdl-fixture.ts';

const regions = [{ id: 'box', name: 'box', shape: { kind: 'box' as const, ...BOX }, utcOffsetHours: 0, teams: [] }];
/** Per-step rain in mm; `accumulated(m, k, …)` is its sum over steps 1..k in metres (0 at step 0). */
const rainMm = (m: number, k: number, y: number, x: number): number => ((13 * k + 7 * y + 3 * x + 5 * m) % 17) * 0.37;
const accumulated = (m: number, k: number, y: number, x: number): number => {
  let sum = 0;
  for (let j = 1; j <= k; j++) sum += rainMm(m, j, y, x);
  return sum / 1000;
};
/** 6-hourly tp accumulated in m (GRIB total precipitation), stamped at `hours` in that order. */
const tp = (hours: number[]): CdlSpec => ({
  timeUnits: 'hours since 2026-11-23 00:00:00',
  times: hours,
  variables: { tp: { attributes: { units: 'm' }, value: (m, t, y, x) => accumulated(m, hours[t] / 6, y, x) } },
});
const read = (file: string) => extractRegionSeries(file, { quantities: { precip: 'tp' }, regions, referenceTime: '2026-11-23' });
/** The message of the InputError a file-level refusal throws. */
const refusal = (file: string): Promise<string> =>
  read(file).then(
    () => 'read without refusal',
    (e: Error) => e.message,
  );

describe('a time axis out of order or repeating (CF 1.11 §5: coordinate values strictly monotonic)', () => {
  it('steps 6 … 48 then 0 are refused in one line naming file and axis; the suggested cdo sorttimestamp makes it read = cdo deltat', async () => {
    const file = ncgenFixture('tp-step0-last', tp([6, 12, 18, 24, 30, 36, 42, 48, 0]));
    const message = await refusal(file);
    expect(message.split('\n')).toHaveLength(1);
    expect(message).toContain(`${file}: 'time' is not increasing: step 8 goes back to 2026-11-23T00:00:00Z`);
    const fix = /cdo sorttimestamp (\S+) (\S+)/.exec(message);
    expect(fix?.[1]).toBe(file);
    execFileSync('cdo', ['-s', 'sorttimestamp', fix![1], fix![2]], { cwd: dirname(file) });
    const sorted = join(dirname(file), fix![2]);
    const got = await read(sorted);
    expect(got.problems).toEqual([]);
    const s = got.series[0];
    const cdo = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-mulc,1000', '-daysum', '-shifttime,-1sec', '-deltat'], sorted);
    expect(s.days).toEqual(['2026-11-23', '2026-11-24']);
    expect(cdo.dates.slice(0, 2)).toEqual(s.days);
    cdo.members.forEach((row, m) => s.days.forEach((_, d) => expect(Math.abs(s.data[m * 2 + d] - row[d])).toBeLessThanOrEqual(1e-4)));
  });

  it('a repeated step is refused naming both steps, and asks for the file again (sorting cannot tell which to keep)', async () => {
    const file = ncgenFixture('tp-repeat', tp([0, 6, 12, 12, 18, 24]));
    expect(await refusal(file)).toBe(
      `${file}: 'time' is not increasing: step 3 repeats 2026-11-23T12:00:00Z after step 2 at 2026-11-23T12:00:00Z — ` +
        'ask the provider for the file again (each step must come once, in order)',
    );
  });
});
