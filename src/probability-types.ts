/**
 * Boundary types of the calibrate stage's output (calibrate → decide → render, and the ledger): the exceedance
 * probability at one lead, with its threshold, base rate, skill and tercile outlook. Read-only and serialisable
 * like every boundary type (types.ts).
 */
import type { LeadWindow } from './types.ts';

/** A threshold with its units and where it came from. */
export interface Threshold {
  readonly value: number;
  readonly units: string;
  /** e.g. "90th percentile of hindcasts 2004-2023 (220 values), lead week 2". */
  readonly origin: string;
}

/** Why the skill gate passed or not (see calibrate/skill-gate.ts). */
export type SkillGateReason = 'shown' | 'not-shown' | 'few-events' | 'potential-only';

/** The skill gate's verdict on the pooling window of neighbouring leads that holds a lead. */
export interface SkillGateResult {
  /** The pooled leads, e.g. "days 1–7" or "week 2". */
  readonly leads: string;
  /** Observed events and distinct hindcast years in the window. */
  readonly events: number;
  readonly years: number;
  /** Fair Brier skill score (Ferro 2014) of the pooled cases and its 90 % year-block bootstrap interval. */
  readonly fairBrierSkillScore: number;
  readonly low: number;
  readonly high: number;
  readonly passed: boolean;
  readonly reason: SkillGateReason;
  /** One line for reasons and logs. */
  readonly text: string;
}

/** Skill of one source × region × indicator × lead over the hindcast set. */
export interface SkillSummary {
  readonly brierScore: number;
  readonly brierSkillScore: number;
  /** Ensemble-size-adjusted BSS (Ferro 2014), comparable between hindcast and forecast ensemble sizes. */
  readonly fairBrierSkillScore: number;
  readonly rocArea: number;
  /** "observed" when verified against observations, "potential" for a perfect-model estimate. */
  readonly basis: 'observed' | 'potential';
  /** Verification cases (for "potential", years × members: not independent). */
  readonly cases: number;
  /** Distinct hindcast years: the number of independent cases. */
  readonly years: number;
  /** Events among the cases at this lead. */
  readonly events: number;
  readonly gate: SkillGateResult;
  /**
   * Reliability diagram of this lead's cases (calibrate/reliability.ts: bins with Bröcker & Smith 2007
   * consistency bars, 500 resamples); null without cases and for a "potential" basis (no observations).
   */
  readonly reliability: ReliabilityDiagram | null;
  /** True when the skill gate passed: observed skill, enough events, interval above the floor. */
  readonly skilful: boolean;
}

/** One probability bin of a reliability diagram (calibrate/reliability.ts). */
export interface ReliabilityBin {
  /** Bin edges: [low, high) (the last bin includes 1). */
  readonly low: number;
  readonly high: number;
  readonly count: number;
  readonly forecastMean: number;
  readonly observedFrequency: number;
  /** 90 % consistency bar (NaN when no resample put a case in the bin). */
  readonly consistencyLow: number;
  readonly consistencyHigh: number;
}

export interface ReliabilityDiagram {
  readonly cases: number;
  readonly resamples: number;
  readonly bins: readonly ReliabilityBin[];
}

/** Tercile boundaries (1/3 and 2/3 quantiles of the hindcast climate, calibrate/terciles.ts). */
export interface TercileEdges {
  readonly lower: number;
  readonly upper: number;
}

/** Skill of a tercile outlook over the hindcast years (rpss.ts), with its 90 % year-block bootstrap interval. */
export interface TercileSkill {
  readonly years: number;
  readonly rpss: number;
  readonly rpssDebiased: number;
  readonly low: number;
  readonly high: number;
}

/** Below/near/above-normal chances of a month or a 3-month season of the forecast. */
export interface TercileOutlook {
  readonly period: 'month' | 'season';
  /** Month leads covered (1-based): [first, last]. */
  readonly months: readonly [number, number];
  readonly start: string;
  readonly end: string;
  readonly below: number;
  readonly near: number;
  readonly above: number;
  readonly members: number;
  readonly edges: TercileEdges;
  /** Null without observations covering the period (never a perfect-model estimate). */
  readonly skill: TercileSkill | null;
}

/**
 * A trend-aware climate at one lead (calibrate/trend-climate.ts): the year thresholds and normal-year rates are
 * re-centred on, and the least-squares trends removed, per decade in the indicator's units.
 */
/** One climate's fitted trend (calibrate/trend-climate.ts), per decade in the climate's units. */
export interface TrendFit {
  readonly perDecade: number;
  readonly standardErrorPerDecade: number;
  /** t(0.95, years − 2): the trend is applied when |perDecade| > criticalT × standardErrorPerDecade. */
  readonly criticalT: number;
  /** False: not told from zero, the climate used as it is (slope 0). */
  readonly applied: boolean;
}

export interface ClimateTrend {
  readonly onYear: number;
  readonly firstYear: number;
  readonly lastYear: number;
  readonly hindcast: TrendFit | null;
  /** Null where observations do not cover the lead. */
  readonly observed: TrendFit | null;
  readonly units: string;
}

/** Output of the calibrate stage: exceedance probability at one lead. */
export interface LeadProbability {
  readonly source: string;
  readonly region: string;
  readonly indicator: string;
  readonly lead: LeadWindow;
  /** Fraction 0..1 of members with value > threshold (strictly greater). */
  readonly probability: number;
  /** Normal-year frequency of the event, 0..1: observed where observations cover the lead, else the hindcasts'. */
  readonly baseRate: number;
  readonly members: number;
  readonly validMembers: number;
  readonly threshold: Threshold;
  readonly operator: '>';
  /** Set when members are too few for the stated precision, or the lead is uncalibrated. */
  readonly flags: readonly string[];
  readonly skill: SkillSummary | null;
  /** False when hindcasts did not cover this lead (threshold not from model climate). */
  readonly calibrated: boolean;
  /**
   * Months tier, temperature and rain indicators: below/near/above-normal chances of this month and of the
   * 3-month season starting with it (null past the last full season), with their RPSS.
   */
  readonly terciles?: { readonly month: TercileOutlook; readonly season: TercileOutlook | null };
  /** Set when the lead's climate is trend-aware: "normal year" then means a normal year for `onYear`. */
  readonly climateTrend?: ClimateTrend;
}
