/**
 * Every indicator-formula row of test/reference/checks.json (published values, see CHECKS.md), one `it` per row,
 * named with the row id and its source. Rows whose source names a branch also check the Heat Index branch.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  apparentTemperatureSteadman1994C,
  apparentTemperatureSteadman1994CArray,
} from '../../src/indicators/apparent-temperature-steadman-1994.ts';
import {
  ehfSeverityRatio,
  excessHeatFactorFromDmt,
  excessHeatFactorSeries,
} from '../../src/indicators/excess-heat-factor-nairn-fawcett-2015.ts';
import {
  heatIndexBeyondTableF,
  heatIndexBranchNws,
  heatIndexRothfusz1990C,
  heatIndexRothfusz1990CArray,
  heatIndexRothfusz1990F,
  type HeatIndexBranch,
} from '../../src/indicators/heat-index-rothfusz-1990.ts';
import {
  humidexMastertonRichardson1979,
  humidexMastertonRichardson1979Array,
} from '../../src/indicators/humidex-masterton-richardson-1979.ts';
import {
  MAGNUS_ALDUCHOV_ESKRIDGE_1996,
  MAGNUS_BOLTON_1980,
  MAGNUS_BOM,
  rhFromDewpointMagnusPct,
  rhFromDewpointMagnusPctArray,
  type MagnusCoefficients,
} from '../../src/indicators/magnus-humidity.ts';
import { percentileLinear } from '../../src/core/percentile.ts';
import { r0ProfileMordecai2013, relativeR0Mordecai2013 } from '../../src/indicators/relative-r0-mordecai-2013.ts';
import {
  DETINOVA_1962,
  sporogonyDurationDetinova1962Days,
  sporogonyRateDetinova1962PerDay,
  type PlasmodiumSpecies,
} from '../../src/indicators/sporogony-detinova-1962.ts';
import {
  craigMonthlySuitability1999,
  craigRainfallMembership1999,
  craigTemperatureMembership1999,
} from '../../src/indicators/suitability-craig-1999.ts';
import { dailySurvivalMartens1997, survivalThroughSporogony } from '../../src/indicators/survival-martens-1997.ts';
import { wbgtSimplifiedBomC, wbgtSimplifiedBomCArray } from '../../src/indicators/wbgt-simplified-bom.ts';

interface CheckRow {
  id: string;
  quantity: string;
  inputs: Record<string, unknown>;
  expected: number;
  tolerance: number;
  units: string;
  source: string;
}
type In = Record<string, any>;

const rows: CheckRow[] = JSON.parse(readFileSync(new URL('../reference/checks.json', import.meta.url), 'utf8'));

/** Quantity families this folder owns; any row of these families must have an evaluator below. */
const OWNED =
  /^(heat_index|humidex|apparent_temperature|wbgt|rh_from_dewpoint|excess_heat_factor|ehf_|percentile|sporogony|daily_survival|survival_through|craig_|mordecai_)/;

function species(name: string): PlasmodiumSpecies {
  if (name === 'P. falciparum') return 'falciparum';
  if (name === 'P. vivax') return 'vivax';
  throw new Error(`unknown species ${name}`);
}

function magnusSet(name: string): MagnusCoefficients {
  if (name.startsWith('Alduchov-Eskridge 1996')) return MAGNUS_ALDUCHOV_ESKRIDGE_1996;
  if (name.startsWith('Bolton 1980')) return MAGNUS_BOLTON_1980;
  if (name.startsWith('BoM AT page')) return MAGNUS_BOM;
  throw new Error(`unknown coefficient set ${name}`);
}

/** Runs the vectorised form on a one-element array: it must equal the scalar form exactly. */
function viaArray2(f: (a: Float64Array, b: Float64Array, out: Float64Array) => unknown, x: number, y: number): number {
  const out = new Float64Array(1);
  f(Float64Array.of(x), Float64Array.of(y), out);
  return out[0];
}

const PROFILE = r0ProfileMordecai2013(0.001);

const EVALUATORS: Record<string, (i: In) => number> = {
  heat_index_nws: (i) => heatIndexRothfusz1990F(i.t_air_f, i.rh_pct),
  heat_index_nws_celsius: (i) => {
    const v = heatIndexRothfusz1990C(i.t_air_c, i.rh_pct);
    expect(viaArray2(heatIndexRothfusz1990CArray, i.t_air_c, i.rh_pct)).toBe(v);
    return v;
  },
  humidex: (i) => {
    const v = humidexMastertonRichardson1979(i.t_air_c, i.t_dew_c);
    expect(viaArray2(humidexMastertonRichardson1979Array, i.t_air_c, i.t_dew_c)).toBe(v);
    return v;
  },
  apparent_temperature_steadman_bom: (i) => {
    const v = apparentTemperatureSteadman1994C(i.t_air_c, i.rh_pct, i.wind_10m_ms);
    const out = new Float64Array(1);
    apparentTemperatureSteadman1994CArray(Float64Array.of(i.t_air_c), Float64Array.of(i.rh_pct), Float64Array.of(i.wind_10m_ms), out);
    expect(out[0]).toBe(v);
    return v;
  },
  wbgt_simplified_bom: (i) => {
    const v = wbgtSimplifiedBomC(i.t_air_c, i.rh_pct);
    expect(viaArray2(wbgtSimplifiedBomCArray, i.t_air_c, i.rh_pct)).toBe(v);
    return v;
  },
  rh_from_dewpoint: (i) => {
    const k = magnusSet(i.coefficients);
    const v = rhFromDewpointMagnusPct(i.t_air_c, i.t_dew_c, k);
    expect(viaArray2((a, b, out) => rhFromDewpointMagnusPctArray(a, b, out, k), i.t_air_c, i.t_dew_c)).toBe(v);
    return v;
  },
  excess_heat_factor: (i) => excessHeatFactorFromDmt(i.dmt_prev30_c, i.dmt_next3_c, i.t95_c),
  // Through the series function, so the Tmax_i / Tmin_(i+1) pairing is what is tested.
  excess_heat_factor_from_tmax_tmin: (i) => {
    const tmax = Float64Array.of(...i.tmax_days_i_to_i2_c, NaN);
    const tmin = Float64Array.of(...i.tmin_days_i_to_i3_c);
    const out = new Float64Array(4);
    const counts = excessHeatFactorSeries(tmax, tmin, 1, 4, i.t95_c, Float64Array.from(i.dmt_prev30_c), out);
    expect(counts.partialAcclimatisationDays).toBe(0);
    return out[0];
  },
  ehf_severity_ratio: (i) => ehfSeverityRatio(i.ehf, i.ehf85),
  percentile95_linear: (i) => percentileLinear(i.sample_c, 95),
  sporogony_duration_days: (i) => sporogonyDurationDetinova1962Days(i.t_mean_c, DETINOVA_1962[species(i.species)]),
  sporogony_rate_per_day: (i) => sporogonyRateDetinova1962PerDay(i.t_mean_c, DETINOVA_1962[species(i.species)]),
  daily_survival_martens: (i) => dailySurvivalMartens1997(i.t_mean_c),
  survival_through_sporogony: (i) => survivalThroughSporogony(i.t_mean_c, DETINOVA_1962[species(i.species)]),
  craig_temperature_membership: (i) => craigTemperatureMembership1999(i.t_month_mean_c),
  craig_rainfall_membership: (i) => craigRainfallMembership1999(i.rain_month_mm),
  craig_combined_monthly: (i) => craigMonthlySuitability1999(i.t_month_mean_c, i.rain_month_mm),
  mordecai_r0_argmax: (i) => r0ProfileMordecai2013(i.step_c ?? 0.001).tOptC,
  mordecai_r0_lower_limit: () => PROFILE.tMinC,
  mordecai_r0_upper_limit: () => PROFILE.tMaxC,
  mordecai_relative_r0: (i) => relativeR0Mordecai2013(i.t_mean_c),
};

const BRANCH_NAMES: Record<string, HeatIndexBranch> = {
  simple: 'simple',
  rothfusz: 'regression',
  'rothfusz-lowRH': 'regression-low-rh',
  'rothfusz+highRH': 'regression-high-rh',
};

/** Branch named in the row's source: "branch=X" or the chart rows' "WPC algorithm value N F (X)". */
function expectedBranch(row: CheckRow): HeatIndexBranch | null {
  const m = /branch=([A-Za-z+-]+)/.exec(row.source) ?? /WPC algorithm value [\d.]+ F \(([A-Za-z+-]+)\)/.exec(row.source);
  if (!m) return null;
  const b = BRANCH_NAMES[m[1]];
  if (!b) throw new Error(`row ${row.id}: unknown branch name ${m[1]}`);
  return b;
}

const owned = rows.filter((r) => OWNED.test(r.quantity));
const exercised = new Set<string>();

describe('checks.json indicator rows (CHECKS.md §2-§10)', () => {
  for (const row of owned) {
    it(`${row.id} [${row.quantity}] — ${row.source.slice(0, 140)}`, () => {
      const evaluate = EVALUATORS[row.quantity];
      expect(evaluate, `no evaluator for quantity ${row.quantity}`).toBeDefined();
      const actual = evaluate(row.inputs as In);
      expect(Math.abs(actual - row.expected), `${row.id}: got ${actual}, expected ${row.expected} ± ${row.tolerance}`).toBeLessThanOrEqual(
        row.tolerance,
      );
      const branch = row.quantity === 'heat_index_nws' ? expectedBranch(row) : null;
      if (row.source.includes('branch')) expect(branch, `${row.id} says branch but none parsed`).not.toBeNull();
      if (branch) expect(heatIndexBranchNws((row.inputs as In).t_air_f, (row.inputs as In).rh_pct)).toBe(branch);
      // every published heat index row lies inside the table: none is capped or flagged beyond it
      if (row.quantity === 'heat_index_nws')
        expect(heatIndexBeyondTableF((row.inputs as In).t_air_f, (row.inputs as In).rh_pct)).toBe(false);
      exercised.add(row.id);
    });
  }

  it('exercised every owned row and knows every owned quantity (a new row cannot be skipped silently)', () => {
    expect(owned.length).toBeGreaterThanOrEqual(85);
    expect([...exercised].sort()).toEqual(owned.map((r) => r.id).sort());
    for (const q of new Set(owned.map((r) => r.quantity))) expect(Object.keys(EVALUATORS)).toContain(q);
  });
});
