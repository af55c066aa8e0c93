/**
 * Skill of one source × region × indicator over the hindcast set, per lead.
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
 * Every score comes with its event count and a 90 % year-block bootstrap interval (bootstrap.ts); the fair Brier
 * score (Ferro 2014) removes the ensemble-size penalty so hindcast and forecast ensembles compare.
 */
import type { ThresholdSpec } from '../config/types.ts';
import type { LeadWindow } from '../types.ts';
import type { SkillGateResult, SkillSummary } from '../probability-types.ts';
import { distinctYears, leadSample, yearMembers, type LeadClimate } from './climate.ts';
import { leadLabel } from './lead-tiers.ts';
import { leaveOneYearOutThresholds, quantileMappedThreshold } from './thresholds.ts';
import { exceedanceFraction } from './probability.ts';
import { percentileLinear } from '../core/percentile.ts';
import { yearBlockBootstrap, type BootstrapIntervals, type VerificationCases } from './bootstrap.ts';
import { fairBrierScoreFerro2014, fairBrierSkillScore } from './fair-brier.ts';
import { gateByLead, type SkillGate } from './skill-gate.ts';
import { outOfSampleValueCurve, type OutOfSampleValue } from './trigger-tuning.ts';
import { reliabilityDiagram } from './reliability.ts';

/** Consistency resamples per reliability diagram: 5–95 % bars to about ±0.02 (our choice, no source), at half a bootstrap's cost. */
const RELIABILITY_RESAMPLES = 500;
import {
  brierScore1950,
  brierSkillScoreSampleClimatology,
  contingencyTable,
  falseAlarmRate,
  falseAlarmRatio,
  hitRate,
  murphyDecomposition1973,
  peirceSkillScore,
  reliabilityTable,
  rocArea,
  rocPoints,
  valueEnvelope,
  VALUE_ALPHAS,
  type ReliabilityRow,
  type RocPoint,
  type ValuePoint,
} from './verify.ts';

export type { SkillGate } from './skill-gate.ts';

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
  readonly events: number;
  readonly years: readonly number[];
  readonly baseRate: number;
  readonly brierScore: number;
  readonly brierSkillScore: number;
  readonly fairBrierScore: number;
  readonly fairBrierSkillScore: number;
  readonly reliability: number;
  readonly resolution: number;
  readonly uncertainty: number;
  readonly rocArea: number;
  /** 90 % year-block bootstrap intervals of BSS, fair BSS and ROC area at this lead alone. */
  readonly intervals: BootstrapIntervals;
  readonly rocPoints: readonly RocPoint[];
  readonly reliabilityTable: readonly ReliabilityRow[];
  readonly stages: readonly StageScores[];
  /** Value envelope over cost/loss 0.05..0.95, thresholds chosen and judged on the same cases (in-sample). */
  readonly value: readonly ValuePoint[];
  /** The same curve judged out of sample (leave-one-year-out thresholds), with 90 % bootstrap intervals; empty unless asked. */
  readonly outOfSampleValue: readonly OutOfSampleValue[];
  readonly flags: readonly string[];
  readonly summary: SkillSummary;
}

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

/** All scores of a set of cases; `gate` is the verdict on the lead's pooling window (skill-gate.ts). */
export function scoreCases(
  lead: LeadWindow,
  basis: 'observed' | 'potential',
  cases: VerificationCases,
  stageProbabilities: readonly number[],
  gate: SkillGate,
  verdict: SkillGateResult,
  flags: readonly string[],
): SkillReport {
  const { p, o, members } = cases;
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
  const fbs = usable ? fairBrierScoreFerro2014(p, members, o) : nan;
  const fbss = usable ? fairBrierSkillScore(p, members, o) : nan;
  const auc = usable ? rocArea(p, o) : nan;
  const dec = usable ? murphyDecomposition1973(p, o) : { reliability: nan, resolution: nan, uncertainty: nan };
  const stages = stageProbabilities.map((t) => {
    const tab = contingencyTable(p, o, t);
    return {
      probability: t,
      hitRate: hitRate(tab),
      falseAlarmRate: falseAlarmRate(tab),
      falseAlarmRatio: falseAlarmRatio(tab),
      peirceSkillScore: peirceSkillScore(tab),
    };
  });
  const intervals = yearBlockBootstrap(cases, { resamples: gate.resamples, seed: gate.seed });
  return {
    lead,
    basis,
    cases: n,
    events,
    years: cases.years,
    baseRate: usable ? events / n : nan,
    brierScore: bs,
    brierSkillScore: bss,
    fairBrierScore: fbs,
    fairBrierSkillScore: fbss,
    ...dec,
    rocArea: auc,
    intervals,
    rocPoints: usable ? rocPoints(p, o) : [],
    reliabilityTable: usable ? reliabilityTable(p, o) : [],
    stages,
    value: usable ? valueEnvelope(p, o) : [],
    outOfSampleValue: [],
    flags: allFlags,
    summary: {
      brierScore: bs,
      brierSkillScore: bss,
      fairBrierSkillScore: fbss,
      rocArea: auc,
      basis,
      cases: n,
      years: cases.years.length,
      events,
      gate: verdict,
      reliability: usable && basis === 'observed' ? reliabilityDiagram(p, o, { resamples: RELIABILITY_RESAMPLES, seed: gate.seed }) : null,
      skilful: verdict.passed,
    },
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
  /** Also judge the value curve leave-one-year-out per lead (trigger-tuning.ts; costly: 19 cost/loss ratios × years). */
  readonly outOfSampleValue?: boolean;
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

/** A SkillReport per hindcast lead, each with the skill gate's verdict on its pooling window. */
export function skillReports(req: SkillRequest): SkillReport[] {
  const nYears = distinctYears(req.hindcast);
  const flags =
    nYears < req.minHindcastYears ? [`thresholds unstable: only ${nYears} hindcast years (minimum ${req.minHindcastYears})`] : [];
  const leads = leadCases(req.hindcast, req.observed, req.threshold);
  const verdicts = gateByLead(leads, req.gate);
  return leads.map((lc) => {
    const extra = lc.basis === 'potential' ? [`potential skill only: ${lc.why}`] : [];
    const report = scoreCases(
      lc.lead,
      lc.basis,
      lc.cases,
      req.stageProbabilities,
      req.gate,
      verdicts.get(lc.lead.index) as SkillGateResult,
      [...flags, ...extra],
    );
    if (!req.outOfSampleValue || lc.cases.p.length === 0) return report;
    const options = { resamples: req.gate.resamples, seed: req.gate.seed };
    return { ...report, outOfSampleValue: outOfSampleValueCurve(lc.cases, VALUE_ALPHAS, options) };
  });
}

/** Summaries keyed by lead index, for ProbabilityRequest.skill. */
export function skillByLead(reports: readonly SkillReport[]): Map<number, SkillSummary> {
  return new Map(reports.map((r) => [r.lead.index, r.summary]));
}
