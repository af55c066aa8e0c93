/**
 * Skill of one source × region × indicator over the hindcast set, per lead, from the verification cases of
 * verification-cases.ts (observed, or perfect-model "potential" skill that never passes the skill gate).
 * Every score comes with its event count and a 90 % year-block bootstrap interval (bootstrap.ts); the fair Brier
 * score (Ferro 2014) removes the ensemble-size penalty so hindcast and forecast ensembles compare.
 */
import type { ThresholdSpec } from '../config/types.ts';
import type { LeadWindow } from '../types.ts';
import type { SkillGateResult, SkillSummary } from '../probability-types.ts';
import { distinctYears } from './climate.ts';
import type { LeadClimate } from './lead-climate.ts';
import { leadLabel } from './lead-tiers.ts';
import { yearBlockBootstrap, type BootstrapIntervals, type VerificationCases } from './bootstrap.ts';
import { fairBrierScoreFerro2014, fairBrierSkillScore } from './fair-brier.ts';
import { gateByLead, type SkillGate } from './skill-gate.ts';
import { outOfSampleValueCurve, type OutOfSampleValue } from './trigger-tuning.ts';
import { reliabilityDiagram } from './reliability.ts';
import { leadCases } from './verification-cases.ts';

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
