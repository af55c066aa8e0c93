/**
 * A latitude coordinate without CF attributes (CF 1.11 §4.1 identifies latitude by units `degrees_north` or
 * standard_name `latitude`) and not named lat/latitude is refused in one line naming the file; the printed ncatted command (NCO 5.x, Debian
 * `nco`), with the variable's name put in for `<var>` as the message asks, is run on that very file and makes it read
 * with the same values as the untouched ncgen-written file.
 */
import { execFileSync } from 'node:child_process';
import { copyFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { extractRegionSeries } from '../../src/read/extract.ts';
import { BOX, ncgenFixture } from './cdl-fixture.ts';

const regions = [{ id: 'box', name: 'box', shape: { kind: 'box' as const, ...BOX }, utcOffsetHours: 0, teams: [] }];
const read = (file: string) => extractRegionSeries(file, { quantities: { tmax: 't2m' }, regions, referenceTime: '2026-11-23' });

describe('a latitude variable without units or standard_name (CF 1.11 §4.1)', () => {
  it('is refused in one line naming the file; the printed ncatted fix, with <var> named, makes it read as the original', async () => {
    const original = ncgenFixture('lat-attributes', {
      timeUnits: 'hours since 2026-11-23 00:00:00',
      times: [0, 6, 12, 18, 24],
      variables: { t2m: { attributes: { units: 'K' }, value: (m, t, y, x) => 290 + m + t * 0.5 + y * 0.25 + x * 0.125 } },
    });
    const bare = original.replace(/\.nc$/, '-bare.nc');
    copyFileSync(original, bare);
    // Named so that neither attributes nor the usual names (lat, latitude) identify it.
    execFileSync('ncrename', ['-O', '-d', 'lat,yc', '-v', 'lat,yc', bare]);
    execFileSync('ncatted', ['-O', '-a', 'units,yc,d,,', '-a', 'standard_name,yc,d,,', bare]);
    const message = await read(bare).then(
      () => 'read without refusal',
      (e: Error) => e.message,
    );
    expect(message.split('\n')).toHaveLength(1);
    expect(message).toContain(`${bare}: no latitude coordinate`);
    const command = /e\.g\. (ncatted [^)]*)\)/.exec(message)?.[1];
    expect(command).toBeDefined();
    execFileSync('sh', ['-c', command!.replace('<var>', 'yc')], { cwd: '/' });
    const fixed = await read(bare);
    const reference = await read(original);
    expect(fixed.problems).toEqual([]);
    const values = (r: typeof fixed) => r.series.map((s) => ({ days: s.days, data: Array.from(s.data) }));
    expect(reference.series[0].data.length).toBeGreaterThan(0);
    expect(values(fixed)).toEqual(values(reference));
  });
});
