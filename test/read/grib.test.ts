/**
 * GRIB2 and GRIB1 sources through ecCodes (Debian libeccodes-tools 2.28): fixtures written by ecCodes' own
 * grib_filter from its samples regular_ll_sfc_grib2.tmpl / regular_ll_sfc_grib1.tmpl (test/read/grib/make-grib.py), converted once by Forelight into the
 * sha256-keyed cache with grib_copy + grib_to_netcdf, and checked against an independent reading of the same GRIB
 * file by python3-cfgrib + xarray (test/read/grib/cfgrib-box.py), within 1e-4 K.
 * Conventions: ecCodes parameter database (paramId 167 = 2 m temperature, cfVarName t2m); GRIB2 product definition
 * templates 4.0 (deterministic) and 4.1 (ensemble member, perturbationNumber), WMO Manual on Codes FM 92.
 */
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, truncateSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { extractBoxJson, extractRegionSeries } from '../../src/read/extract.ts';
import { openDataset } from '../../src/read/open-dataset.ts';

const HERE = import.meta.dirname;
const tmp = mkdtempSync(join(tmpdir(), 'forelight-grib-'));
const cache = join(tmp, 'cache');
const previousCache = process.env.FORELIGHT_GRIB_CACHE;
beforeAll(() => {
  process.env.FORELIGHT_GRIB_CACHE = cache;
});
afterAll(() => {
  if (previousCache === undefined) delete process.env.FORELIGHT_GRIB_CACHE;
  else process.env.FORELIGHT_GRIB_CACHE = previousCache;
  rmSync(tmp, { recursive: true, force: true });
});

function makeGrib(name: string, members: number, steps: string, ...flags: ('deterministic' | 'edition1' | 'mx2t6+tp')[]): string {
  const out = join(tmp, name);
  execFileSync('/usr/bin/python3', [join(HERE, 'grib/make-grib.py'), out, String(members), steps, ...flags]);
  return out;
}

interface Reference {
  times: string[];
  members: number[][];
}
type Box = { south: number; north: number; west: number; east: number };
function cfgrib(file: string, box: Box, daily?: string, variable = 't2m'): Reference {
  const args = [
    join(HERE, 'grib/cfgrib-box.py'),
    file,
    variable,
    String(box.south),
    String(box.north),
    String(box.west),
    String(box.east),
    ...(daily ? [daily] : []),
  ];
  return JSON.parse(execFileSync('/usr/bin/python3', args, { encoding: 'utf8' })) as Reference;
}

const ensemble = makeGrib('ens.grib2', 3, '0,6,12,18,24,30,36,42,48');
const boxes = [
  { what: 'box across 0° on the 0..360 GRIB grid', box: { south: -12, north: -6, west: -10, east: 10 } },
  { what: 'box across 180°', box: { south: -15, north: -3, west: 172, east: -174 } },
];

describe('GRIB2 ensemble (template 4.1) against cfgrib/xarray', () => {
  it.each(boxes)('per member and step: $what', async ({ box }) => {
    const got = await extractBoxJson(ensemble, { variable: 't2m', box });
    const ref = cfgrib(ensemble, box);
    expect(got.units).toBe('degC');
    expect(got.times.map((t) => t.slice(0, 19))).toEqual(ref.times);
    expect(got.members).toHaveLength(3);
    got.members.forEach((row, m) =>
      row.forEach((v, t) => expect(Math.abs((v as number) + 273.15 - ref.members[m][t])).toBeLessThanOrEqual(1e-4)),
    );
  });

  it('daily maximum per cell, then the box mean (UTC days; the incomplete last day is dropped)', async () => {
    const box = boxes[0].box;
    const got = await extractBoxJson(ensemble, { variable: 't2m', box, daily: 'max' });
    const ref = cfgrib(ensemble, box, 'max');
    expect(got.times).toEqual(['2026-11-23', '2026-11-24']);
    got.members.forEach((row, m) =>
      row.forEach((v, t) => expect(Math.abs((v as number) + 273.15 - ref.members[m][t])).toBeLessThanOrEqual(1e-4)),
    );
  });

  it('is converted once, into a folder named by the conversion version and the sha256 of the GRIB file', async () => {
    const sha = createHash('sha256').update(readFileSync(ensemble)).digest('hex');
    await extractBoxJson(ensemble, { variable: 't2m', box: boxes[0].box });
    const folder = join(cache, `v2-${sha}`);
    expect(readdirSync(cache)).toContain(`v2-${sha}`);
    const before = readdirSync(folder).map((f) => statSync(join(folder, f)).mtimeMs);
    await extractBoxJson(ensemble, { variable: 't2m', box: boxes[0].box });
    expect(readdirSync(folder).map((f) => statSync(join(folder, f)).mtimeMs)).toEqual(before);
    expect(readdirSync(folder)).toEqual(['m0.nc', 'm1.nc', 'm2.nc']);
  });

  it('states the forecast reference time of the GRIB message even when the first step is 24 h', async () => {
    const late = makeGrib('from-step-24.grib2', 2, '24,48,72');
    const regions = [{ id: 'r', name: 'r', shape: { kind: 'box' as const, ...boxes[0].box }, utcOffsetHours: 0, teams: [] }];
    const r = await extractRegionSeries(late, { quantities: { tmean: 't2m' }, regions, referenceTime: '2026-11-23' });
    expect(r.problems).toEqual([]);
    expect(r.series[0].provenance.referenceTime).toBe('2026-11-23T00:00:00Z');
    expect(r.series[0].members).toBe(2);
    await expect(extractRegionSeries(late, { quantities: { tmean: 't2m' }, regions, referenceTime: '2026-11-24' })).rejects.toThrow(
      /holds the forecast of 2026-11-23T00:00:00Z/,
    );
  });
});

describe('GRIB1 and GRIB2 period parameters against cfgrib/xarray', () => {
  it.each(boxes)('a GRIB1 ensemble (ECMWF local definition 1, marsType pf, number) per member and step: $what', async ({ box }) => {
    const grib1 = makeGrib('ens1.grib', 3, '0,6,12,18,24,30,36,42,48', 'edition1');
    const got = await extractBoxJson(grib1, { variable: 't2m', box });
    const ref = cfgrib(grib1, box);
    expect(got.times.map((t) => t.slice(0, 19))).toEqual(ref.times);
    expect(got.members).toHaveLength(3);
    got.members.forEach((row, m) =>
      row.forEach((v, t) => expect(Math.abs((v as number) + 273.15 - ref.members[m][t])).toBeLessThanOrEqual(1e-4)),
    );
  });

  // ecCodes parameter database: mx2t6 (paramId 121) is the maximum over the 6 h before its step, tp (228) the
  // accumulation in metres since the reference time (GRIB2 template 4.11, stepRange "0-6", "0-12", …); grib_to_netcdf
  // keeps neither stepType, so they are read by the step semantics of src/read/DECISIONS.md §1.3 and §2.3.
  it.each([
    { what: 'steps 6 … 48 only', steps: '6,12,18,24,30,36,42,48' },
    { what: 'with a step-0 field', steps: '0,6,12,18,24,30,36,42,48' },
  ])('GRIB2 6-h maxima and accumulated total precipitation ($what): daily max and rain per member = cfgrib', async ({ steps }) => {
    const file = makeGrib(`periods-${steps.length}.grib2`, 3, steps, 'mx2t6+tp');
    // edges on cell edges (3° x 1.5° cells), so the region's overlap weights are the whole cells cfgrib-box.py takes
    const box = { south: -12.75, north: -5.25, west: -10.5, east: 10.5 };
    const regions = [{ id: 'r', name: 'r', shape: { kind: 'box' as const, ...box }, utcOffsetHours: 0, teams: [] }];
    const r = await extractRegionSeries(file, { quantities: { tmax: 'mx2t6', precip: 'tp' }, regions, referenceTime: '2026-11-23' });
    expect(r.problems).toEqual([]);
    for (const [quantity, variable, daily, toCanonical] of [
      ['tmax', 'mx2t6', 'period-max', (k: number) => k - 273.15],
      ['precip', 'tp', 'accum-sum', (metres: number) => metres * 1000],
    ] as const) {
      const series = r.series.find((s) => s.quantity === quantity);
      const ref = cfgrib(file, box, daily, variable);
      expect(series?.days).toEqual(['2026-11-23', '2026-11-24']);
      expect(ref.times).toEqual(['2026-11-23T00:00:00', '2026-11-24T00:00:00']);
      expect(series?.members).toBe(3);
      ref.members.forEach((row, m) =>
        row.forEach((v, d) => expect(Math.abs((series?.data[m * 2 + d] ?? NaN) - toCanonical(v))).toBeLessThanOrEqual(1e-4)),
      );
    }
  });
});

describe('other GRIB cases', () => {
  it('a deterministic GRIB2 file (template 4.0, no perturbationNumber) is one member, equal to cfgrib', async () => {
    const single = makeGrib('det.grb2', 1, '0,12,24', 'deterministic');
    const got = await extractBoxJson(single, { variable: 't2m', box: boxes[0].box });
    const ref = cfgrib(single, boxes[0].box);
    expect(got.members).toHaveLength(1);
    got.members[0].forEach((v, t) => expect(Math.abs((v as number) + 273.15 - ref.members[0][t])).toBeLessThanOrEqual(1e-4));
  });

  // grib_to_netcdf -T writes the starts of a file of several dates as date(date) "Base_date"; Forelight reads it as a
  // file of several forecast reference times (CF 1.11 §4.4; src/read/DECISIONS.md §4b), like cfgrib's `time` axis.
  it('a GRIB file of two start dates: each start (--start K) = cfgrib of that date; as a forecast it is refused with a grib_copy split that reads', async () => {
    const other = join(tmp, 'other-year.grib2');
    execFileSync('/usr/bin/grib_set', ['-s', 'dataDate=20251123', ensemble, other]);
    const both = join(tmp, 'two-dates.grib2');
    execFileSync('sh', ['-c', `cat ${ensemble} ${other} > ${both}`]);
    const box = boxes[0].box;
    const expectAsCfgrib = (got: { times: string[]; members: (number | null)[][] }, ref: Reference) => {
      expect(got.times.map((t) => t.slice(0, 19))).toEqual(ref.times);
      got.members.forEach((row, m) =>
        row.forEach((v, t) => expect(Math.abs((v as number) + 273.15 - ref.members[m][t])).toBeLessThanOrEqual(1e-4)),
      );
    };
    const message = await extractBoxJson(both, { variable: 't2m', box }).then(
      () => 'read',
      (e: Error) => e.message,
    );
    expect(message.split('\n')).toHaveLength(1);
    expect(message).toContain(`${both}: 'date' holds 2 forecast reference times (one file of several starts)`);
    const split = /(grib_copy \S+ '\S+'), and point forecast-files at (\S+)/.exec(message);
    expect(split?.[2]).toBe(join(tmp, 'two-dates_{date}.grib2'));
    execFileSync('sh', ['-c', split![1]]);
    for (const [k, date, single] of [
      [0, '20251123', other],
      [1, '20261123', ensemble],
    ] as const) {
      const part = split![2].replace('{date}', date);
      expectAsCfgrib(await extractBoxJson(part, { variable: 't2m', box }), cfgrib(single, box));
      expectAsCfgrib(await extractBoxJson(both, { variable: 't2m', box, startIndex: k }), cfgrib(single, box));
    }
  });

  it('pressure levels (ecCodes sample regular_ll_pl_grib2.tmpl, 850 and 500 hPa) are refused with a grib_copy selection that, run as printed, reads = cfgrib', async () => {
    const sample = '/usr/share/eccodes/samples/regular_ll_pl_grib2.tmpl';
    const levels = [850, 500].map((level) => {
      const out = join(tmp, `t${level}.grib2`);
      execFileSync('/usr/bin/grib_set', ['-s', `level=${level},dataDate=20261123`, '-d', String(level / 3.4), sample, out]);
      return out;
    });
    const file = join(tmp, 'levels.grib2');
    execFileSync('sh', ['-c', `cat ${levels.join(' ')} > ${file}`]);
    const box = { south: 20, north: 40, west: 4, east: 20 };
    const message = await extractBoxJson(file, { variable: 't', box }).then(
      () => 'read',
      (e: Error) => e.message,
    );
    expect(message).toContain(`${file}: variable 't' has extra dimension 'level' of size 2`);
    const fix = /(grib_ls -p level \S+) lists them, (grib_copy -w level=)<one of them> (\S+ \S+) keeps/.exec(message);
    expect(execFileSync('sh', ['-c', fix![1]], { encoding: 'utf8' })).toMatch(/850[\s\S]*500/);
    execFileSync('sh', ['-c', `${fix![2]}850 ${fix![3]}`], { cwd: tmp });
    const got = await extractBoxJson(join(tmp, 'out.grib2'), { variable: 't', box });
    const ref = cfgrib(join(tmp, 'out.grib2'), box, undefined, 't');
    expect(Math.abs((got.members[0][0] as number) + 273.15 - 850 / 3.4)).toBeLessThanOrEqual(1e-3);
    expect(Math.abs((got.members[0][0] as number) + 273.15 - ref.members[0][0])).toBeLessThanOrEqual(1e-4);
  });

  it('a truncated GRIB file is refused in one line naming the file and what to do', async () => {
    const cut = join(tmp, 'cut.grib2');
    copyFileSync(ensemble, cut);
    truncateSync(cut, Math.floor(statSync(ensemble).size / 2) + 7);
    const err = await openDataset(cut).then(
      () => null,
      (e: Error) => e,
    );
    expect(err?.message).toMatch(/cut\.grib2/);
    expect(err?.message).toMatch(/ecCodes grib_(copy|to_netcdf) could not convert/);
    expect(err?.message.split('\n')).toHaveLength(1);
  });

  it('without ecCodes installed the error names the Debian package', async () => {
    const fresh = join(tmp, 'fresh.grib2');
    copyFileSync(ensemble, fresh);
    execFileSync('/usr/bin/grib_set', ['-s', 'dataTime=1200', ensemble, fresh]); // another checksum: not in the cache
    const path = process.env.PATH;
    process.env.PATH = join(tmp, 'no-tools-here');
    try {
      await expect(openDataset(fresh)).rejects.toThrow(/install the Debian package libeccodes-tools/);
    } finally {
      process.env.PATH = path;
    }
  });
});
