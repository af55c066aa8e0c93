/**
 * StageHistory as JSON for the ledger: `JSON.stringify(history)` to store, `parseStageHistory` to read back
 * with a shape check (a corrupt or foreign record must not silently reset or invent stages).
 */
import { ForelightError } from '../core/errors.ts';
import { isRecord } from '../core/json-shape.ts';
import { EMPTY_HISTORY, type StageHistory, type StageTrack } from './types.ts';

function isTrack(t: unknown): t is StageTrack {
  if (!isRecord(t)) return false;
  const count = (x: unknown) => typeof x === 'number' && Number.isInteger(x) && x >= 0;
  const idOrNull = (x: unknown) => x === null || typeof x === 'string';
  return (
    typeof t.stageId === 'string' &&
    count(t.runsAbove) &&
    count(t.runsBelow) &&
    idOrNull(t.lowestAboveId) &&
    idOrNull(t.highestBelowId) &&
    (t.missingRuns === undefined || count(t.missingRuns))
  );
}

/** null (no earlier run) → empty history; anything not shaped like StageHistory version 1 → ForelightError. */
export function parseStageHistory(json: string | null): StageHistory {
  if (json === null) return EMPTY_HISTORY;
  const fail = (why: string) =>
    new ForelightError(
      'decide',
      'bad-stage-history',
      `stored stage history is unusable: ${why}`,
      'inspect the ledger; to start persistence afresh, run once with an empty history',
    );
  let v: unknown;
  try {
    v = JSON.parse(json);
  } catch {
    throw fail('not JSON');
  }
  if (!isRecord(v) || v.version !== 1 || !isRecord(v.tracks)) throw fail('expected { version: 1, tracks: {...} }');
  const tracks: Record<string, StageTrack> = {};
  for (const [key, track] of Object.entries(v.tracks)) {
    if (key.split('|').length !== 3) throw fail(`track key "${key}" is not region|indicator|tier`);
    if (!isTrack(track)) throw fail(`track "${key}" lacks stageId/runsAbove/lowestAboveId/runsBelow/highestBelowId`);
    tracks[key] = track;
  }
  return { version: 1, tracks };
}
