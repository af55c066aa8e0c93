/**
 * Types of the decide stage that are not boundary types of src/types.ts: the persistence history (stored
 * by the ledger as JSON), the combined stage per region, and stage changes for dry-run output.
 */
import type { Config } from '../config/types.ts';
import type { StageConfig } from '../config/decision-config.ts';
import type { Tier } from '../types.ts';

/**
 * Persistence state of one region × indicator × tier. Counters count consecutive runs whose raw stage
 * (after skill gate and tier cap) was above / below the issued stage; both reset whenever the issued stage
 * changes or the raw stage equals it.
 */
export interface StageTrack {
  /** Stage issued by the last run. */
  readonly stageId: string;
  /** Consecutive runs with a raw stage above `stageId`. */
  readonly runsAbove: number;
  /** Lowest raw stage seen in those runs (the stage escalated to), null when runsAbove = 0. */
  readonly lowestAboveId: string | null;
  /** Consecutive runs with a raw stage below `stageId`. */
  readonly runsBelow: number;
  /** Highest raw stage seen in those runs (the stage relaxed to), null when runsBelow = 0. */
  readonly highestBelowId: string | null;
  /** Consecutive runs without usable data (absent = 0); the other counters are left as they were. */
  readonly missingRuns?: number;
}

/**
 * Stage id of the "no forecast available" state: a region × indicator × tier (or a whole region) without usable
 * data once its hold has expired, or with no earlier stage to hold. It is on no ladder and never counts as the
 * lowest stage; renderers show it with its own label, glyph and grey.
 */
export const NO_FORECAST_ID = 'no-forecast';

/**
 * The parts of the configuration the decide stage reads: which regions and indicators exist, the stage ladder,
 * the trigger rules and the decision settings (skill gate, tier caps, persistence, combination). Nothing about
 * files, calibration, schedule, delivery or texts.
 */
export type DecideConfig = Pick<Config, 'regions' | 'indicators' | 'stages' | 'rules' | 'decision'>;

/** All tracks, keyed by `trackKey(region, indicator, tier)`. Plain JSON. */
export interface StageHistory {
  readonly version: 1;
  readonly tracks: Readonly<Record<string, StageTrack>>;
}

export const EMPTY_HISTORY: StageHistory = { version: 1, tracks: {} };

/** The stage of a region after combining its indicators and tiers (highest wins). */
export interface RegionStage {
  readonly region: string;
  readonly stageId: string;
  /** The decision that set the stage; null when the region had no decision (lowest stage). */
  readonly fromDecision: { readonly region: string; readonly indicator: string; readonly tier: Tier } | null;
}

/** One region whose combined stage differs between two runs. */
export interface StageChange {
  readonly region: string;
  /** null: the region was not in the previous run. */
  readonly from: string | null;
  /** null: the region is not in the current run. */
  readonly to: string | null;
  readonly why: string;
}

/** The English label of stage `id` ("Warning"), or the id when the ladder has no such stage or label. */
export const stageLabel = (stages: readonly Pick<StageConfig, 'id' | 'label'>[], id: string): string =>
  stages.find((s) => s.id === id)?.label.en ?? id;

/** Glyph and English label ("▲ Warning"); "no forecast available" for NO_FORECAST_ID; the id for a stage not on the ladder. */
export function stageTitle(stages: readonly Pick<StageConfig, 'id' | 'label' | 'glyph'>[], id: string): string {
  if (id === NO_FORECAST_ID) return 'no forecast available';
  const s = stages.find((x) => x.id === id);
  return s ? `${s.glyph} ${stageLabel(stages, id)}` : id;
}

/** Position of stage `id` on the ladder (0 = lowest), -1 when the ladder has no such stage. */
export const stageRank = (stages: readonly { readonly id: string }[], id: string): number => stages.findIndex((s) => s.id === id);
