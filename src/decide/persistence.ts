/**
 * Persistence and hysteresis. A higher raw stage is issued only after `escalateAfterRuns` consecutive runs
 * at or above a stage higher than the issued one; it escalates to the LOWEST raw stage seen in those runs
 * (the level every one of them supported). A lower raw stage is issued only after `relaxAfterRuns`
 * consecutive runs below; it relaxes to the HIGHEST raw stage seen in those runs. With
 * `topStageImmediate`, a raw top stage is issued at once. No history = the lowest stage, counters at 0.
 */
import type { DecisionConfig, StageConfig } from '../config/decision-config.ts';
import type { PersistenceWait } from '../decision-types.ts';
import { stageRank, type StageTrack } from './types.ts';

export interface PersistenceResult {
  readonly stageId: string;
  readonly track: StageTrack;
  readonly reasons: readonly string[];
  /** Set when the issued stage differs from `rawStageId`: which way it waits and how many runs are in. */
  readonly wait?: PersistenceWait;
}

const settled = (stageId: string): StageTrack => ({ stageId, runsAbove: 0, lowestAboveId: null, runsBelow: 0, highestBelowId: null });

export function applyPersistence(
  stages: readonly StageConfig[],
  decision: DecisionConfig,
  previous: StageTrack | undefined,
  rawStageId: string,
): PersistenceResult {
  const rank = (id: string | null) => (id === null ? -1 : stageRank(stages, id));
  const reasons: string[] = [];
  let prev = previous ?? settled(stages[0].id);
  if (rank(prev.stageId) < 0) {
    reasons.push(`previous stage ${prev.stageId} is no longer on the ladder; starting from ${stages[0].id}`);
    prev = settled(stages[0].id);
  }
  const issued = rank(prev.stageId);
  const raw = rank(rawStageId);
  const top = stages.length - 1;

  if (raw === issued) {
    if (prev.runsAbove > 0 || prev.runsBelow > 0) reasons.push(`back at ${prev.stageId}: persistence counters reset`);
    return { stageId: prev.stageId, track: settled(prev.stageId), reasons };
  }
  if (raw > issued) {
    if (raw === top && decision.topStageImmediate) {
      reasons.push(`${rawStageId} issued at once (top stage, no persistence wait)`);
      return { stageId: rawStageId, track: settled(rawStageId), reasons };
    }
    const runsAbove = prev.runsAbove + 1;
    const lowestAboveId = stages[Math.min(raw, prev.lowestAboveId === null ? raw : rank(prev.lowestAboveId))].id;
    const needed = decision.escalateAfterRuns;
    if (runsAbove >= needed) {
      reasons.push(`escalated to ${lowestAboveId} after ${runsAbove} run${runsAbove > 1 ? 's' : ''} at or above it`);
      // Escalated to the lowest stage every run supported; the rest of the way starts counting again.
      const wait =
        lowestAboveId === rawStageId
          ? undefined
          : ({ direction: 'raise', towardsId: rawStageId, runs: 0, needed, raisedFromId: prev.stageId } as const);
      return { stageId: lowestAboveId, track: settled(lowestAboveId), reasons, wait };
    }
    reasons.push(`held at ${prev.stageId}: ${runsAbove} of ${needed} runs needed to escalate`);
    return {
      stageId: prev.stageId,
      track: { ...settled(prev.stageId), runsAbove, lowestAboveId },
      reasons,
      wait: { direction: 'raise', towardsId: rawStageId, runs: runsAbove, needed },
    };
  }
  const runsBelow = prev.runsBelow + 1;
  const highestBelowId = stages[Math.max(raw, prev.highestBelowId === null ? raw : rank(prev.highestBelowId))].id;
  const needed = decision.relaxAfterRuns;
  if (runsBelow >= needed) {
    reasons.push(`relaxed to ${highestBelowId} after ${runsBelow} run${runsBelow > 1 ? 's' : ''} below ${prev.stageId}`);
    // Relaxed to the highest stage of those runs; lower still waits for its own runs in a row.
    const wait = highestBelowId === rawStageId ? undefined : ({ direction: 'lower', towardsId: rawStageId, runs: 0, needed } as const);
    return { stageId: highestBelowId, track: settled(highestBelowId), reasons, wait };
  }
  reasons.push(`held at ${prev.stageId}: ${runsBelow} of ${needed} runs below needed to relax`);
  return {
    stageId: prev.stageId,
    track: { ...settled(prev.stageId), runsBelow, highestBelowId },
    reasons,
    wait: { direction: 'lower', towardsId: rawStageId, runs: runsBelow, needed },
  };
}
