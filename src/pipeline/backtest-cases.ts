/**
 * Hindcast starts as if they had been operational: for every hindcast year, the exceedance probability of its
 * members at each lead against the leave-one-year-out model threshold, and whether the observation exceeded
 * (the same cases the skill scores use, see calibrate/skill.ts observedCases).
 */
import type { Config } from '../config/types.ts';
import { observedCases } from '../calibrate/verification-cases.ts';
import { resolveThresholdSpec } from '../calibrate/thresholds.ts';
import type { BacktestCase } from '../decide/backtest.ts';
import { eventKey, pairOf, type EventKey } from '../core/keys.ts';
import type { LeadProbability } from '../probability-types.ts';
import type { Analysis } from './analyse.ts';

/** One hindcast year's cases: its probabilities, what was observed, and its first lead's start. */
type YearCases = { probabilities: LeadProbability[]; events: Map<EventKey, boolean>; start: string };

export function backtestCases(config: Pick<Config, 'indicators'>, analysis: Analysis): BacktestCase[] {
  const byYear = new Map<number, YearCases>();
  for (const source of analysis.sources) {
    for (const [key, climate] of source.climates) {
      const { hindcast: hc, observed: obs } = climate;
      if (!hc || !obs) continue;
      const { region, indicator } = pairOf(key);
      const ind = config.indicators.find((i) => i.id === indicator);
      if (!ind) continue;
      const spec = resolveThresholdSpec(ind, region);
      hc.leads.forEach((lead, l) => {
        if (l >= obs.leads.length) return;
        const cases = observedCases(hc, obs, l, spec);
        cases.caseYears.forEach((year, i) => {
          const entry: YearCases = byYear.get(year) ?? {
            probabilities: [],
            events: new Map<EventKey, boolean>(),
            start: `${year}-${lead.start.slice(5)}`,
          };
          byYear.set(year, entry);
          if (lead.index === 1 && lead.start < entry.start) entry.start = lead.start;
          entry.probabilities.push({
            source: source.source,
            region,
            indicator,
            lead: { ...lead, start: `${year}${lead.start.slice(4)}`, end: `${year}${lead.end.slice(4)}` },
            probability: cases.p[i],
            baseRate: Number.NaN,
            members: hc.members,
            validMembers: hc.members,
            threshold: { value: Number.NaN, units: hc.units, origin: 'leave-one-year-out model threshold' },
            operator: '>',
            flags: [],
            skill: null,
            calibrated: true,
          });
          entry.events.set(eventKey(region, indicator, lead.tier, lead.index), cases.o[i] === 1);
        });
      });
    }
  }
  return [...byYear.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([, e]) => ({ startDate: e.start, probabilities: e.probabilities, observedEvents: e.events }));
}
