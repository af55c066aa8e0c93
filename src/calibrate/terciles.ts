/**
 * Tercile categories (below / near / above normal) of a months-tier value, as seasonal outlooks are read: the
 * boundaries are the 1/3 and 2/3 quantiles (Hyndman-Fan type 7) of the hindcast climate at the same lead, so each
 * category holds a third of the past years; a forecast's category probabilities are the shares of its members in
 * each. A member on a boundary counts as near normal (common practice, no source). Seasonal = the mean of three
 * consecutive monthly leads (for a sum indicator the sum), computed per year and member before the categories.
 * Verification (for RPSS, rpss.ts) is cross-validated: year y's forecast categories use boundaries from the
 * hindcasts without y, its observed category boundaries from the observations without y (same-size samples on
 * both sides, so neither side's category frequencies are biased against the other).
 */
import { percentileLinear } from '../core/percentile.ts';
import type { LeadWindow } from '../types.ts';
import type { LeadProbability, TercileEdges, TercileOutlook, TercileSkill } from '../probability-types.ts';

export type { TercileEdges, TercileOutlook, TercileSkill } from '../probability-types.ts';
import { leadSample, yearMembers } from './climate.ts';
import type { LeadClimate } from './lead-climate.ts';
import { rankedProbabilitySkill, rpssBootstrap, type CategoryCases } from './rpss.ts';

export type TercileCategory = 'below' | 'near' | 'above';
export const TERCILES: readonly TercileCategory[] = ['below', 'near', 'above'];

/** The 1/3 and 2/3 quantiles of the valid values (NaN when none). */
export function tercileEdges(values: ArrayLike<number>): TercileEdges {
  return { lower: percentileLinear(values, 100 / 3), upper: percentileLinear(values, 200 / 3) };
}

/** 0 below, 1 near, 2 above normal; -1 for NaN. */
export function tercileIndex(x: number, e: TercileEdges): number {
  if (Number.isNaN(x) || Number.isNaN(e.lower)) return -1;
  return x < e.lower ? 0 : x > e.upper ? 2 : 1;
}

/** Shares of the valid members in each category [below, near, above], and how many were valid. */
export function tercileProbabilities(
  members: ArrayLike<number>,
  e: TercileEdges,
): { readonly p: [number, number, number]; readonly valid: number } {
  const counts = [0, 0, 0];
  for (let m = 0; m < members.length; m++) {
    const k = tercileIndex(members[m], e);
    if (k >= 0) counts[k]++;
  }
  const valid = counts[0] + counts[1] + counts[2];
  const p = counts.map((c) => (valid === 0 ? NaN : c / valid)) as [number, number, number];
  return { p, valid };
}

/**
 * A climate of 3-month seasons from a monthly one: season s covers leads s, s+1, s+2 (mean, or sum when `how` is
 * 'sum'); NaN when a month is missing. Lead windows run from the first month's start to the third's end.
 */
export function seasonalClimate(c: LeadClimate, how: 'mean' | 'sum'): LeadClimate {
  const nIn = c.leads.length;
  const nOut = Math.max(nIn - 2, 0);
  const values = new Float64Array(c.years.length * c.members * nOut);
  for (let row = 0; row < c.years.length * c.members; row++) {
    for (let s = 0; s < nOut; s++) {
      const sum = c.values[row * nIn + s] + c.values[row * nIn + s + 1] + c.values[row * nIn + s + 2];
      values[row * nOut + s] = how === 'sum' ? sum : sum / 3;
    }
  }
  const leads: LeadWindow[] = Array.from({ length: nOut }, (_, s) => ({ ...c.leads[s], end: c.leads[s + 2].end }));
  return { ...c, leads, values };
}

/** Cross-validated tercile forecasts of lead position l against observations, as cases for RPSS. */
export function tercileCases(hc: LeadClimate, obs: LeadClimate, l: number): CategoryCases {
  const probabilities: number[] = [];
  const observed: number[] = [];
  const members: number[] = [];
  const caseYears: number[] = [];
  hc.years.forEach((year, y) => {
    const oy = obs.years[y] === year ? y : obs.years.indexOf(year);
    if (oy < 0) return;
    const truth = obs.values[oy * obs.leads.length + l];
    const k = tercileIndex(truth, tercileEdges(leadSample(obs, l, year)));
    const f = tercileProbabilities(yearMembers(hc, y, l), tercileEdges(leadSample(hc, l, year)));
    if (k < 0 || f.valid === 0) return;
    probabilities.push(...f.p);
    observed.push(k);
    members.push(f.valid);
    caseYears.push(year);
  });
  return {
    categories: 3,
    probabilities: Float64Array.from(probabilities),
    observed: Int32Array.from(observed),
    members: Float64Array.from(members),
    caseYears: Float64Array.from(caseYears),
  };
}

export interface TercileRequest {
  /** Forecast month leads (aggregateToLeads, tier months). */
  readonly forecast: { readonly leads: readonly LeadWindow[]; readonly members: number; readonly values: Float64Array };
  readonly hindcast: LeadClimate;
  readonly observed: LeadClimate | null;
  /** How months make a season: mean (temperature) or sum (rain). */
  readonly how: 'mean' | 'sum';
  readonly bootstrap: { readonly resamples: number; readonly seed: number };
}

function forecastSeason(f: TercileRequest['forecast'], how: 'mean' | 'sum'): LeadClimate {
  return seasonalClimate({ years: [0], members: f.members, leads: [...f.leads], units: '', values: f.values }, how);
}

/** The outlook of month or season l; `window` is the forecast's own (the hindcast climate's dates are its first year's). */
function outlookAt(
  period: 'month' | 'season',
  l: number,
  window: LeadWindow,
  members: Float64Array,
  hc: LeadClimate,
  obs: LeadClimate | null,
  boot: TercileRequest['bootstrap'],
): TercileOutlook {
  const edges = tercileEdges(leadSample(hc, l));
  const f = tercileProbabilities(members, edges);
  let skill: TercileSkill | null = null;
  if (obs && l < obs.leads.length && leadSample(obs, l).length > 0) {
    const cases = tercileCases(hc, obs, l);
    const s = rankedProbabilitySkill(cases);
    const iv = rpssBootstrap(cases, boot);
    skill = { years: new Set(cases.caseYears).size, rpss: s.rpss, rpssDebiased: s.rpssDebiased, low: iv.low, high: iv.high };
  }
  const span = period === 'month' ? 0 : 2;
  return {
    period,
    months: [l + 1, l + 1 + span],
    start: window.start,
    end: window.end,
    below: f.p[0],
    near: f.p[1],
    above: f.p[2],
    members: f.valid,
    edges,
    skill,
  };
}

/** Tercile outlooks of every forecast month and every 3-month season the hindcasts cover. */
export function tercileOutlooks(req: TercileRequest): TercileOutlook[] {
  const { forecast: f, hindcast: hc, observed: obs } = req;
  const n = Math.min(f.leads.length, hc.leads.length);
  const memberValues = (values: Float64Array, nLeads: number, l: number) =>
    Float64Array.from({ length: f.members }, (_, m) => values[m * nLeads + l]);
  const months = Array.from({ length: n }, (_, l) =>
    outlookAt('month', l, f.leads[l], memberValues(f.values, f.leads.length, l), hc, obs, req.bootstrap),
  );
  const fs = forecastSeason(f, req.how);
  const hs = seasonalClimate(hc, req.how);
  const os = obs ? seasonalClimate(obs, req.how) : null;
  const seasons = Array.from({ length: Math.min(fs.leads.length, hs.leads.length) }, (_, s) =>
    outlookAt('season', s, fs.leads[s], memberValues(fs.values, fs.leads.length, s), hs, os, req.bootstrap),
  );
  return [...months, ...seasons];
}

/** Units of the quantities seasonal outlooks are read for: temperature and rain (an index or a count has none). */
const TERCILE_UNITS = new Set(['degC', 'mm', 'mm/day']);

/**
 * The months-tier probabilities of a temperature or rain indicator with their tercile outlooks attached (month l
 * and the season starting at l); other tiers, units or a missing hindcast climate are returned unchanged.
 */
export function withTerciles(
  probabilities: readonly LeadProbability[],
  req: Omit<TercileRequest, 'hindcast' | 'how'> & {
    readonly hindcast: LeadClimate | null;
    readonly units: string;
    readonly aggregate: 'mean' | 'max' | 'sum';
  },
): LeadProbability[] {
  const hindcast = req.hindcast;
  if (!hindcast || !TERCILE_UNITS.has(req.units) || req.forecast.leads[0]?.tier !== 'months') return [...probabilities];
  const outlooks = tercileOutlooks({ ...req, hindcast, how: req.aggregate === 'sum' ? 'sum' : 'mean' });
  return probabilities.map((p) => {
    const month = outlooks.find((o) => o.period === 'month' && o.months[0] === p.lead.index);
    if (!month) return p;
    return { ...p, terciles: { month, season: outlooks.find((o) => o.period === 'season' && o.months[0] === p.lead.index) ?? null } };
  });
}
