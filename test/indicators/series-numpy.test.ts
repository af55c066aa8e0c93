/**
 * EHF, hot-day runs and heat load over a multi-member series against an independent numpy computation.
 * Reference: test/indicators/numpy_ehf_reference.py, run as
 *   /usr/bin/python3 test/indicators/numpy_ehf_reference.py <input.json>
 * (numpy 1.24, Debian python3-numpy). Input series are invented (seeded generator), no real data.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ehfClimatology } from '../../src/indicators/climatology.ts';
import { computeIndicator, type IndicatorContext } from '../../src/indicators/compute.ts';
import { addDays, dayOfYearSlot } from '../../src/core/iso-dates.ts';
import { percentileLinear } from '../../src/core/percentile.ts';
import { dayList, indicator, inputsOf, regionSeries, rng } from './fixtures.ts';

const MEMBERS = 6;
const STEPS = 45;
const days = dayList('2026-11-23', STEPS);
const rand = rng(20261123);
const tmax = new Float64Array(MEMBERS * STEPS);
const tmin = new Float64Array(MEMBERS * STEPS);
for (let m = 0; m < MEMBERS; m++) {
  for (let i = 0; i < STEPS; i++) {
    const wave = i >= 10 + m && i < 16 + 2 * m ? 6 : 0; // an invented heatwave, longer in later members
    tmax[m * STEPS + i] = 31 + 2 * Math.sin(i / 5) + wave + 3 * (rand() - 0.5);
    tmin[m * STEPS + i] = tmax[m * STEPS + i] - 9 + 2 * (rand() - 0.5);
  }
}
const antecedentDmt = Float64Array.from({ length: 30 }, () => 25 + 2 * rand());
const climatologyDmt = Float64Array.from({ length: 600 }, () => 22 + 6 * rand());
const tmaxAntecedent = Float64Array.from({ length: 8 }, () => 31 + 4 * rand());
/** Invented day-of-year threshold; crosses the new year (slot 365 → 0) inside the series. */
const thresholdC = (date: string): number => 32.5 + 0.004 * dayOfYearSlot(date);
const LOAD_WINDOW = 5;
/** Invented 4-year reference period with seasonal cycle and noise. */
const climTmax = Float64Array.from({ length: 4 * 365 }, (_, i) => 30 + 3 * Math.sin((2 * Math.PI * i) / 365) + 5 * (rand() - 0.5));
const climTmin = climTmax.map((t) => t - 9 + 2 * (rand() - 0.5));

let dir = '';
let ref: {
  t95: number;
  clim_t95: number;
  clim_ehf85: number;
  ehf: (number | null)[][];
  ehf_no_antecedent: (number | null)[][];
  run: number[][];
  load: (number | null)[][];
};

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'forelight-ehf-'));
  const rows = (a: Float64Array) => Array.from({ length: MEMBERS }, (_, m) => Array.from(a.subarray(m * STEPS, (m + 1) * STEPS)));
  const input = join(dir, 'input.json');
  writeFileSync(
    input,
    JSON.stringify({
      tmax: rows(tmax),
      tmin: rows(tmin),
      antecedent_dmt: Array.from(antecedentDmt),
      climatology_dmt: Array.from(climatologyDmt),
      tmax_antecedent: Array.from(tmaxAntecedent),
      load_window: LOAD_WINDOW,
      clim_tmax: Array.from(climTmax),
      clim_tmin: Array.from(climTmin),
      threshold: [...tmaxAntecedent.map((_, k) => thresholdC(addDays(days[0], k - tmaxAntecedent.length))), ...days.map(thresholdC)],
    }),
  );
  ref = JSON.parse(execFileSync('/usr/bin/python3', [join(import.meta.dirname, 'numpy_ehf_reference.py'), input], { encoding: 'utf8' }));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function expectMatches(actual: Float64Array, expected: (number | null)[][], tol: number): void {
  for (let m = 0; m < MEMBERS; m++) {
    for (let i = 0; i < STEPS; i++) {
      const e = expected[m][i];
      const a = actual[m * STEPS + i];
      if (e === null) expect(a, `member ${m} day ${i}`).toBeNaN();
      else expect(Math.abs(a - e), `member ${m} day ${i}: ${a} vs numpy ${e}`).toBeLessThanOrEqual(tol);
    }
  }
}

const inputs = () => inputsOf(regionSeries('tmax', days, MEMBERS, tmax), regionSeries('tmin', days, MEMBERS, tmin));

describe('series indicators vs numpy (numpy_ehf_reference.py)', () => {
  it('T95 by percentileLinear equals numpy.percentile(..., 95) (Hyndman & Fan type 7)', () => {
    expect(Math.abs(percentileLinear(climatologyDmt, 95) - ref.t95)).toBeLessThanOrEqual(1e-12);
  });

  it('T95 and EHF85 of a reference period (ehfClimatology) equal numpy', () => {
    const c = ehfClimatology(climTmax, climTmin);
    expect(Math.abs(c.dmtP95C - ref.clim_t95)).toBeLessThanOrEqual(1e-12);
    expect(Math.abs(c.ehf85 - ref.clim_ehf85)).toBeLessThanOrEqual(1e-9);
    expect(c.positiveDays).toBeGreaterThan(20);
  });

  it('EHF with 30 analysed antecedent DMT days, Tmax_i paired with Tmin_(i+1)', () => {
    const ctx: IndicatorContext = { climatology: { dmtP95C: percentileLinear(climatologyDmt, 95) }, antecedentDmtC: antecedentDmt };
    const r = computeIndicator(indicator('excess-heat-factor'), inputs(), ctx);
    expectMatches(r.data, ref.ehf, 1e-9);
    expect(r.missing).toBe(3 * MEMBERS); // last 3 days per member
    expect(r.notes.some((n) => n.includes('fewer than 30'))).toBe(false);
    const positive = Array.from(r.data).filter((v) => v > 0).length;
    expect(positive).toBeGreaterThan(0); // the invented heatwave is detected
  });

  it("EHF without antecedent: T30 from the forecast's own earlier days, flagged as partial", () => {
    const r = computeIndicator(indicator('excess-heat-factor'), inputs(), { climatology: { dmtP95C: ref.t95 } });
    expectMatches(r.data, ref.ehf_no_antecedent, 1e-9);
    expect(r.notes.join(' ')).toContain('fewer than 30 analysed days for 30 lead day(s)');
  });

  it('hot-days-run with a day-of-year threshold and analysed antecedent days', () => {
    const r = computeIndicator(indicator('hot-days-run'), inputs(), {
      climatology: { dayOfYearThresholdC: thresholdC },
      antecedent: { tmax: tmaxAntecedent },
    });
    expectMatches(r.data, ref.run, 0);
    expect(Math.max(...r.data)).toBeGreaterThanOrEqual(3);
  });

  it('heat-load over a 5-day window with the same threshold', () => {
    const r = computeIndicator(indicator('heat-load', {}, LOAD_WINDOW), inputs(), {
      climatology: { dayOfYearThresholdC: thresholdC },
      antecedent: { tmax: tmaxAntecedent },
    });
    expectMatches(r.data, ref.load, 1e-9);
    expect(r.units).toBe('degC day');
  });
});
