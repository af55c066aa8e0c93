/**
 * Feels-like indicators (heat index, humidex, apparent temperature, simplified WBGT) on ensemble series.
 * Basis temperature: the day's maximum (`params.basis: 'tmax'`, default) or mean (`'tmean'`) temperature,
 * combined with the day's humidity carried as a dewpoint, which varies little over a day:
 *  - dewpoint series given → used as is;
 *  - else specific humidity with surface pressure → Td of the day's mean vapour pressure e = qp/(ε + (1−ε)q)
 *    (WMO-No. 8 Annex 4.B; inverse Magnus, Alduchov & Eskridge 1996; see specific-humidity.ts);
 *  - else RH with tmean → Td from (tmean, RH) by inverse Magnus (Alduchov & Eskridge 1996), i.e. RH is taken as
 *    the daily mean RH at the daily mean temperature;
 *  - else RH only → RH is assumed to hold at the basis temperature (overstates heat stress on Tmax when RH is a
 *    daily mean; a note says so).
 * Each formula then takes humidity in its own form: heat index RH(T, Td) with Alduchov & Eskridge (1996);
 * AT and simplified WBGT RH with the BoM constants so that e = e_s,BoM(Td) exactly; humidex Td directly.
 * RH up to 100.5 % (dewpoint slightly above the basis temperature) is clamped to 100 %; beyond → out of range.
 */
import { badParam } from './kind-inputs.ts';
import type { Quantity, RegionSeries } from '../types.ts';
import { apparentTemperatureSteadman1994C } from './apparent-temperature-steadman-1994.ts';
import { mapElementwise2, mapElementwise3 } from './elementwise.ts';
import { heatIndexBeyondTableC, heatIndexRothfusz1990C } from './heat-index-rothfusz-1990.ts';
import { humidexMastertonRichardson1979 } from './humidex-masterton-richardson-1979.ts';
import {
  dewpointFromRhMagnusC,
  MAGNUS_ALDUCHOV_ESKRIDGE_1996,
  MAGNUS_BOM,
  rhFromDewpointMagnusPct,
  type MagnusCoefficients,
} from './magnus-humidity.ts';
import { checkAligned, requireQuantity } from './series-checks.ts';
import { dewpointFromSpecificHumidityC } from './specific-humidity.ts';
import { wbgtSimplifiedBomC } from './wbgt-simplified-bom.ts';

export type FeelsLikeKind = 'heat-index' | 'humidex' | 'apparent-temperature' | 'wbgt-simplified';

export interface FeelsLikeResult {
  readonly data: Float64Array;
  /** Raw inputs, for the out-of-range count. */
  readonly raw: readonly Float64Array[];
  readonly notes: readonly string[];
  readonly template: RegionSeries;
  /** Heat index only: 1 where the value lies beyond the published table (capped there), member-major. */
  readonly beyondTable?: Uint8Array;
}

/** RH [%] at temperature tC for dewpoint tdC, clamped to 100 up to 100.5, NaN beyond. */
function rhAt(tC: number, tdC: number, k: MagnusCoefficients): number {
  const rh = rhFromDewpointMagnusPct(tC, tdC, k);
  return rh > 100.5 ? NaN : Math.min(rh, 100);
}

function clampRh(rhPct: number): number {
  return Math.min(100, Math.max(0, rhPct));
}

function dewpointSeries(
  inputs: ReadonlyMap<Quantity, RegionSeries>,
  basis: RegionSeries,
  id: string,
  notes: string[],
): { readonly tdC: Float64Array; readonly raw: readonly Float64Array[] } {
  if (inputs.has('dewpoint')) {
    const td = requireQuantity(inputs, 'dewpoint', id, 'humidity');
    checkAligned([basis, td]);
    return { tdC: td.data, raw: [td.data] };
  }
  if (inputs.has('specific-humidity') || !inputs.has('rh')) return dewpointOfSpecificHumidity(inputs, basis, id);
  const rh = requireQuantity(inputs, 'rh', id, 'humidity');
  const rhT = inputs.has('tmean') ? requireQuantity(inputs, 'tmean', id, 'temperature at which RH holds') : basis;
  checkAligned([basis, rh, rhT]);
  if (rhT === basis && basis.quantity !== 'tmean') {
    notes.push(
      `relative humidity assumed to hold at ${basis.quantity} (no tmean to convert it to a dewpoint): heat stress may be overstated`,
    );
  }
  const tdC = new Float64Array(rh.data.length);
  mapElementwise2(rhT.data, rh.data, tdC, (t, r) => dewpointFromRhMagnusC(t, clampRh(r), MAGNUS_ALDUCHOV_ESKRIDGE_1996));
  return { tdC, raw: [rh.data, rhT.data] };
}

function dewpointOfSpecificHumidity(
  inputs: ReadonlyMap<Quantity, RegionSeries>,
  basis: RegionSeries,
  id: string,
): { readonly tdC: Float64Array; readonly raw: readonly Float64Array[] } {
  const q = requireQuantity(inputs, 'specific-humidity', id, 'humidity: give dewpoint, rh, or specific-humidity with surface-pressure');
  const p = requireQuantity(inputs, 'surface-pressure', id, 'pressure at which the specific humidity gives a dewpoint');
  checkAligned([basis, q, p]);
  const tdC = new Float64Array(q.data.length);
  mapElementwise2(q.data, p.data, tdC, (qq, pp) => dewpointFromSpecificHumidityC(qq, pp, MAGNUS_ALDUCHOV_ESKRIDGE_1996));
  return { tdC, raw: [q.data, p.data] };
}

/** Computes one feels-like kind for all members and days. `params.basis`: 'tmax' (default) or 'tmean'. */
export function feelsLikeSeries(
  kind: FeelsLikeKind,
  inputs: ReadonlyMap<Quantity, RegionSeries>,
  id: string,
  basisParam: string | number | boolean | undefined,
): FeelsLikeResult {
  if (basisParam !== undefined && basisParam !== 'tmax' && basisParam !== 'tmean') {
    throw badParam({ id }, `params.basis is "${String(basisParam)}"`, 'use tmax or tmean');
  }
  const basisQ: Quantity = basisParam === 'tmean' ? 'tmean' : 'tmax';
  const basis = requireQuantity(inputs, basisQ, id, 'basis temperature');
  const notes: string[] = [];
  const { tdC, raw } = dewpointSeries(inputs, basis, id, notes);
  const t = basis.data;
  const out = new Float64Array(t.length);
  if (kind === 'apparent-temperature') {
    const wind = requireQuantity(inputs, 'wind', id, 'wind speed at 10 m; calm (0 m/s) is never assumed');
    checkAligned([basis, wind]);
    mapElementwise3(t, tdC, wind.data, out, (tc, td, ws) => apparentTemperatureSteadman1994C(tc, rhAt(tc, td, MAGNUS_BOM), ws));
    return { data: out, raw: [t, wind.data, ...raw], notes, template: basis };
  }
  mapElementwise2(t, tdC, out, TWO_INPUT_FORMULAS[kind]);
  if (kind !== 'heat-index') return { data: out, raw: [t, ...raw], notes, template: basis };
  const beyondTable = new Uint8Array(t.length);
  for (let i = 0; i < t.length; i++)
    beyondTable[i] = Number(heatIndexBeyondTableC(t[i], rhAt(t[i], tdC[i], MAGNUS_ALDUCHOV_ESKRIDGE_1996)));
  const beyond = beyondTable.reduce((a, b) => a + b, 0);
  if (beyond > 0)
    notes.push(
      `${beyond} member-days beyond the published Heat Index table (above 43.3 °C air temperature or 58.3 °C heat index): capped at 58.3 °C, not extrapolated`,
    );
  return { data: out, raw: [t, ...raw], notes, template: basis, beyondTable };
}

const TWO_INPUT_FORMULAS: Readonly<Record<Exclude<FeelsLikeKind, 'apparent-temperature'>, (tC: number, tdC: number) => number>> = {
  'heat-index': (tc, td) => heatIndexRothfusz1990C(tc, rhAt(tc, td, MAGNUS_ALDUCHOV_ESKRIDGE_1996)),
  humidex: humidexMastertonRichardson1979,
  'wbgt-simplified': (tc, td) => wbgtSimplifiedBomC(tc, rhAt(tc, td, MAGNUS_BOM)),
};
