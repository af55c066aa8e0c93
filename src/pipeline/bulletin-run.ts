/**
 * Assembles the render stage's input (BulletinRun) from the decide stage's output, the probabilities and the
 * previous issue — no number is recomputed here.
 */
import type { Diagnostic } from '../core/diagnostics.ts';
import type { Config } from '../config/types.ts';
import type { StageConfig } from '../config/decision-config.ts';
import type { RegionStageLike } from '../decide/diff.ts';
import { combineRegionStages } from '../decide/decide-stages.ts';
import { NO_FORECAST_ID, stageRank, type DecideConfig, type RegionStage } from '../decide/types.ts';
import type { BulletinRun, RegionOutcome, TierOutcome } from '../render/model.ts';
import { computeNextRuns } from '../core/next-runs.ts';
import type { IsoDate, Tier } from '../types.ts';
import type { StageDecision } from '../decision-types.ts';
import type { LeadProbability } from '../probability-types.ts';
import { changeReason } from './change-reason.ts';
import type { SourceRead } from './read-file.ts';

export interface BulletinRunInput {
  readonly config: Config;
  readonly runId: string;
  readonly issuedAt: Date;
  readonly mode: BulletinRun['mode'];
  readonly sources: readonly SourceRead[];
  readonly probabilities: readonly LeadProbability[];
  readonly decisions: readonly StageDecision[];
  readonly regionStages: readonly RegionStage[];
  /** Region stages of the last issued bulletin (empty on the first issue). */
  readonly previous: readonly RegionStageLike[];
  /** Source-combination rule and what it replaced, for run.json. */
  readonly notes: readonly string[];
  /** Input problems of the run. */
  readonly problems: readonly Diagnostic[];
}

/** Local calendar date (YYYY-MM-DD) of an instant in an IANA time zone. */
export function localDate(instant: Date, timeZone: string): IsoDate {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(instant);
}

/** Date of the next scheduled issue after `from`, in the schedule's time zone. */
export function nextIssueDate(config: Pick<Config, 'schedule'>, from: Date): IsoDate {
  const [next] = computeNextRuns(config.schedule.cron, config.schedule.timezone, from, 1);
  return localDate(next ?? from, config.schedule.timezone);
}

/** Region stages of an issued run's rows, combined as the run's own decisions were (highest wins, or the matrix). */
export function issuedRegionStages(
  config: DecideConfig,
  rows: readonly { region: string; indicator: string; tier: Tier; stageId: string }[],
): RegionStageLike[] {
  const decisions: StageDecision[] = rows.map((r) => ({
    ...r,
    rawStageId: r.stageId,
    ruleId: null,
    lead: null,
    withheldLeads: [],
    reasons: [],
  }));
  const present = new Set(rows.map((r) => r.region));
  return combineRegionStages(config, decisions)
    .filter((r) => present.has(r.region))
    .map(({ region, stageId }) => ({ region, stageId }));
}

/** The highest of some stage ids on the ladder (the lowest stage when there are none). */
export function highestStageId(config: Pick<Config, 'stages'>, ids: readonly string[]): string {
  const rank = (id: string) => stageRank(config.stages, id);
  return ids.reduce((best, id) => (rank(id) > rank(best) ? id : best), config.stages[0].id);
}

/** The ladder stage of an id; null for "no forecast available" (never the lowest stage in disguise). */
function stageById(config: Pick<Config, 'stages'>, id: string): StageConfig | null {
  return config.stages.find((s) => s.id === id) ?? null;
}

export function buildBulletinRun(input: BulletinRunInput): BulletinRun {
  const { config } = input;
  const previousStage = new Map(input.previous.map((p) => [p.region, p.stageId]));
  const regions: RegionOutcome[] = config.regions.map((region) => {
    const stageId = input.regionStages.find((r) => r.region === region.id)?.stageId ?? NO_FORECAST_ID;
    const perTier: TierOutcome[] = input.decisions
      .filter((d) => d.region === region.id)
      .map((decision) => {
        const ind = config.indicators.find((i) => i.id === decision.indicator);
        const probabilities = input.probabilities
          .filter((p) => p.region === region.id && p.indicator === decision.indicator && p.lead.tier === decision.tier)
          .sort((a, b) => a.lead.index - b.lead.index);
        return {
          tier: decision.tier,
          indicator: { id: decision.indicator, name: ind?.name ?? decision.indicator, units: probabilities[0]?.threshold.units ?? '' },
          decision,
          probabilities,
        };
      });
    const previousStageId = previousStage.get(region.id) ?? null;
    const reason = changeReason(
      config,
      stageId,
      perTier.map((t) => t.decision),
    );
    return { region, stage: stageById(config, stageId), previousStageId, changeReason: reason, perTier };
  });
  return {
    runId: input.runId,
    issuedAt: input.issuedAt.toISOString().replace(/\.\d{3}Z$/, 'Z'),
    mode: input.mode,
    forecastDates: input.sources.map((s) => ({
      source: s.source.id,
      name: s.source.name,
      tier: s.source.tier,
      referenceTime: s.referenceTime,
      basedOnOlder: s.stale,
    })),
    nextIssue: nextIssueDate(config, input.issuedAt),
    regions,
    notes: input.notes,
    problems: input.problems,
  };
}
