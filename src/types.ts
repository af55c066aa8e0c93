/**
 * Boundary types passed between pipeline stages (read → indicators → calibrate → decide → render → deliver).
 * Every object crossing a stage boundary is read-only and serialisable; arrays of numbers are Float64Array,
 * member-major: value of member m on step t is `data[m * steps + t]`, NaN where missing.
 */

/** Calendar date `YYYY-MM-DD` (a local day of a region, or a UTC date where stated). */
export type IsoDate = string;

/** Lead-time tiers: short-range days, sub-seasonal weeks, seasonal months. */
/** The tiers, shortest first. */
export const TIERS = ['days', 'weeks', 'months'] as const;
export type Tier = (typeof TIERS)[number];

/** Canonical physical quantities Forelight reads, with their canonical units. */
export type Quantity =
  | 'tmax'
  | 'tmin'
  | 'tmean'
  | 'dewpoint'
  | 'rh'
  /** Near-surface specific humidity; with surface-pressure it gives the dewpoint (indicators/specific-humidity.ts). */
  | 'specific-humidity'
  | 'surface-pressure'
  | 'precip'
  | 'wind';

export const CANONICAL_UNITS: Readonly<Record<Quantity, string>> = {
  tmax: 'degC',
  tmin: 'degC',
  tmean: 'degC',
  dewpoint: 'degC',
  rh: '%',
  'specific-humidity': 'kg/kg',
  'surface-pressure': 'hPa',
  precip: 'mm/day',
  wind: 'm/s',
};

/** Where a series came from: enough to find the exact bytes again. */
export interface Provenance {
  readonly file: string;
  readonly variable: string;
  /** Forecast reference time (ISO 8601, UTC). */
  readonly referenceTime: string;
}

/** Output of the read stage: one quantity, one region, all members, daily steps (local days of the region). */
export interface RegionSeries {
  readonly region: string;
  readonly quantity: Quantity;
  readonly units: string;
  /** Local calendar days, lead day 1 first. */
  readonly days: readonly IsoDate[];
  readonly members: number;
  /** member-major [member][day], NaN where missing. */
  readonly data: Float64Array;
  /** Number of grid cells that fall in the region. */
  readonly cells: number;
  readonly provenance: Provenance;
  /** How the cells were weighted: by area (absent) or by the people of the population raster. */
  readonly weighting?: 'population';
  /** Every cell's own series, for indicators whose region value is a share above a level (absent otherwise). */
  readonly perCell?: CellSeries;
  /** Daily data of a model-calendar file: its calendar and the model date of each day (absent for Gregorian files). */
  readonly modelCalendar?: ModelDays;
}

/** CF 1.11 §4.4.1 calendars whose dates differ from the Gregorian ones (`noleap` also stands for `365_day`). */
export type ModelCalendarName = 'julian' | 'noleap' | 'all_leap' | '360_day';

/**
 * Daily data in a model calendar (src/read/DECISIONS.md §3): `days[i]` is the model-calendar date (`YYYY-MM-DD`)
 * of the series' i-th local day, so that month leads are the model's months.
 */
export interface ModelDays {
  readonly calendar: ModelCalendarName;
  readonly days: readonly string[];
}

/** The cells of a region one by one: weights (area or people, summing to 1) and [cell][member][day] values. */
export interface CellSeries {
  readonly weights: Float64Array;
  readonly data: Float64Array;
}

/** Output of the read stage for one file (a forecast, one hindcast start or the observations): region id → quantity → series. */
export type RegionQuantities = Map<string, Map<Quantity, RegionSeries>>;

/** Output of the read stage for one hindcast start of a source. */
export interface HindcastRead {
  readonly year: number;
  /** Start date, YYYY-MM-DD. */
  readonly start: IsoDate;
  readonly path: string;
  readonly series: RegionQuantities;
}

/** Output of the indicators stage: one indicator for one region, per member and day. */
export interface IndicatorSeries {
  readonly region: string;
  readonly indicator: string;
  readonly units: string;
  readonly days: readonly IsoDate[];
  readonly members: number;
  /** member-major [member][day], NaN where missing. */
  readonly data: Float64Array;
  /** Count of input values outside the formula's valid range (flagged, result NaN). */
  readonly outOfRange: number;
  /** Count of missing (NaN) values in the result. */
  readonly missing: number;
  /** 1 where a value lies beyond the formula's published table and was capped there (heat index), member-major. */
  readonly beyondTable?: Uint8Array;
  /** The inputs' model calendar (RegionSeries.modelCalendar); absent for Gregorian data. */
  readonly modelCalendar?: ModelDays;
}

/** One lead of a tier: the local days it speaks for. */
export interface LeadWindow {
  readonly tier: Tier;
  /** 1-based: day 1, week 1, month 1. */
  readonly index: number;
  /** First and last local day covered (inclusive). */
  readonly start: IsoDate;
  readonly end: IsoDate;
  /** A month lead of daily data in a model calendar: the model month (`YYYY-MM`) it is; absent otherwise. */
  readonly modelMonth?: string;
}

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

/** Output of the decide stage: the stage for one region × indicator × tier, with the reasons. */
export interface StageDecision {
  readonly region: string;
  readonly indicator: string;
  readonly tier: Tier;
  /** Stage id from the ladder. */
  readonly stageId: string;
  /** Stage that the probabilities alone would give before persistence/hysteresis. */
  readonly rawStageId: string;
  readonly ruleId: string | null;
  /** The lead that set the stage (highest), if any. */
  readonly lead: LeadProbability | null;
  /** Leads withheld by the skill gate. */
  readonly withheldLeads: readonly LeadWindow[];
  /**
   * Per usable lead of the rules, the highest stage its probability reaches by the rules alone (before the tier cap
   * and persistence); leads that no rule looks at, or the skill gate withheld, are absent. Lets the bulletin say why
   * a high chance did not raise the stage.
   */
  readonly leadStages?: readonly { readonly index: number; readonly stageId: string }[];
  /** Human-readable chain of reasons, in order. */
  readonly reasons: readonly string[];
  /**
   * Set when this region × indicator × tier had no usable data this run: why, how many runs in a row, and whether
   * the last issued stage is held (`stageId` is then that stage) or the hold expired (`stageId` is "no-forecast").
   */
  readonly missing?: { readonly reason: string; readonly runs: number; readonly held: boolean };
  /** Set when the rules' stage was above the tier cap: the cap applied and the stage the rules gave. */
  readonly cap?: { readonly stageId: string; readonly uncappedId: string };
  /**
   * Set when persistence issued another stage than the (capped) rules gave: waiting to raise towards `towardsId`
   * or to lower, after `runs` of the `needed` bulletins in a row.
   */
  readonly wait?: PersistenceWait;
  /** How each lead of the tier took part in the stage, lead 1 first (decide/lead-use.ts). */
  readonly leadUses?: readonly LeadUse[];
}

/** Persistence holding the issued stage against the rules (decide/persistence.ts). */
export interface PersistenceWait {
  readonly direction: 'raise' | 'lower';
  /** The stage the rules point to. */
  readonly towardsId: string;
  /** Consecutive runs so far (this one included) and runs needed before the stage moves. */
  readonly runs: number;
  readonly needed: number;
  /** Set when persistence raised the issued stage in this run, from this stage; the rest of the way still waits. */
  readonly raisedFromId?: string;
}

/**
 * How one lead took part in its tier's stage: `sets-stage` = its probability set the issued stage; `counted` = used
 * by the rules, pointing to no stage above the issued one; `no-skill` = withheld by the skill gate (no demonstrated
 * skill); `no-rule` = no trigger rule of the tier looks at this lead; `no-value` = no probability; `no-contrast` = held because its threshold cannot tell the forecast
 * from a normal year (flag threshold-degenerate, src/calibrate/degenerate-threshold.ts); `capped` = the rules
 * give a stage above the tier cap; `awaiting` = it points above the issued stage, which waits for confirmation in the
 * next run(s) (persistence).
 */
export type LeadUseKind = 'sets-stage' | 'counted' | 'no-skill' | 'no-rule' | 'no-value' | 'no-contrast' | 'capped' | 'awaiting';

export interface LeadUse {
  readonly index: number;
  readonly kind: LeadUseKind;
  /** Stage its probability reaches by the rules alone (before cap and persistence); lowest when not used. */
  readonly reachedId: string;
  /** The stage it supports after the tier cap (= reachedId without a cap). */
  readonly supportsId: string;
}

/** A rendered bulletin for one audience (a team or the national office). */
export interface Bulletin {
  readonly id: string;
  readonly team: string;
  readonly locale: string;
  readonly to: readonly string[];
  readonly subject: string;
  readonly html: string;
  readonly text: string;
  readonly attachments: readonly {
    readonly cid: string;
    readonly filename: string;
    readonly contentType: string;
    readonly content: Uint8Array;
  }[];
}

/** Result of delivering one bulletin to one recipient. */
export interface DeliveryReceipt {
  readonly bulletinId: string;
  readonly recipient: string;
  readonly status: 'sent' | 'outbox' | 'failed';
  readonly detail: string;
  readonly at: string;
}
