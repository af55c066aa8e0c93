/**
 * Skill of one source × region × indicator over the hindcast set, per lead.
 * (a) basis "observed": one case per hindcast year y. Forecast p_y = fraction of year y's members above the
 *     leave-one-year-out model threshold (from all other years' hindcasts, so a year never sets its own). Event
 *     o_y = observed value of year y above, for a percentile spec, the same percentile of the observed climatology
 *     without year y; for an absolute spec, the absolute value (the forecast side then uses the leave-one-year-out
 *     quantile-mapped threshold for weeks/months, as probability.ts does with all years).
 * (b) basis "potential" (perfect model, when observations do not cover the lead): each member of year y in turn is
 *     the truth, the remaining members the forecast, with the leave-one-year-out model threshold for both;
 *     cases = years × members. It measures predictability in the model's own world, not real skill.
 */
import type { DecisionConfig, ThresholdSpec } from '../config/types.ts';
import type { LeadWindow, SkillSummary } from '../types.ts';
import { distinctYears, leadSample, yearMembers, type LeadClimate } from './climate.ts';
import { leadLabel } from './lead-tiers.ts';
import { leaveOneYearOutThresholds, quantileMappedThreshold } from './thresholds.ts';
import { exceedanceFraction } from './probability.ts';
import { percentileLinear } from '../core/percentile.ts';
import {
  brierScore1950, brierSkillScoreSampleClimatology, contingencyTable, falseAlarmRate, falseAlarmRatio, hitRate,
  murphyDecomposition1973, peirceSkillScore, reliabilityTable, rocArea, rocPoints, valueEnvelope,
  type ReliabilityRow, type RocPoint, type ValuePoint,
} from './verify.ts';

export type SkillGate = DecisionConfig['skillGate'];

export interface StageScores {
  /** Warn when p >= probability. */
  readonly probability: number;
  readonly hitRate: number;
  readonly falseAlarmRate: number;
  readonly falseAlarmRatio: number;
  readonly peirceSkillScore: number;
}

export interface SkillReport {
  readonly lead: LeadWindow;
  readonly basis: 'observed' | 'potential';
  readonly cases: number;
  readonly years: readonly number[];
  readonly baseRate: number;
  readonly brierScore: number;
  readonly brierSkillScore: number;
  readonly reliability: number;
  readonly resolution: number;
  readonly uncertainty: number;
  readonly rocArea: number;
  readonly rocPoints: readonly RocPoint[];
  readonly reliabilityTable: readonly ReliabilityRow[];
  readonly stages: readonly StageScores[];
  /** Value envelope over cost/loss 0.05..0.95. */
  readonly value: readonly ValuePoint[];
  readonly flags: readonly string[];
  readonly summary: SkillSummary;
}

/**
 * Skill gate (DecisionConfig.skillGate): rocArea passes at >= floor (floors are stated inclusively, e.g. 0.6);
 * brierSkillScore must be > floor (a BSS equal to the floor, typically 0, is no gain over climatology).
 * NaN never passes.
 */
export function applySkillGate(scores: { readonly rocArea: number; readonly brierSkillScore: number }, gate: SkillGate): boolean {
  return gate.score === 'rocArea' ? scores.rocArea >= gate.floor : scores.brierSkillScore > gate.floor;
}

/** Cases (p, o) of lead position l against observations; years missing on either side are skipped. */
export function observedCases(hc: LeadClimate, obs: LeadClimate, l: number, spec: ThresholdSpec, tierUsesMapping: boolean): { p: Float64Array; o: Float64Array; years: number[] } {
  const n = hc.years.length;
  const fcThr = new Float64Array(n);
  const obsThr = new Float64Array(n);
  if (spec.kind === 'percentile') {
    fcThr.set(leaveOneYearOutThresholds(hc, l, spec.percentile));
    hc.years.forEach((year, y) => (obsThr[y] = percentileLinear(leadSample(obs, l, year), spec.percentile)));
  } else {
    hc.years.forEach((year, y) => (fcThr[y] = tierUsesMapping ? quantileMappedThreshold(spec.value, obs, hc, l, year).value : spec.value));
    obsThr.fill(spec.value);
  }
  const p: number[] = [];
  const o: number[] = [];
  const years = new Set<number>();
  // Observations stacked like the hindcasts (same entries) match by position, else by year.
  hc.years.forEach((year, y) => {
    const oy = obs.years[y] === year ? y : obs.years.indexOf(year);
    if (oy < 0) return;
    const truth = obs.values[oy * obs.leads.length + l];
    const py = exceedanceFraction(yearMembers(hc, y, l), fcThr[y]).probability;
    if (Number.isNaN(py) || Number.isNaN(truth) || Number.isNaN(obsThr[y])) return;
    p.push(py);
    o.push(truth > obsThr[y] ? 1 : 0);
    years.add(year);
  });
  return { p: Float64Array.from(p), o: Float64Array.from(o), years: [...years] };
}

/** Perfect-model cases of lead position l: each member as truth against the others of its year. */
export function potentialCases(hc: LeadClimate, l: number, spec: ThresholdSpec): { p: Float64Array; o: Float64Array; years: number[] } {
  const thr = spec.kind === 'percentile' ? leaveOneYearOutThresholds(hc, l, spec.percentile) : new Float64Array(hc.years.length).fill(spec.value);
  const p: number[] = [];
  const o: number[] = [];
  const years = new Set<number>();
  const others = new Float64Array(Math.max(hc.members - 1, 0));
  hc.years.forEach((year, y) => {
    const t = thr[y];
    const ens = yearMembers(hc, y, l);
    for (let m = 0; m < hc.members; m++) {
      if (Number.isNaN(ens[m]) || Number.isNaN(t)) continue;
      for (let k = 0, j = 0; k < hc.members; k++) if (k !== m) others[j++] = ens[k];
      const pm = exceedanceFraction(others, t).probability;
      if (Number.isNaN(pm)) continue;
      p.push(pm);
      o.push(ens[m] > t ? 1 : 0);
      years.add(year);
    }
  });
  return { p: Float64Array.from(p), o: Float64Array.from(o), years: [...years] };
}

/** All scores of a set of cases. */
export function scoreCases(
  lead: LeadWindow, basis: 'observed' | 'potential', cases: { p: Float64Array; o: Float64Array; years: readonly number[] },
  stageProbabilities: readonly number[], gate: SkillGate, flags: readonly string[],
): SkillReport {
  const { p, o } = cases;
  const n = p.length;
  const events = o.reduce((a, b) => a + b, 0);
  const allFlags = [...flags];
  if (n === 0 || events === 0 || events === n) {
    allFlags.push(`no-contrast: ${events} events in ${n} cases at ${leadLabel(lead)}; scores undefined (NaN), the gate fails`);
  }
  const nan = Number.NaN;
  const usable = n > 0;
  const bs = usable ? brierScore1950(p, o) : nan;
  const bss = usable ? brierSkillScoreSampleClimatology(p, o) : nan;
  const auc = usable ? rocArea(p, o) : nan;
  const dec = usable ? murphyDecomposition1973(p, o) : { reliability: nan, resolution: nan, uncertainty: nan };
  const stages = stageProbabilities.map((t) => {
    const tab = contingencyTable(p, o, t);
    return { probability: t, hitRate: hitRate(tab), falseAlarmRate: falseAlarmRate(tab), falseAlarmRatio: falseAlarmRatio(tab), peirceSkillScore: peirceSkillScore(tab) };
  });
  const scores = { rocArea: auc, brierSkillScore: bss };
  return {
    lead, basis, cases: n, years: cases.years, baseRate: usable ? events / n : nan,
    brierScore: bs, brierSkillScore: bss, ...dec, rocArea: auc,
    rocPoints: usable ? rocPoints(p, o) : [], reliabilityTable: usable ? reliabilityTable(p, o) : [],
    stages, value: usable ? valueEnvelope(p, o) : [], flags: allFlags,
    summary: { brierScore: bs, brierSkillScore: bss, rocArea: auc, basis, cases: n, skilful: applySkillGate(scores, gate) },
  };
}

export interface SkillRequest {
  /** Hindcasts of one source × region × indicator × tier (stackYears). */
  readonly hindcast: LeadClimate;
  /** Observed lead values for the hindcast years (members = 1, same leads), or null → potential skill. */
  readonly observed: LeadClimate | null;
  readonly threshold: ThresholdSpec;
  /** Probability thresholds of the stage rules, for H/F/FAR/PSS. */
  readonly stageProbabilities: readonly number[];
  readonly gate: SkillGate;
  readonly minHindcastYears: number;
}

/** A SkillReport per hindcast lead: against observations where they cover the lead, else potential skill. */
export function skillReports(req: SkillRequest): SkillReport[] {
  const { hindcast: hc, observed } = req;
  const nYears = distinctYears(hc);
  const flags = nYears < req.minHindcastYears ? [`thresholds unstable: only ${nYears} hindcast years (minimum ${req.minHindcastYears})`] : [];
  return hc.leads.map((lead, l) => {
    const obsCovers = observed !== null && l < observed.leads.length && leadSample(observed, l).length > 0;
    if (obsCovers) {
      return scoreCases(lead, 'observed', observedCases(hc, observed, l, req.threshold, lead.tier !== 'days'), req.stageProbabilities, req.gate, flags);
    }
    const why = observed === null ? 'no observations configured' : `observations do not cover ${leadLabel(lead)}`;
    return scoreCases(lead, 'potential', potentialCases(hc, l, req.threshold), req.stageProbabilities, req.gate, [...flags, `potential skill only: ${why}`]);
  });
}

/** Summaries keyed by lead index, for ProbabilityRequest.skill. */
export function skillByLead(reports: readonly SkillReport[]): Map<number, SkillSummary> {
  return new Map(reports.map((r) => [r.lead.index, r.summary]));
}
