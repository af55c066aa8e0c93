/**
 * Empirical quantile mapping of absolute thresholds at every tier with observations (Déqué 2007, "Frequency of
 * precipitation and temperature extremes over France in an anthropogenic scenario", Global and Planetary Change
 * 57:16-26), checked against numpy (test/calibrate/reference_quantile_map.py, Debian /usr/bin/python3), and the
 * effect the issue asked for: a 0.5 K warm model no longer inflates P(Heat Index > 39 °C) at day leads.
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { quantileMappedThreshold } from '../../src/calibrate/thresholds.ts';
import { leadProbabilities } from '../../src/calibrate/probability.ts';
import { observedCases } from '../../src/calibrate/verification-cases.ts';
import { heatIndexRothfusz1990C } from '../../src/indicators/heat-index-rothfusz-1990.ts';
import { climate, leadsOf } from './climate-fixture.ts';
import { mulberry32, normal } from '../support/rng.ts';

const script = fileURLToPath(new URL('./reference_quantile_map.py', import.meta.url));
const YEARS = Array.from({ length: 30 }, (_, i) => 1996 + i);

describe('quantile mapping vs numpy (reference_quantile_map.py)', () => {
  const gauss = normal(mulberry32(20261203));
  const obsValues = YEARS.map(() => 30 + 2 * gauss());
  // A biased, over-dispersed model: +0.5 K and 1.2 × the spread, 10 members a year.
  const modValues = YEARS.map(() => Array.from({ length: 10 }, () => 30.5 + 2.4 * gauss()));
  const obs = climate(YEARS, 1, leadsOf('days', 1), (y) => obsValues[y]);
  const mod = climate(YEARS, 10, leadsOf('days', 1), (y, m) => modValues[y][m]);
  const thresholds = [24, 27.5, 29.9, 31.2, 33.7, 45];
  const ref = JSON.parse(
    execFileSync('/usr/bin/python3', [script], {
      input: JSON.stringify({
        obs: YEARS.map((year, y) => [year, obsValues[y]]),
        model: YEARS.flatMap((year, y) => modValues[y].map((v) => [year, v])),
        thresholds,
      }),
    }).toString(),
  );

  it('all years: mapped threshold equals numpy to 1e-9 (outside the observed range: the model extreme)', () => {
    thresholds.forEach((x, k) => expect(Math.abs(quantileMappedThreshold(x, obs, mod, 0).value - ref.all[k])).toBeLessThan(1e-9));
    expect(quantileMappedThreshold(45, obs, mod, 0).clipped).toBe(true);
  });
  it('leave-one-year-out (the mapping for year y built without year y, as skill uses it) equals numpy to 1e-9', () => {
    for (const year of YEARS)
      thresholds.forEach((x, k) =>
        expect(Math.abs(quantileMappedThreshold(x, obs, mod, 0, year).value - ref.loyo[String(year)][k])).toBeLessThan(1e-9),
      );
  });
});

describe('a 0.5 K warm-biased model at day leads: P(HI > 39 °C) back to the observed frequency', () => {
  const gauss = normal(mulberry32(15));
  const RH = 60;
  const hi = (t: number) => heatIndexRothfusz1990C(t, RH);
  // Truth: daily maximum ~ N(32, 1.5) °C at 60 % humidity; the model draws the same climate 0.5 K too warm.
  const obsT = YEARS.map(() => 32 + 1.5 * gauss());
  const hcT = YEARS.map(() => Array.from({ length: 20 }, () => 32.5 + 1.5 * gauss()));
  const observed = climate(YEARS, 1, leadsOf('days', 1), (y) => hi(obsT[y]));
  const hindcast = climate(YEARS, 20, leadsOf('days', 1), (y, m) => hi(hcT[y][m]));
  // A forecast of a normal year from the same warm model, 1000 members.
  const fcT = Array.from({ length: 1000 }, () => 32.5 + 1.5 * gauss());
  const forecast = { leads: leadsOf('days', 1), members: fcT.length, values: Float64Array.from(fcT.map(hi)) };
  const request = {
    source: 'subseasonal',
    region: 'marrow-highlands',
    indicator: 'heat-index-day',
    units: 'degC',
    forecast,
    hindcast,
    threshold: { kind: 'absolute' as const, value: 39, units: 'degC' },
    calibration: { minMembers: 10, minHindcastYears: 10 },
  };
  // Observed frequency of HI > 39 °C: counted directly on the observations, not through Forelight.
  const observedRate = obsT.filter((t) => hi(t) > 39).length / YEARS.length;

  it('raw model values inflate the probability; mapped through the observations it is within 0.05 of the observed rate', () => {
    const [raw] = leadProbabilities({ ...request, observed: null });
    const [mapped] = leadProbabilities({ ...request, observed });
    expect(raw.probability - observedRate).toBeGreaterThan(0.08);
    expect(Math.abs(mapped.probability - observedRate)).toBeLessThan(0.05);
    expect(mapped.threshold.value).toBeGreaterThan(39);
    expect(mapped.baseRate).toBeCloseTo(observedRate, 12); // the printed normal-year rate is the observed one
  });
  it('in skill, the day-lead forecast threshold of year y is the mapping without year y (leave-one-year-out)', () => {
    const cases = observedCases(hindcast, observed, 0, request.threshold);
    const y = 7;
    const thr = quantileMappedThreshold(39, observed, hindcast, 0, YEARS[y]).value;
    const members = hcT[y].map(hi);
    expect(cases.p[y]).toBeCloseTo(members.filter((v) => v > thr).length / members.length, 12);
    expect(cases.o[y]).toBe(hi(obsT[y]) > 39 ? 1 : 0);
  });
});
