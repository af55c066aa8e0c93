/** computeIndicator per kind: input choices, units, lag bookkeeping (formulas themselves: checks.test.ts). */
import { describe, expect, it } from 'vitest';
import { computeIndicator } from '../../src/indicators/compute.ts';
import { heatIndexRothfusz1990C } from '../../src/indicators/heat-index-rothfusz-1990.ts';
import { aggregateToLeads } from '../../src/calibrate/lead-tiers.ts';
import { leadProbabilities } from '../../src/calibrate/probability.ts';
import { dewpointFromRhMagnusC, rhFromDewpointMagnusPct } from '../../src/indicators/magnus-humidity.ts';
import { monthlySuitability, parseMalariaParams, suitabilityCategory } from '../../src/indicators/malaria-monthly.ts';
import { percentileLinear } from '../../src/core/percentile.ts';
import { dayOfYearPercentileThreshold } from '../../src/indicators/percentile.ts';
import { relativeR0Mordecai2013 } from '../../src/indicators/relative-r0-mordecai-2013.ts';
import { DETINOVA_1962 } from '../../src/indicators/sporogony-detinova-1962.ts';
import { maxSurvivalThroughSporogony, survivalThroughSporogony } from '../../src/indicators/survival-martens-1997.ts';
import { dayList, indicator, inputsOf, regionSeries } from './fixtures.ts';

const days = dayList('2026-11-30', 3);
const f = (...v: number[]) => Float64Array.from(v);

describe("feels-like indicators on Tmax with the day's humidity", () => {
  const tmax = regionSeries('tmax', days, 1, f(34, 36, 38));
  it('dewpoint input: RH at Tmax by Magnus (Alduchov & Eskridge 1996), then the WPC heat index', () => {
    const r = computeIndicator(indicator('heat-index'), inputsOf(tmax, regionSeries('dewpoint', days, 1, f(24, 25, 26))));
    for (let i = 0; i < 3; i++) expect(r.data[i]).toBe(heatIndexRothfusz1990C(tmax.data[i], rhFromDewpointMagnusPct(tmax.data[i], 24 + i)));
    expect(r.units).toBe('degC');
    expect(r.notes).toEqual([]);
  });
  it('a day beyond the published heat index table is capped at 58.3 °C, masked, noted, and flagged on its lead', () => {
    // 46 °C with dewpoint 30 °C: T > 110 °F, beyond the NWS chart of Steadman (1979); day 2 (36 °C, Td 25) inside
    const hot = regionSeries('tmax', days, 2, f(46, 36, 34, 34, 36, 34));
    const r = computeIndicator(indicator('heat-index'), inputsOf(hot, regionSeries('dewpoint', days, 2, f(30, 25, 24, 24, 25, 24))));
    expect(r.data[0]).toBeCloseTo((137 - 32) / 1.8, 10);
    expect([...(r.beyondTable ?? [])]).toEqual([1, 0, 0, 0, 0, 0]);
    expect(r.notes.join(' ')).toContain('1 member-days beyond the published Heat Index table');
    const leads = aggregateToLeads(r, 'days', 'max');
    expect([...(leads.beyondTable ?? [])]).toEqual([1, 0, 0, 0, 0, 0]);
    const probs = leadProbabilities({
      source: 's',
      region: r.region,
      indicator: r.indicator,
      units: 'degC',
      forecast: leads,
      hindcast: null,
      observed: null,
      threshold: { kind: 'absolute', value: 41, units: 'degC' },
      calibration: { minMembers: 1, minHindcastYears: 1 },
    });
    expect(probs[0].flags.filter((x) => x.startsWith('beyond-table:'))).toEqual([
      'beyond-table: 1 of 2 members lie beyond the published table at lead day 1; their values are capped at its top, not extrapolated',
    ]);
    expect(probs[0].probability).toBe(0.5); // the capped member still counts above 41 °C
    expect(probs[1].flags.some((x) => x.startsWith('beyond-table:'))).toBe(false);
  });
  it('RH + tmean input: dewpoint from the daily mean, RH re-evaluated at Tmax (lower than the daily-mean RH)', () => {
    const rh = regionSeries('rh', days, 1, f(70, 70, 70));
    const tmean = regionSeries('tmean', days, 1, f(29, 30, 31));
    const r = computeIndicator(indicator('heat-index'), inputsOf(tmax, rh, tmean));
    const td = dewpointFromRhMagnusC(29, 70);
    const rhAtTmax = rhFromDewpointMagnusPct(34, td);
    expect(rhAtTmax).toBeLessThan(70);
    expect(r.data[0]).toBeCloseTo(heatIndexRothfusz1990C(34, rhAtTmax), 10);
    const rhOnly = computeIndicator(indicator('heat-index'), inputsOf(tmax, rh));
    expect(rhOnly.notes.join(' ')).toContain('assumed to hold at tmax');
    expect(rhOnly.data[0]).toBeGreaterThan(r.data[0]);
  });
  it('apparent temperature and simplified WBGT use e = e_s,BoM(Td) (CHECKS.md §1: exact with the BoM constants)', () => {
    const dew = regionSeries('dewpoint', days, 1, f(22, 23, 24));
    const wind = regionSeries('wind', days, 1, f(3, 0, 6));
    const eBom = (td: number) => 6.105 * Math.exp((17.27 * td) / (237.7 + td));
    const at = computeIndicator(indicator('apparent-temperature'), inputsOf(tmax, dew, wind));
    const wbgt = computeIndicator(indicator('wbgt-simplified'), inputsOf(tmax, dew));
    for (let i = 0; i < 3; i++) {
      expect(at.data[i]).toBeCloseTo(tmax.data[i] + 0.33 * eBom(22 + i) - 0.7 * wind.data[i] - 4, 10);
      expect(wbgt.data[i]).toBeCloseTo(0.567 * tmax.data[i] + 0.393 * eBom(22 + i) + 3.94, 10);
    }
  });
  it('params.basis tmean uses the daily mean temperature; humidex takes the dewpoint directly', () => {
    const tmean = regionSeries('tmean', days, 1, f(28, 29, 30));
    const dew = regionSeries('dewpoint', days, 1, f(21, 21, 21));
    const hx = computeIndicator(indicator('humidex', { basis: 'tmean' }), inputsOf(tmax, tmean, dew));
    expect(hx.data[0]).toBeCloseTo(28 + 0.5555 * (6.11 * Math.exp(5417.753 * (1 / 273.16 - 1 / (21 + 273.15))) - 10), 10);
    // A hand-made config bypasses the load-time schema; the type refuses it and so does the computation.
    // @ts-expect-error basis 'tmin' is not a basis
    expect(() => computeIndicator(indicator('humidex', { basis: 'tmin' }), inputsOf(tmax, tmean, dew))).toThrow(/params.basis/);
  });
});

describe('EHF severity ratio output', () => {
  it('divides EHF by EHF85 from the climatology (ratio, CHECKS.md ehf-sev rows)', () => {
    const d = dayList('2026-11-23', 5);
    const tmax = regionSeries('tmax', d, 1, f(36, 39, 41, 40, 38));
    const tmin = regionSeries('tmin', d, 1, f(20, 22, 25, 27, 26));
    const ante = Float64Array.from({ length: 30 }, (_, k) => 20 + k / 10);
    const ehf = computeIndicator(indicator('excess-heat-factor'), inputsOf(tmax, tmin), {
      climatology: { dmtP95C: 25 },
      antecedentDmtC: ante,
    });
    const ratio = computeIndicator(indicator('excess-heat-factor', { output: 'severity-ratio' }), inputsOf(tmax, tmin), {
      climatology: { dmtP95C: 25, ehf85: 20 },
      antecedentDmtC: ante,
    });
    expect(ehf.data[0]).toBeCloseTo(68.1111, 3); // checks.json ehf-04
    expect(ratio.data[0]).toBeCloseTo(68.1111 / 20, 3);
  });
});

describe('malaria suitability, monthly with lag', () => {
  const d = dayList('2026-11-23', 70); // 23 Nov 2026 .. 31 Jan 2027
  const tmean = new Float64Array(140);
  const precip = new Float64Array(140);
  tmean.fill(25, 0, 70).fill(19, 70, 140);
  precip.fill(2, 0, 70).fill(4, 70, 140);
  const craigS = (x: number, a: number, b: number) => (x <= a ? 0 : x >= b ? 1 : (1 - Math.cos((Math.PI * (x - a)) / (b - a))) / 2);

  it('monthlySuitability: rain total = mean rate × days in month; default index = min(Craig T, Craig R) alone; target = month + lag', () => {
    const p = parseMalariaParams({ id: 'mal', params: { species: 'falciparum', lagMonths: 1 } });
    expect(p.temperatureModel).toBe('craig-1999');
    const months = monthlySuitability(d, 2, tmean, precip, p);
    expect(months.map((m) => [m.dataMonth, m.targetMonth, m.forecastDays])).toEqual([
      ['2026-11', '2026-12', 8],
      ['2026-12', '2027-01', 31],
      ['2027-01', '2027-02', 31],
    ]);
    expect(months[0].index[0]).toBeNaN(); // 8 of 30 days < 50 % coverage
    expect(months[1].rainTotalMm[0]).toBeCloseTo(62, 12);
    // Craig et al. (1999): f_T = 1 on 22..32 °C, so at 25 °C only the rain (62 mm) limits
    expect(months[1].index[0]).toBeCloseTo(craigS(62, 0, 80), 12);
    expect(months[1].index[1]).toBeCloseTo(Math.min(craigS(19, 18, 22), craigS(124, 0, 80)), 12);
  });

  it('temperature is counted once: 22 °C with ample rain is fully suitable by default, and warmth up to 32 °C never lowers it', () => {
    // The former min(Craig f_T, p^n) gave 0.42 at 22 °C and fell above 30.6 °C (issue finding 7)
    const days = dayList('2027-01-01', 31);
    const p = parseMalariaParams({ id: 'mal', params: {} });
    const at = (tC: number) => monthlySuitability(days, 1, new Float64Array(31).fill(tC), new Float64Array(31).fill(5), p)[0].index[0];
    expect(at(22)).toBe(1);
    let last = -1;
    for (let tC = 16; tC <= 32; tC += 0.25) {
      expect(at(tC)).toBeGreaterThanOrEqual(last);
      last = at(tC);
    }
  });

  it('martens-detinova replaces the Craig temperature membership (min with Craig rain only)', () => {
    const p = parseMalariaParams({ id: 'mal', params: { species: 'falciparum', temperatureModel: 'martens-detinova' } });
    const months = monthlySuitability(d, 2, tmean, precip, p);
    const k = DETINOVA_1962.falciparum;
    const rel = (tC: number) => survivalThroughSporogony(tC, k) / maxSurvivalThroughSporogony(k).value;
    expect(months[1].index[0]).toBeCloseTo(Math.min(craigS(62, 0, 80), rel(25)), 12); // p^n(25)/max = 0.753 (0.2767/0.3675)
    expect(months[1].index[1]).toBeCloseTo(Math.min(rel(19), craigS(124, 0, 80)), 12);
    expect(rel(19)).not.toBeCloseTo(craigS(19, 18, 22), 2); // so the two terms differ and the test can tell them apart
  });

  it("computeIndicator puts each month's index on the days of the month it speaks for (lag 2)", () => {
    const ind = indicator('malaria-suitability', { species: 'falciparum', lagMonths: 2 });
    const r = computeIndicator(ind, inputsOf(regionSeries('tmean', d, 2, tmean), regionSeries('precip', d, 2, precip)));
    expect(r.days[0]).toBe('2027-02-01');
    expect(r.days.length).toBe(28 + 31);
    expect(r.days.at(-1)).toBe('2027-03-31');
    expect(new Set(r.data.subarray(0, 28)).size).toBe(1);
    expect(r.notes.join(' ')).toContain('2026-11 has forecast for 8 of 30 days');
    expect(r.units).toBe('1');
  });

  it('Mordecai option, categories and parameter errors', () => {
    const p = parseMalariaParams({ id: 'mal', params: { temperatureModel: 'mordecai-2013' } });
    const months = monthlySuitability(d, 2, tmean, precip, p);
    expect(months[1].index[1]).toBeCloseTo(Math.min(craigS(124, 0, 80), relativeR0Mordecai2013(19)), 12);
    expect(months[1].index[0]).toBeCloseTo(Math.min(craigS(62, 0, 80), relativeR0Mordecai2013(25)), 12);
    expect(suitabilityCategory(0.1, p)).toBe('unsuitable');
    expect(suitabilityCategory(0.25, p)).toBe('marginal');
    expect(suitabilityCategory(0.75, p)).toBe('suitable');
    expect(() => parseMalariaParams({ id: 'mal', params: { species: 'vivax', temperatureModel: 'mordecai-2013' } })).toThrow(
      /P. falciparum only/,
    );
    expect(() => parseMalariaParams({ id: 'mal', params: { lagMonths: 3 } })).toThrow(/lagMonths/);
    expect(() => parseMalariaParams({ id: 'mal', params: { temperatureModel: 'both' } })).toThrow(
      /craig-1999, martens-detinova, mordecai-2013/,
    );
  });
});

describe('day-of-year percentile threshold', () => {
  it('pools ±half-window days across years, 29 February shares the calendar (numpy linear percentile)', () => {
    const values = new Map<string, number>();
    for (const y of [2020, 2021, 2022]) for (const dd of dayList(`${y}-02-26`, 6)) values.set(dd, y - 2000 + Number(dd.slice(8)) / 100);
    const thr = dayOfYearPercentileThreshold(values, 90, 3);
    const pooled = [...values].filter(([k]) => ['02-28', '02-29', '03-01'].includes(k.slice(5))).map(([, v]) => v);
    expect(thr('2024-02-29')).toBe(percentileLinear(pooled, 90));
    expect(thr('2023-07-01')).toBeNaN();
    expect(() => dayOfYearPercentileThreshold(values, 90, 4)).toThrow(/odd/);
  });
});

describe('running means (common practice, no source): tmin-mean and tmean-mean', () => {
  it('tmin-mean: trailing mean over window-days, the antecedent days filling the first window', () => {
    const tmin = regionSeries('tmin', days, 2, f(20, 22, 24, 10, 11, 12));
    const r = computeIndicator(indicator('tmin-mean', {}, 2), inputsOf(tmin), { antecedent: { tmin: f(18) } });
    expect(Array.from(r.data)).toEqual([19, 21, 23, 14, 10.5, 11.5]);
    expect(r.units).toBe('degC');
    const noAntecedent = computeIndicator(indicator('tmin-mean', {}, 2), inputsOf(tmin));
    expect(noAntecedent.data[0]).toBeNaN();
    expect(noAntecedent.missing).toBe(2);
  });
  it('tmean-mean: the tmean series when given, else (tmax + tmin)/2 with a note', () => {
    const tmax = regionSeries('tmax', days, 1, f(30, 32, 34));
    const tmin = regionSeries('tmin', days, 1, f(20, 22, 20));
    const fromMaxMin = computeIndicator(indicator('tmean-mean', {}, 2), inputsOf(tmax, tmin));
    expect(Array.from(fromMaxMin.data)).toEqual([NaN, 26, 27]);
    expect(fromMaxMin.notes).toEqual(['daily mean temperature taken as (tmax + tmin)/2']);
    const direct = computeIndicator(indicator('tmean-mean', {}, 2), inputsOf(tmax, tmin, regionSeries('tmean', days, 1, f(24, 26, 28))));
    expect(Array.from(direct.data)).toEqual([NaN, 25, 27]);
    expect(direct.notes).toEqual([]);
  });
});
