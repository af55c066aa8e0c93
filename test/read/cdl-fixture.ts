/**
 * Small gridded ensemble files written by netCDF-C's `ncgen` from CDL text (never by Forelight's writer), and
 * CDO run on them, for the time-convention tests. Layout (time, number, lat, lon), as CDO expects (it puts
 * `number` on its z axis: one output line per member).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface CdlVariable {
  readonly attributes: Readonly<Record<string, string | number>>;
  /** Value of member m, step t, latitude index y, longitude index x (NaN = _FillValue). */
  readonly value: (m: number, t: number, y: number, x: number) => number;
}

export interface CdlSpec {
  readonly timeUnits: string;
  readonly calendar?: string;
  readonly times: readonly number[];
  /** [start, end] per step, in timeUnits: writes time_bnds. */
  readonly bounds?: readonly (readonly [number, number])[];
  /** forecast_reference_time in timeUnits, or omitted. */
  readonly reference?: number;
  readonly members?: number;
  readonly variables: Readonly<Record<string, CdlVariable>>;
}

export const LAT = [-10, -8, -6, -4];
export const LON = [10, 12, 14, 16, 18, 20];
/** A box holding the cells at -8, -6 °N and 12, 14, 16 °E. */
export const BOX = { south: -9, north: -5, west: 11, east: 17 };
export const CDO_BOX = `${BOX.west},${BOX.east},${BOX.south},${BOX.north}`;

const attr = (owner: string, key: string, v: string | number): string =>
  `    ${owner}:${key} = ${typeof v === 'number' ? String(v) : JSON.stringify(v)} ;`;

/** The CDL text of `spec` (floats with 6 decimals; NaN written as the _FillValue -9999). */
export function cdlText(spec: CdlSpec): string {
  const members = spec.members ?? 2;
  const nt = spec.times.length;
  const lines = [
    'netcdf fixture {',
    'dimensions:',
    `  time = ${nt} ;`,
    `  number = ${members} ;`,
    `  lat = ${LAT.length} ;`,
    `  lon = ${LON.length} ;`,
  ];
  if (spec.bounds) lines.push('  bnds = 2 ;');
  lines.push(
    'variables:',
    '  double time(time) ;',
    attr('time', 'units', spec.timeUnits),
    attr('time', 'calendar', spec.calendar ?? 'standard'),
    attr('time', 'standard_name', 'time'),
    attr('time', 'axis', 'T'),
  );
  if (spec.bounds) lines.push(attr('time', 'bounds', 'time_bnds'), '  double time_bnds(time, bnds) ;');
  if (spec.reference !== undefined) {
    lines.push(
      '  double forecast_reference_time ;',
      attr('forecast_reference_time', 'units', spec.timeUnits),
      attr('forecast_reference_time', 'calendar', spec.calendar ?? 'standard'),
      attr('forecast_reference_time', 'standard_name', 'forecast_reference_time'),
    );
  }
  lines.push(
    '  int number(number) ;',
    attr('number', 'standard_name', 'realization'),
    '  double lat(lat) ;',
    attr('lat', 'units', 'degrees_north'),
    attr('lat', 'standard_name', 'latitude'),
    '  double lon(lon) ;',
    attr('lon', 'units', 'degrees_east'),
    attr('lon', 'standard_name', 'longitude'),
  );
  for (const [name, v] of Object.entries(spec.variables)) {
    lines.push(`  float ${name}(time, number, lat, lon) ;`, `    ${name}:_FillValue = -9999.f ;`);
    for (const [k, a] of Object.entries(v.attributes)) lines.push(attr(name, k, a));
  }
  lines.push('data:', `  time = ${spec.times.join(', ')} ;`);
  if (spec.bounds) lines.push(`  time_bnds = ${spec.bounds.map((b) => b.join(', ')).join(', ')} ;`);
  if (spec.reference !== undefined) lines.push(`  forecast_reference_time = ${spec.reference} ;`);
  lines.push(
    `  number = ${Array.from({ length: members }, (_, m) => m).join(', ')} ;`,
    `  lat = ${LAT.join(', ')} ;`,
    `  lon = ${LON.join(', ')} ;`,
  );
  for (const [name, v] of Object.entries(spec.variables)) {
    const values: string[] = [];
    for (let t = 0; t < nt; t++)
      for (let m = 0; m < members; m++)
        for (let y = 0; y < LAT.length; y++)
          for (let x = 0; x < LON.length; x++) {
            const value = v.value(m, t, y, x);
            values.push(Number.isNaN(value) ? '-9999' : value.toFixed(6));
          }
    lines.push(`  ${name} = ${values.join(', ')} ;`);
  }
  lines.push('}');
  return lines.join('\n');
}

/** Writes `spec` with `ncgen` (classic format) into a fresh temp folder; returns the .nc path. */
export function ncgenFixture(name: string, spec: CdlSpec, dir = mkdtempSync(join(tmpdir(), 'forelight-time-'))): string {
  const cdl = join(dir, `${name}.cdl`);
  writeFileSync(cdl, cdlText(spec));
  const nc = join(dir, `${name}.nc`);
  execFileSync('ncgen', ['-o', nc, cdl]);
  return nc;
}

/** Runs `cdo -s --precision 12 outputtab,date,lev,value <operators…> file` and parses it into dates and [member][step] values. */
export function cdoTable(operators: readonly string[], file: string): { dates: string[]; members: number[][] } {
  const text = execFileSync('cdo', ['-s', '--precision', '12', 'outputtab,date,lev,value', ...operators, file], { encoding: 'utf8' });
  const members: number[][] = [];
  const dates: string[] = [];
  for (const line of text.split('\n')) {
    const f = line.trim().split(/\s+/);
    if (line.startsWith('#') || f.length < 3) continue;
    const lev = Number(f[1]);
    (members[lev] ??= []).push(Number(f[2]));
    if (lev === 0) dates.push(f[0]);
  }
  return { dates, members };
}
