/**
 * A curvilinear ensemble file (2-D latitude/longitude, CF 1.11 §5.2 auxiliary coordinates), written by netCDF-C's
 * `ncgen`, is refused in one line naming the file and the regridding command; that command (CDO's bilinear
 * remapping) is run as printed, and the regridded file's box means equal `cdo fldmean -sellonlatbox` on it
 * (Debian cdo 2.1) within 1e-4.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { extractBoxJson } from '../../src/read/extract.ts';

const tmp = mkdtempSync(join(tmpdir(), 'forelight-curvilinear-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

/** 2 steps x 2 members on a 3 x 4 grid whose rows tilt (latitude and longitude both vary along x and y). */
function curvilinear(): string {
  const values = Array.from({ length: 2 * 2 * 3 * 4 }, (_, i) => (290 + 0.5 * i + 0.3 * Math.sin(i)).toFixed(4));
  const cdl = `netcdf curvilinear {
dimensions: time = 2 ; number = 2 ; y = 3 ; x = 4 ;
variables:
  double time(time) ; time:units = "hours since 2026-11-23 00:00:00" ; time:standard_name = "time" ;
  int number(number) ; number:standard_name = "realization" ;
  double lat(y, x) ; lat:units = "degrees_north" ; lat:standard_name = "latitude" ;
  double lon(y, x) ; lon:units = "degrees_east" ; lon:standard_name = "longitude" ;
  float t2m(time, number, y, x) ; t2m:units = "K" ; t2m:coordinates = "lat lon" ;
data:
  time = 0, 6 ; number = 0, 1 ;
  lat = -10, -10.1, -10.2, -10.3, -9, -9.1, -9.2, -9.3, -8, -8.1, -8.2, -8.3 ;
  lon = 10, 11, 12, 13, 10.1, 11.1, 12.1, 13.1, 10.2, 11.2, 12.2, 13.2 ;
  t2m = ${values.join(', ')} ;
}
`;
  writeFileSync(join(tmp, 'curvilinear.cdl'), cdl);
  const file = join(tmp, 'curvilinear.nc');
  execFileSync('ncgen', ['-o', file, join(tmp, 'curvilinear.cdl')]);
  return file;
}

describe('a curvilinear grid', () => {
  it('is refused in one line with a cdo remapbil command that, run as printed, gives a file that reads = cdo', async () => {
    const file = curvilinear();
    const box = { south: -10, north: -8, west: 10, east: 13 };
    const message = await extractBoxJson(file, { variable: 't2m', box }).then(
      () => 'read',
      (e: Error) => e.message,
    );
    expect(message.split('\n')).toHaveLength(1);
    expect(message).toContain(`${file}: latitude variable 'lat' has 2 dimensions (curvilinear grid)`);
    const command = /(cdo remapbil,\S+ \S+ \S+)/.exec(message)?.[1];
    expect(command).toBe(`cdo remapbil,r360x180 ${file} regular.nc`);
    execFileSync('sh', ['-c', `${command!.replace('cdo ', 'cdo -s ')}`], { cwd: tmp });
    const regular = join(tmp, 'regular.nc');
    const got = await extractBoxJson(regular, { variable: 't2m', box });
    const cdo = execFileSync('cdo', ['-s', '--precision', '12', 'outputtab,lev,value', '-fldmean', '-sellonlatbox,10,13,-10,-8', regular], {
      encoding: 'utf8',
    })
      .split('\n')
      .filter((l) => l.trim() && !l.startsWith('#'))
      .map((l) => l.trim().split(/\s+/).map(Number));
    expect(got.members).toHaveLength(2);
    // cdo prints step-major rows (step 0: members 0, 1; step 1: …)
    cdo.forEach(([member, kelvin], row) => {
      const step = Math.floor(row / 2);
      expect(Math.abs((got.members[member][step] as number) + 273.15 - kelvin)).toBeLessThanOrEqual(1e-4);
    });
    expect(cdo).toHaveLength(4);
  });
});
