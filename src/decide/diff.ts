/** Stage changes between two runs' region stages, for dry-run output and the operator summary. */
import type { StageDecision } from '../decision-types.ts';
import { stageTitle, type DecideConfig, type RegionStage, type StageChange } from './types.ts';

/** Anything with a region and a stage id (e.g. rows read back from the ledger). */
export interface RegionStageLike {
  readonly region: string;
  readonly stageId: string;
}

/** Reason lines that explain a stage: a rule that fired, a cap, or a persistence step. */
const DECISIVE = /≥ .*\(rule |^capped|^escalated|^relaxed|^held|issued at once/;

function why(current: RegionStage, decisions: readonly StageDecision[]): string {
  const from = current.fromDecision;
  if (!from) return 'no indicator decided for this region';
  const d = decisions.find((x) => x.region === from.region && x.indicator === from.indicator && x.tier === from.tier);
  const lines = d ? d.reasons.filter((r) => DECISIVE.test(r)) : [];
  return [`${from.indicator} ${from.tier}`, ...lines].join('; ');
}

/** Regions whose stage differs (in current-run order, then regions that disappeared). */
export function diffStages(
  previous: readonly RegionStageLike[],
  current: readonly RegionStage[],
  decisions: readonly StageDecision[] = [],
): StageChange[] {
  const before = new Map(previous.map((p) => [p.region, p.stageId]));
  const changes: StageChange[] = [];
  for (const c of current) {
    const from = before.get(c.region) ?? null;
    if (from !== c.stageId) changes.push({ region: c.region, from, to: c.stageId, why: why(c, decisions) });
  }
  const now = new Set(current.map((c) => c.region));
  for (const p of previous) {
    if (!now.has(p.region)) changes.push({ region: p.region, from: p.stageId, to: null, why: 'region not in this run' });
  }
  return changes;
}

/** One line per region of the run: its stage, or the change from the last issued stage and why. */
export function stageChangeLines(
  config: Pick<DecideConfig, 'regions' | 'stages'>,
  current: readonly RegionStage[],
  changes: readonly StageChange[],
): string[] {
  const label = (id: string | null) => (id === null ? 'none' : stageTitle(config.stages, id));
  return current.map((r) => {
    const c = changes.find((x) => x.region === r.region);
    const name = config.regions.find((x) => x.id === r.region)?.name ?? r.region;
    return c ? `  ${name}: ${label(c.from)} → ${label(c.to)}  (${c.why})` : `  ${name}: ${label(r.stageId)} (unchanged)`;
  });
}
