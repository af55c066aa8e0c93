/**
 * Verification cases of one source × region × indicator over the hindcast set, per lead (scored by skill.ts).
 * (a) basis "observed": one case per hindcast entry (year, or pooled start of a year). Forecast p = fraction of
 *     the entry's members above the leave-one-year-out model threshold (from all other years' hindcasts, so a
 *     year never sets its own). Event o = observed value above, for a percentile spec, the same percentile of
 *     the observed climatology without that year — both by the unbiased Weibull position, so the observed and
 *     forecast events have the same nominal frequency (thresholds.ts); for an absolute spec, the absolute value
 *     (the forecast side then uses the leave-one-year-out quantile-mapped threshold at every tier, as
 *     probability.ts does with all years: the mapping for year y is built without year y).
 * (b) basis "potential" (perfect model, when observations do not cover the lead): each member of year y in turn is
 *     the truth, the remaining members the forecast, with the leave-one-year-out model threshold for both. Its
 *     cases (years × members) are not independent: the number of years is. It measures predictability in the
 *     model's own world, not real skill, and never passes the skill gate (skill-gate.ts).
 */
import { percentileLinear } from '../core/percentile.ts';
import type { ThresholdSpec } from '../config/types.ts';
import type { LeadWindow } from '../types.ts';
import type { VerificationCases } from './bootstrap.ts';
import { leadSample, yearMembers } from './climate.ts';
import type { LeadClimate } from './lead-climate.ts';
import { leadLabel } from './lead-tiers.ts';
import { exceedanceFraction } from './probability.ts';
import { leaveOneYearOutThresholds, quantileMappedThreshold } from './thresholds.ts';

function build(p: number[], m: number[], o: number[], y: number[]): VerificationCases {
  return {
    p: Float64Array.from(p),
    members: Float64Array.from(m),
    o: Float64Array.from(o),
    caseYears: Float64Array.from(y),
    years: [...new Set(y)].sort((a, b) => a - b),
  };
}

/** Cases of lead position l against observations; entries missing on either side are skipped. */
export function observedCases(hc: LeadClimate, obs: LeadClimate, l: number, spec: ThresholdSpec): VerificationCases {
  const n = hc.years.length;
  const fcThr = new Float64Array(n);
  const obsThr = new Float64Array(n);
  if (spec.kind === 'percentile') {
    fcThr.set(leaveOneYearOutThresholds(hc, l, spec.percentile));
    hc.years.forEach((year, y) => (obsThr[y] = percentileLinear(leadSample(obs, l, year), spec.percentile, 'weibull')));
  } else {
    hc.years.forEach((year, y) => (fcThr[y] = quantileMappedThreshold(spec.value, obs, hc, l, year).value));
    obsThr.fill(spec.value);
  }
  const p: number[] = [],
    m: number[] = [],
    o: number[] = [],
    ys: number[] = [];
  // Observations stacked like the hindcasts (same entries) match by position, else by year.
  hc.years.forEach((year, y) => {
    const oy = obs.years[y] === year ? y : obs.years.indexOf(year);
    if (oy < 0) return;
    const truth = obs.values[oy * obs.leads.length + l];
    const exc = exceedanceFraction(yearMembers(hc, y, l), fcThr[y]);
    if (Number.isNaN(exc.probability) || Number.isNaN(truth) || Number.isNaN(obsThr[y])) return;
    p.push(exc.probability);
    m.push(exc.valid);
    o.push(truth > obsThr[y] ? 1 : 0);
    ys.push(year);
  });
  return build(p, m, o, ys);
}

/** Perfect-model cases of lead position l: each member as truth against the others of its year. */
export function potentialCases(hc: LeadClimate, l: number, spec: ThresholdSpec): VerificationCases {
  const thr =
    spec.kind === 'percentile' ? leaveOneYearOutThresholds(hc, l, spec.percentile) : new Float64Array(hc.years.length).fill(spec.value);
  const p: number[] = [],
    mm: number[] = [],
    o: number[] = [],
    ys: number[] = [];
  const others = new Float64Array(Math.max(hc.members - 1, 0));
  hc.years.forEach((year, y) => {
    const t = thr[y];
    const ens = yearMembers(hc, y, l);
    for (let m = 0; m < hc.members; m++) {
      if (Number.isNaN(ens[m]) || Number.isNaN(t)) continue;
      for (let k = 0, j = 0; k < hc.members; k++) if (k !== m) others[j++] = ens[k];
      const exc = exceedanceFraction(others, t);
      if (Number.isNaN(exc.probability)) continue;
      p.push(exc.probability);
      mm.push(exc.valid);
      o.push(ens[m] > t ? 1 : 0);
      ys.push(year);
    }
  });
  return build(p, mm, o, ys);
}

/** Verification cases of every hindcast lead: against observations where they cover the lead, else perfect-model. */
export function leadCases(
  hc: LeadClimate,
  observed: LeadClimate | null,
  spec: ThresholdSpec,
): { lead: LeadWindow; basis: 'observed' | 'potential'; cases: VerificationCases; why: string }[] {
  return hc.leads.map((lead, l) => {
    const obsCovers = observed !== null && l < observed.leads.length && leadSample(observed, l).length > 0;
    if (obsCovers) return { lead, basis: 'observed' as const, cases: observedCases(hc, observed, l, spec), why: '' };
    const why = observed === null ? 'no observations configured' : `observations do not cover ${leadLabel(lead)}`;
    return { lead, basis: 'potential' as const, cases: potentialCases(hc, l, spec), why };
  });
}
