/**
 * "Why" of "what changed since the last bulletin", in plain words for a district health officer (no rule ids,
 * no symbols): the indicator and range that set the region's stage, its chance for which dates, and whether a
 * higher or lower stage is being held back until it shows in consecutive bulletins.
 */
import type { Config } from '../config/types.ts';
import { stageLabel, stageRank } from '../decide/types.ts';
import type { Tier } from '../types.ts';
import type { StageDecision } from '../decision-types.ts';

const RANGE: Readonly<Record<Tier, string>> = { days: 'the next days', weeks: 'the coming weeks', months: 'the coming months' };

function dates(start: string, end: string): string {
  const fmt = (d: string) => new Date(`${d}T00:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', timeZone: 'UTC' });
  return start === end ? fmt(start) : `${fmt(start)} to ${fmt(end)}`;
}

/**
 * Why the region has its stage (the templates say whether it was raised, lowered or kept): the evidence that
 * drives it, and a higher or lower stage being held back by the persistence rule.
 */
export function changeReason(
  config: Pick<Config, 'stages' | 'indicators' | 'decision'>,
  stageId: string,
  decisions: readonly StageDecision[],
): string {
  const rank = (id: string) => stageRank(config.stages, id);
  const label = (id: string) => stageLabel(config.stages, id);
  const name = (id: string) => config.indicators.find((i) => i.id === id)?.name ?? id;
  const driver = [...decisions].sort((a, b) => rank(b.rawStageId) - rank(a.rawStageId) || rank(b.stageId) - rank(a.stageId))[0];
  const evidence = driver?.lead
    ? `${name(driver.indicator)} over ${RANGE[driver.tier]}: ${Math.round(driver.lead.probability * 100)}% chance for ${dates(driver.lead.lead.start, driver.lead.lead.end)}, against ${Math.round(driver.lead.baseRate * 100)}% in a normal year.`
    : 'No indicator passed any of its trigger levels.';
  const held =
    driver && rank(driver.rawStageId) !== rank(stageId)
      ? rank(driver.rawStageId) > rank(stageId)
        ? ` The forecasts point to ${label(driver.rawStageId)}; the stage is raised only when that shows in ${config.decision.escalateAfterRuns} bulletins in a row.`
        : ` The forecasts point to ${label(driver.rawStageId)}; the stage is lowered only after ${config.decision.relaxAfterRuns} bulletins in a row below it.`
      : '';
  return `${evidence}${held}`;
}
