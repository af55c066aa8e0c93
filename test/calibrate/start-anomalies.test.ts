/**
 * Start-anomaly pooling of the days and weeks tiers (src/calibrate/start-anomalies.ts) against the independent
 * numpy script test/calibrate/reference_start_anomalies.py (numpy.polyfit, numpy.percentile method='linear'), on an
 * invented hindcast (Veloria sample world) with a strong seasonal cycle: 0.25 °C a day, four starts 12 days before
 * to 9 days after the forecast's lead day 1, N(0, 1) noise. The forecast start's own climate at lead position l is
 * then N(24 + 0.25 l, 1), whose 90th percentile is 24 + 0.25 l + 1.2816 (standard normal quantile, Abramowitz &
 * Stegun 1964, table 26.1, from memory; checked with scipy.stats.norm.ppf(0.9) = 1.28155).
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { atForecastStart } from '../../src/calibrate/start-anomalies.ts';
import { stackYears } from '../../src/calibrate/climate.ts';
import { climatePercentileThreshold } from '../../src/calibrate/thresholds.ts';
import type { LeadValues } from '../../src/calibrate/lead-tiers.ts';
import type { IsoDate } from '../../src/types.ts';
import { mulberry32, normal } from '../support/rng.ts';
import { YEARS_2006_2025 } from './climate-fixture.ts';

const script = fileURLToPath(new URL('./reference_start_anomalies.py', import.meta.url));
const FORECAST_DAY_1: IsoDate = '2026-11-25';
const OFFSETS = [-12, -5, 2, 9];
const MEMBERS = 10;
const LEADS = 10;
const Z90 = 1.2815515655446004;

const day = (base: IsoDate, plus: number): IsoDate =>
  new Date(Date.parse(`${base}T00:00:00Z`) + plus * 86_400_000).toISOString().slice(0, 10);

function hindcast(seed: number) {
  const gauss = normal(mulberry32(seed));
  return YEARS_2006_2025.flatMap((year) =>
    OFFSETS.map((offset) => {
      const first = day(`${year}-11-25`, offset);
      const values = new Float64Array(MEMBERS * LEADS);
      for (let m = 0; m < MEMBERS; m++) for (let l = 0; l < LEADS; l++) values[m * LEADS + l] = 24 + 0.25 * (offset + l) + gauss();
      const leads: LeadValues = {
        leads: Array.from({ length: LEADS }, (_, l) => ({ tier: 'days' as const, index: l + 1, start: day(first, l), end: day(first, l) })),
        members: MEMBERS,
        values,
      };
      return { year, offset, leads };
    }),
  );
}

function thresholds(entries: { year: number; leads: LeadValues }[]): number[] {
  const { climate } = stackYears('test hindcasts', 'degC', entries);
  if (!climate) throw new Error('no climate');
  return climate.leads.map((lead, l) => climatePercentileThreshold(climate, l, 90, 'hindcasts', lead).value);
}

describe('start-anomaly pooling vs numpy reference_start_anomalies.py', () => {
  const entries = hindcast(20261203);
  const ref = JSON.parse(
    execFileSync('/usr/bin/python3', [script], {
      input: JSON.stringify({
        offsets: entries.map((e) => e.offset),
        values: entries.map((e) =>
          Array.from({ length: MEMBERS }, (_, m) => Array.from(e.leads.values.subarray(m * LEADS, (m + 1) * LEADS))),
        ),
        q: 90,
      }),
    }).toString(),
  ) as { pooled: number[]; raw: number[] };
  const pooled = thresholds(atForecastStart(entries, FORECAST_DAY_1));
  const raw = thresholds(entries);

  it('the pooled 90th percentiles match numpy within 1e-6 (and raw pooling too, as a check of the inputs)', () => {
    pooled.forEach((t, l) => expect(Math.abs(t - ref.pooled[l]), `lead ${l + 1}`).toBeLessThan(1e-6));
    raw.forEach((t, l) => expect(Math.abs(t - ref.raw[l]), `lead ${l + 1}`).toBeLessThan(1e-6));
  });
  it("pooled anomalies match the forecast start's own climate; raw pooling across the seasonal cycle is biased high", () => {
    for (let l = 0; l < LEADS; l++) {
      const truth = 24 + 0.25 * l + Z90;
      expect(Math.abs(pooled[l] - truth), `lead ${l + 1} anomalies`).toBeLessThan(0.25);
      expect(raw[l] - truth, `lead ${l + 1} raw`).toBeGreaterThan(0.5);
    }
  });
  it('one start, or no forecast date, leaves the values as they are', () => {
    const one = entries.filter((e) => e.offset === 2);
    expect(atForecastStart(one, FORECAST_DAY_1)).toEqual(one);
    expect(atForecastStart(entries, null)).toEqual(entries);
  });
  it('offsets wrap over the year end: starts with lead day 1 on 29 Dec and 4 Jan around a forecast on 1 Jan', () => {
    // Climates 10 and 16 three days before and after: the line reads 13 at the forecast's day.
    const at = (first: IsoDate, value: number) => ({
      year: 2010,
      leads: { leads: [{ tier: 'days' as const, index: 1, start: first, end: first }], members: 1, values: Float64Array.from([value]) },
    });
    const moved = atForecastStart([at('2010-12-29', 10), at('2011-01-04', 16)], '2027-01-01');
    expect(moved.map((e) => e.leads.values[0])).toEqual([13, 13]);
  });
});
