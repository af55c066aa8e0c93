/**
 * The decide stage (pure): for each region × indicator × tier, raw stage from the rules, then persistence
 * against the history; then each region's stage = the highest of its decisions. A region × indicator × tier whose
 * tier has a source but no usable probability this run is never relaxed because data vanished: its last issued
 * stage is held for `holdMissingRuns` runs in a row (counted in its track, whose persistence counters are kept),
 * then, or without an earlier stage, it is "no forecast available" (NO_FORECAST_ID), which is never a ladder stage.
 */
import { TIERS, type Tier } from '../types.ts';
import type { StageDecision } from '../decision-types.ts';
import type { LeadProbability } from '../probability-types.ts';
import { evaluateRules } from './evaluate-rules.ts';
import { leadUses } from './lead-use.ts';
import { applyPersistence } from './persistence.ts';
import { trackKey, type TrackKey, type TunedKey } from '../core/keys.ts';
import { NO_FORECAST_ID, stageRank, type DecideConfig, type RegionStage, type StageHistory, type StageTrack } from './types.ts';

export interface DecideInput {
  readonly config: DecideConfig;
  readonly probabilities: readonly LeadProbability[];
  readonly history: StageHistory;
  /** tunedKey(region, rule id) → probability threshold tuned on that region's hindcasts for rules that give cost-loss. */
  readonly thresholdsFromCostLoss?: ReadonlyMap<TunedKey, number>;
  /** "ignore" only for backtests on the hindcasts the skill was measured on (default "apply"). */
  readonly skillGate?: 'apply' | 'ignore';
  /** trackKey → why that region × indicator × tier has no usable data (files late or damaged, no grid cells...). */
  readonly unavailable?: ReadonlyMap<string, string>;
  /** Tiers a source was configured for; only these are expected to have data (default none: no missing-data handling). */
  readonly expectedTiers?: ReadonlySet<Tier>;
}

export interface DecideResult {
  readonly decisions: StageDecision[];
  readonly regionStages: RegionStage[];
  readonly nextHistory: StageHistory;
}

export function decideStages(input: DecideInput): DecideResult {
  const { config, history } = input;
  const tuned = input.thresholdsFromCostLoss ?? new Map<TunedKey, number>();
  const byKey = new Map<TrackKey, LeadProbability[]>();
  for (const p of input.probabilities) {
    const key = trackKey(p.region, p.indicator, p.lead.tier);
    const list = byKey.get(key);
    if (list) list.push(p);
    else byKey.set(key, [p]);
  }

  const expected = input.expectedTiers ?? new Set<Tier>();
  const decisions: StageDecision[] = [];
  const tracks: Record<string, StageTrack> = { ...history.tracks };
  for (const region of config.regions) {
    for (const indicator of config.indicators) {
      for (const tier of TIERS) {
        if (!indicator.tiers.includes(tier)) continue;
        const key = trackKey(region.id, indicator.id, tier);
        const probs = byKey.get(key);
        const unusable = probs ? noUsableLead(probs) : null;
        if (!probs || unusable) {
          if (!probs && !expected.has(tier)) continue;
          const reason = unusable ?? input.unavailable?.get(key) ?? 'no usable forecast values this run';
          const held = holdMissing(config, history.tracks[key], reason);
          if (held.track) tracks[key] = held.track;
          // Rows of a tier without usable leads still say, each, why it is not used (no contrast, no value).
          const uses = probs
            ? leadUses(config.stages, {
                probabilities: probs,
                leadStages: [],
                skilfulLeads: [],
                capId: null,
                decidingIndex: null,
                issuedId: held.decision.stageId,
              })
            : undefined;
          decisions.push({ region: region.id, indicator: indicator.id, tier, ...held.decision, ...(uses ? { leadUses: uses } : {}) });
          continue;
        }
        const raw = evaluateRules(config, {
          region: region.id,
          indicator: indicator.id,
          tier,
          probabilities: probs,
          tuned,
          skillGate: input.skillGate ?? 'apply',
        });
        const kept = applyPersistence(config.stages, config.decision, history.tracks[key], raw.rawStageId);
        tracks[key] = kept.track;
        const uses = leadUses(config.stages, {
          probabilities: probs,
          leadStages: raw.leadStages,
          skilfulLeads: raw.skilfulLeads,
          capId: raw.cap?.stageId ?? null,
          decidingIndex: raw.lead?.lead.index ?? null,
          issuedId: kept.stageId,
          wait: kept.wait,
        });
        decisions.push({
          region: region.id,
          indicator: indicator.id,
          tier,
          stageId: kept.stageId,
          rawStageId: raw.rawStageId,
          ruleId: raw.ruleId,
          lead: raw.lead,
          withheldLeads: raw.withheldLeads,
          leadStages: raw.leadStages,
          reasons: [...raw.reasons, ...kept.reasons, `issued: ${kept.stageId}`],
          ...(raw.cap ? { cap: raw.cap } : {}),
          ...(kept.wait ? { wait: kept.wait } : {}),
          leadUses: uses,
        });
      }
    }
  }
  return { decisions, regionStages: combineRegionStages(config, decisions), nextHistory: { version: 1, tracks } };
}

/**
 * Why a tier whose every lead has no probability (NaN: e.g. a threshold that every past year exceeds or none
 * can, flag threshold-degenerate) has no usable data, or null when some lead has one. Such a tier is treated as
 * missing data, never as "no trigger level passed".
 */
function noUsableLead(probs: readonly LeadProbability[]): string | null {
  if (probs.some((p) => Number.isFinite(p.probability))) return null;
  const degenerate = probs.some((p) => p.flags.some((f) => f.startsWith('threshold-degenerate:')));
  return degenerate
    ? 'at every lead of this range every past year gives the same answer, so the forecast cannot be compared with a normal year'
    : 'no lead of this range has a usable probability';
}

/** The decision of a region × indicator × tier without data: its last stage held, or "no forecast available". */
function holdMissing(
  config: DecideConfig,
  previous: StageTrack | undefined,
  reason: string,
): { decision: Omit<StageDecision, 'region' | 'indicator' | 'tier'>; track: StageTrack | null } {
  const hold = config.decision.holdMissingRuns;
  const runs = (previous?.missingRuns ?? 0) + 1;
  const onLadder = previous !== undefined && stageRank(config.stages, previous.stageId) >= 0;
  const held = onLadder && runs <= hold;
  const stageId = held ? previous.stageId : NO_FORECAST_ID;
  const why = held
    ? `held at ${previous.stageId}: run ${runs} of ${hold} without usable data (never relaxed because data vanished)`
    : onLadder
      ? `hold of ${hold} run${hold === 1 ? '' : 's'} without data expired → no forecast available`
      : 'no earlier stage to hold → no forecast available';
  return {
    decision: {
      stageId,
      rawStageId: stageId,
      ruleId: null,
      lead: null,
      withheldLeads: [],
      reasons: [`no usable data: ${reason}`, why, `issued: ${stageId}`],
      missing: { reason, runs, held },
    },
    track: previous ? { ...previous, missingRuns: runs } : null,
  };
}

/**
 * The region's stage from its decisions: the highest wins, or with a matrix (DecisionConfig.combine) the table
 * entry for the highest stage of the row indicators and of the column indicators — never below the stage of an
 * indicator on neither axis. On a tie the first decision in config order (indicator, then tier) is named.
 * "No forecast available" decisions take no part; a region with no other decision is "no forecast available".
 */
export function combineRegionStages(config: DecideConfig, decisions: readonly StageDecision[]): RegionStage[] {
  const rank = (id: string) => stageRank(config.stages, id);
  const highest = (list: readonly StageDecision[]): StageDecision | null =>
    list.reduce<StageDecision | null>((best, d) => (best === null || rank(d.stageId) > rank(best.stageId) ? d : best), null);
  const named = (d: StageDecision | null) => (d ? { region: d.region, indicator: d.indicator, tier: d.tier } : null);
  const combine = config.decision.combine;
  return config.regions.map((region) => {
    const own = decisions.filter((d) => d.region === region.id && d.stageId !== NO_FORECAST_ID);
    if (own.length === 0) return { region: region.id, stageId: NO_FORECAST_ID, fromDecision: null };
    if (combine === 'highest') {
      const best = highest(own);
      return { region: region.id, stageId: best?.stageId ?? config.stages[0].id, fromDecision: named(best) };
    }
    const { rows, columns, table } = combine.matrix;
    const row = highest(own.filter((d) => rows.includes(d.indicator)));
    const column = highest(own.filter((d) => columns.includes(d.indicator)));
    const other = highest(own.filter((d) => !rows.includes(d.indicator) && !columns.includes(d.indicator)));
    const fromTable = table[row ? rank(row.stageId) : 0][column ? rank(column.stageId) : 0];
    const driver = highest([row, column].filter((d): d is StageDecision => d !== null));
    if (other && rank(other.stageId) > rank(fromTable)) return { region: region.id, stageId: other.stageId, fromDecision: named(other) };
    return { region: region.id, stageId: fromTable, fromDecision: named(driver) };
  });
}
