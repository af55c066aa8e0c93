/**
 * Input of the render stage. Built by the pipeline from the boundary types (`LeadProbability`, `StageDecision`)
 * and the operator's config objects only — the renderer never recomputes a probability or a stage.
 *
 * BulletinRun
 *   runId          stable id of this run (used in bulletin ids, CAP identifiers, file names)
 *   issuedAt       ISO 8601 instant the bulletin is issued (with `Z` or an offset)
 *   mode           'live' → CAP status Actual; 'exercise' → CAP status Exercise and an EXERCISE banner
 *   forecastDates  one row per source used; `basedOnOlder` when the newest forecast was late and an older one
 *                  was used ("based on the forecast of <date>")
 *   nextIssue      local calendar date of the next regular bulletin
 *   regions        one outcome per configured region, in config order
 *
 * RegionOutcome
 *   stage            combined stage of the region (highest over indicators and tiers), null when no forecast of any
 *                    tier could be used and no earlier stage is held ("no forecast available", never the lowest stage)
 *   previousStageId  combined stage in the last issued bulletin, null when there was none
 *   changeReason     the decide stage's one-line reason for the change (or for holding), shown as given
 *   perTier          one entry per indicator × tier, each with its StageDecision and every LeadProbability
 */
import type { Diagnostic } from '../core/diagnostics.ts';
import type { IsoDate, Tier } from '../types.ts';
import type { StageDecision } from '../decision-types.ts';
import type { LeadProbability } from '../probability-types.ts';
import type { Config, IndicatorConfig, RegionConfig } from '../config/types.ts';
import type { StageConfig } from '../config/decision-config.ts';

/**
 * The parts of the configuration the render stage reads: country names, teams, indicators (names and
 * thresholds), the stage ladder, the rules and decision settings (for the wording of why and how sure), the
 * texts (cautions, probability words), the templates folder and the sender address. Nothing about the files
 * read, calibration, schedule or the ledger.
 */
export type RenderConfig = Pick<
  Config,
  | 'country'
  | 'countryNames'
  | 'teams'
  | 'indicators'
  | 'stages'
  | 'rules'
  | 'decision'
  | 'cautions'
  | 'probabilityWords'
  | 'templates'
  | 'population'
> & { readonly delivery: Pick<Config['delivery'], 'from' | 'pdfChromium'> };

export interface ForecastDate {
  /** Source id (`SourceConfig.id`). */
  readonly source: string;
  /** Human-readable source name (`SourceConfig.name`). */
  readonly name: string;
  /** Lead-time tier the source serves (names the forecast in the bulletin's own language). */
  readonly tier: Tier;
  /** ISO 8601 UTC reference time of the forecast actually used. */
  readonly referenceTime: string;
  /** True when the expected newer forecast was missing and this older one was used. */
  readonly basedOnOlder?: boolean;
}

/** The part of an indicator the bulletin shows. */
export type IndicatorRef = Pick<IndicatorConfig, 'id' | 'name'> & { readonly units: string };

export interface TierOutcome {
  readonly tier: Tier;
  readonly indicator: IndicatorRef;
  readonly decision: StageDecision;
  /** Every lead of this tier, lead 1 first. */
  readonly probabilities: readonly LeadProbability[];
}

export interface RegionOutcome {
  readonly region: RegionConfig;
  /** Combined (highest) stage over all indicators and tiers; null = no forecast available (no usable data at all). */
  readonly stage: StageConfig | null;
  readonly previousStageId: string | null;
  readonly changeReason: string;
  readonly perTier: readonly TierOutcome[];
}

export interface BulletinRun {
  readonly runId: string;
  readonly issuedAt: string;
  readonly mode: 'live' | 'exercise';
  readonly forecastDates: readonly ForecastDate[];
  readonly nextIssue: IsoDate;
  readonly regions: readonly RegionOutcome[];
  /** Run-level notes for run.json: the source-combination rule and what it replaced. */
  readonly notes?: readonly string[];
  /** Input problems of the run (files, regions, indicators left out and why), as data. */
  readonly problems?: readonly Diagnostic[];
}

/** One CAP alert issued earlier, as the ledger keeps it; lets this run send Update / Cancel with references. */
export interface IssuedAlert {
  readonly region: string;
  readonly indicator: string;
  readonly sender: string;
  /** CAP identifier (same field name as `CapAlert.id`, so a CapAlert can be stored and passed back as is). */
  readonly id: string;
  /** CAP `sent` value exactly as issued. */
  readonly sent: string;
  readonly stageId: string;
}

/** What the renderer needs to know about the last issued run. */
export interface PreviousIssue {
  readonly runId: string;
  readonly alerts: readonly IssuedAlert[];
}

export interface CapAlert {
  /** CAP identifier. */
  readonly id: string;
  readonly region: string;
  readonly indicator: string;
  readonly msgType: 'Alert' | 'Update' | 'Cancel';
  readonly sent: string;
  readonly sender: string;
  readonly stageId: string;
  readonly xml: string;
}
