/**
 * Which period a value covers, and period totals vs running accumulations, on files written by netCDF-C's
 * `ncgen` (test/read/cdl-fixture.ts), compared with Debian's CDO on the same file within 1e-4.
 * CDO dates a value by its stamp, so end-stamped periods are compared after `-shifttime,-1sec` (the stamp
 * moved into the period it closes); running accumulations after `-deltat` (difference to the previous step).
 * Conventions and sources: src/read/DECISIONS.md.
 */
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import type { RegionConfig } from '../../src/config/types.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';
import type { Quantity, RegionSeries } from '../../src/types.ts';
import { BOX, CDO_BOX, cdoTable, ncgenFixture, type CdlSpec } from './cdl-fixture.ts';

const TOL = 1e-4;
const KELVIN = 273.15;

const region = (utcOffsetHours = 0): RegionConfig => ({
  id: 'box',
  name: 'box',
  shape: { kind: 'box', ...BOX },
  utcOffsetHours,
  teams: [],
});

/** A smooth, member- and cell-dependent temperature in K. */
const temperature = (m: number, t: number, y: number, x: number): number =>
  290 + 5 * Math.sin(0.7 * t + y) + 0.3 * x + 0.5 * m + 0.1 * ((7 * t + 3 * y + 5 * x) % 11);
/** Per-step rain in mm (never negative). */
const rainMm = (m: number, t: number, y: number, x: number): number => ((13 * t + 7 * y + 3 * x + 5 * m) % 17) * 0.37;
/** Rain accumulated since step 0 (value 0 at step 0), in metres. */
const accumulatedM = (m: number, t: number, y: number, x: number): number => {
  let sum = 0;
  for (let k = 1; k <= t; k++) sum += rainMm(m, k, y, x);
  return sum / 1000;
};

async function readOne(
  file: string,
  quantity: Quantity,
  variable: string,
  referenceTime: string,
  utcOffsetHours = 0,
): Promise<RegionSeries> {
  const r = await extractRegionSeries(file, { quantities: { [quantity]: variable }, regions: [region(utcOffsetHours)], referenceTime });
  if (r.problems.length) throw r.problems[0];
  return r.series[0];
}

/** Our series equals CDO's rows from `cdoFrom` on (dates and values), after `shift` (K → °C: -273.15). */
function expectSameAsCdo(got: RegionSeries, cdo: { dates: string[]; members: number[][] }, cdoFrom = 0, shift = 0): void {
  expect(got.days).toEqual(cdo.dates.slice(cdoFrom, cdoFrom + got.days.length));
  expect(got.members).toBe(cdo.members.length);
  for (let m = 0; m < got.members; m++) {
    for (let d = 0; d < got.days.length; d++)
      expect(Math.abs(got.data[m * got.days.length + d] - (cdo.members[m][cdoFrom + d] + shift))).toBeLessThanOrEqual(TOL);
  }
}

const daily = (times: number[]): CdlSpec['times'] => times;
const hours = (from: number, step: number, n: number): number[] => Array.from({ length: n }, (_, i) => from + i * step);

describe('end-of-period stamps without bounds (GRIB step semantics; CF 1.11 §7.3 cell_methods)', () => {
  const tmax24 = (times: number[], attributes: Record<string, string> = { cell_methods: 'time: maximum' }): CdlSpec => ({
    timeUnits: 'hours since 2026-11-23 00:00:00',
    times: daily(times),
    variables: { mx2t24: { attributes: { units: 'K', standard_name: 'air_temperature', ...attributes }, value: temperature } },
  });

  it('24-h maxima stamped at 24, 48 … h, no step 0, no forecast_reference_time: dated the day before the stamp and accepted as the forecast of the 23rd', async () => {
    const file = ncgenFixture('tmax24', tmax24(hours(24, 24, 5)));
    const got = await readOne(file, 'tmax', 'mx2t24', '2026-11-23');
    expect(got.days).toEqual(['2026-11-23', '2026-11-24', '2026-11-25', '2026-11-26', '2026-11-27']);
    expect(got.provenance.referenceTime).toBe('2026-11-23T00:00:00Z');
    expectSameAsCdo(got, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymax', '-shifttime,-1sec'], file), 0, KELVIN * -1);
  });

  it('the same with a step-0 field: step 0 is no day of its own (CDO puts it on the 22nd)', async () => {
    const file = ncgenFixture('tmax24-step0', tmax24(hours(0, 24, 6)));
    const got = await readOne(file, 'tmax', 'mx2t24', '2026-11-23');
    const cdo = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymax', '-shifttime,-1sec'], file);
    expect(cdo.dates[0]).toBe('2026-11-22');
    expectSameAsCdo(got, cdo, 1, -KELVIN);
  });

  it('no cell_methods at all: a variable mapped to tmax is a maximum over the period before its stamp (step semantics)', async () => {
    const file = ncgenFixture('tmax24-bare', tmax24(hours(24, 24, 4), {}));
    const got = await readOne(file, 'tmax', 'mx2t24', '2026-11-23');
    expectSameAsCdo(got, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymax', '-shifttime,-1sec'], file), 0, -KELVIN);
  });

  it('cfgrib\'s GRIB_stepType "max" marks the period maximum (ecCodes stepType key)', async () => {
    const file = ncgenFixture('tmax24-grib', tmax24(hours(24, 24, 4), { GRIB_stepType: 'max' }));
    const got = await readOne(file, 'tmean', 'mx2t24', '2026-11-23');
    expectSameAsCdo(got, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymean', '-shifttime,-1sec'], file), 0, -KELVIN);
  });

  it('6-h maxima "time: maximum (interval: 6 hours)" stamped 06…72 Z: UTC days and UTC-6 local days = cdo daymax after shifttime', async () => {
    const file = ncgenFixture('tmax6', tmax24(hours(6, 6, 12), { cell_methods: 'time: maximum (interval: 6 hours)' }));
    const utc = await readOne(file, 'tmax', 'mx2t24', '2026-11-23');
    expect(utc.days).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
    expectSameAsCdo(utc, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymax', '-shifttime,-1sec'], file), 0, -KELVIN);
    const local = await readOne(file, 'tmax', 'mx2t24', '2026-11-23', -6);
    const cdoLocal = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymax', '-shifttime,-21601sec'], file);
    expect(local.days).toEqual(['2026-11-23', '2026-11-24']);
    expectSameAsCdo(local, cdoLocal, 1, -KELVIN);
  });

  it('a 6-hourly file whose cell_methods gives 24-h periods (overlapping) is refused, and the suggested ncks selection reads', async () => {
    const file = ncgenFixture('tmax-running', tmax24(hours(6, 6, 12), { cell_methods: 'time: maximum (interval: 24 hours)' }));
    const r = await extractRegionSeries(file, { quantities: { tmax: 'mx2t24' }, regions: [region()], referenceTime: '2026-11-23' });
    expect(r.problems[0].message).toMatch(/mx2t24.*24-hour periods but the steps are 6 hours apart.*ncks -d time,3,,4/);
    const fixed = file.replace('.nc', '-every4.nc');
    execFileSync('ncks', ['-O', '-d', 'time,3,,4', file, fixed]);
    const got = await readOne(fixed, 'tmax', 'mx2t24', '2026-11-23');
    expectSameAsCdo(got, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daymax', '-shifttime,-1sec'], fixed), 0, -KELVIN);
  });

  it('a forecast of the 22nd (24-h maxima stamped from the 23rd) asked for as the 24th is refused, naming the 22nd', async () => {
    const spec = { ...tmax24(hours(24, 24, 3)), timeUnits: 'hours since 2026-11-22 00:00:00' };
    await expect(
      extractRegionSeries(ncgenFixture('tmax-yesterday', spec), {
        quantities: { tmax: 'mx2t24' },
        regions: [region()],
        referenceTime: '2026-11-24',
      }),
    ).rejects.toThrow(/holds the forecast of 2026-11-22T00:00:00Z but 2026-11-24T00:00:00Z was requested/);
  });
});

describe('period totals vs running accumulations (CF 1.11 §7.1 bounds, §7.3 time: sum; GRIB total precipitation)', () => {
  const precip = (
    times: number[],
    value: CdlSpec['variables'][string]['value'],
    attributes: Record<string, string>,
    bounds?: [number, number][],
  ): CdlSpec => ({
    timeUnits: 'hours since 2026-11-23 00:00:00',
    times,
    bounds,
    variables: { tp: { attributes: { standard_name: 'precipitation_amount', ...attributes }, value } },
  });

  it('24-h totals in mm stamped at their end with a step-0 field: no extra leading day', async () => {
    const file = ncgenFixture(
      'tp24',
      precip(hours(0, 24, 6), (m, t, y, x) => (t === 0 ? 0 : rainMm(m, t, y, x)), { units: 'mm' }),
    );
    const got = await readOne(file, 'precip', 'tp', '2026-11-23');
    expect(got.days[0]).toBe('2026-11-23');
    expect(got.days).toHaveLength(5);
    expectSameAsCdo(got, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daysum', '-shifttime,-1sec'], file), 1);
  });

  it('6-hourly accumulation since the start in m with step 0: differenced (= cdo deltat), in local days', async () => {
    const file = ncgenFixture('tp-acc', precip(hours(0, 6, 13), accumulatedM, { units: 'm' }));
    const got = await readOne(file, 'precip', 'tp', '2026-11-23');
    expect(got.days).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
    expectSameAsCdo(got, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-mulc,1000', '-daysum', '-shifttime,-1sec', '-deltat'], file));
    for (const v of got.data) expect(v).toBeGreaterThanOrEqual(0);
  });

  it('per-period totals in m with "time: sum" and 6-h bounds not starting at the reference: summed, not differenced', async () => {
    const times = hours(6, 6, 12);
    const file = ncgenFixture(
      'tp-sum',
      precip(
        times,
        (m, t, y, x) => rainMm(m, t + 1, y, x) / 1000,
        { units: 'm', cell_methods: 'time: sum' },
        times.map((h) => [h - 6, h]),
      ),
    );
    const got = await readOne(file, 'precip', 'tp', '2026-11-23');
    expectSameAsCdo(got, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-mulc,1000', '-daysum', '-shifttime,-1sec'], file));
  });

  it('equal-length bounds alone (no cell_methods) also mark totals; bounds all starting at the reference mark an accumulation', async () => {
    const times = hours(6, 6, 8);
    const totals = ncgenFixture(
      'tp-bnds',
      precip(
        times,
        (m, t, y, x) => rainMm(m, t + 1, y, x) / 1000,
        { units: 'm' },
        times.map((h) => [h - 6, h]),
      ),
    );
    expectSameAsCdo(
      await readOne(totals, 'precip', 'tp', '2026-11-23'),
      cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-mulc,1000', '-daysum', '-shifttime,-1sec'], totals),
    );
    const running = ncgenFixture(
      'tp-bnds-acc',
      precip(
        times,
        (m, t, y, x) => accumulatedM(m, t + 1, y, x) + rainMm(m, 0, y, x) / 1000,
        { units: 'kg m-2', cell_methods: 'time: sum' },
        times.map((h) => [0, h]),
      ),
    );
    const got = await readOne(running, 'precip', 'tp', '2026-11-23');
    // numpy-free check: the day's total is the accumulation at 24 h (kg m-2 = mm), then its increase to 48 h.
    const cdoAcc = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-seltimestep,4,8'], running);
    for (let m = 0; m < 2; m++) {
      expect(Math.abs(got.data[m * 2] - cdoAcc.members[m][0])).toBeLessThanOrEqual(TOL);
      expect(Math.abs(got.data[m * 2 + 1] - (cdoAcc.members[m][1] - cdoAcc.members[m][0]))).toBeLessThanOrEqual(TOL);
    }
  });

  // Rule 4 of src/read/DECISIONS.md §2 (common practice, no source): an unlabelled amount in mm that never
  // decreases from a zero start over the whole grid and every member is a running accumulation.
  it.each([
    ['with a zero step-0 field', hours(0, 6, 13)],
    ['without step 0 (implied zero at the reference)', hours(6, 6, 12)],
  ])(
    'an unlabelled running accumulation in mm, %s: differenced (= cdo deltat), never summed, and said in the notes',
    async (_case, times) => {
      const file = ncgenFixture(
        `tp-acc-mm-${times[0]}`,
        precip(times, (m, t, y, x) => 1000 * accumulatedM(m, t + (times[0] === 0 ? 0 : 1), y, x), { units: 'mm' }),
      );
      const r = await extractRegionSeries(file, { quantities: { precip: 'tp' }, regions: [region()], referenceTime: '2026-11-23' });
      expect(r.problems).toEqual([]);
      const got = r.series[0];
      expect(got.days).toEqual(['2026-11-23', '2026-11-24', '2026-11-25']);
      expect(r.notes.join('\n')).toMatch(/'tp' states no period .* read as accumulated since the start/);
      // cdo deltat drops the first step: without a step 0 the first value is itself the first step's amount.
      const deltas = times[0] === 0 ? ['-deltat'] : [];
      if (times[0] === 0)
        expectSameAsCdo(got, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daysum', '-shifttime,-1sec', ...deltas], file));
      else {
        // The day's total is the accumulation at 24 h, then its increase to 48 h and to 72 h (read from cdo).
        const acc = cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-seltimestep,4,8,12'], file);
        for (let m = 0; m < got.members; m++) {
          const want = [acc.members[m][0], acc.members[m][1] - acc.members[m][0], acc.members[m][2] - acc.members[m][1]];
          want.forEach((w, d) => expect(Math.abs(got.data[m * 3 + d] - w)).toBeLessThanOrEqual(TOL));
        }
      }
      for (const v of got.data) expect(v).toBeGreaterThanOrEqual(0);
    },
  );

  it('unlabelled totals in mm that fall somewhere on the grid stay totals (summed = cdo daysum)', async () => {
    const file = ncgenFixture(
      'tp-mm-totals',
      precip(hours(6, 6, 12), (m, t, y, x) => rainMm(m, t + 1, y, x), { units: 'mm' }),
    );
    const r = await extractRegionSeries(file, { quantities: { precip: 'tp' }, regions: [region()], referenceTime: '2026-11-23' });
    expect(r.notes.join('\n')).not.toMatch(/read as accumulated/);
    expectSameAsCdo(r.series[0], cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-daysum', '-shifttime,-1sec'], file));
  });

  it('a decreasing accumulation is an error naming file, variable, member and step; the suggested ncatted fix reads it as totals', async () => {
    const file = ncgenFixture(
      'tp-decrease',
      precip(hours(6, 6, 8), (m, t, y, x) => rainMm(m, t + 1, y, x) / 1000, { units: 'm' }),
    );
    const r = await extractRegionSeries(file, { quantities: { precip: 'tp' }, regions: [region()], referenceTime: '2026-11-23' });
    expect(r.series).toHaveLength(0);
    const message = r.problems[0].message;
    expect(message).toContain(file);
    expect(message).toMatch(/variable 'tp' member index 0 step \d+ \(valid 2026-11-2\dT\d\d:00:00Z\) is [\d.]+ mm below the step before/);
    const fix = /\((ncatted [^)]*)\)/.exec(message)![1];
    execFileSync('sh', ['-c', fix]);
    const got = await readOne(file, 'precip', 'tp', '2026-11-23');
    expectSameAsCdo(got, cdoTable(['-fldmean', `-sellonlatbox,${CDO_BOX}`, '-mulc,1000', '-daysum', '-shifttime,-1sec'], file));
  });
});
