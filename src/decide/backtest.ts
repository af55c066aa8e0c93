/**
 * Replays the trigger rules WITH persistence over hindcast start dates in date order, and counts per
 * region × indicator × tier how often each stage was issued and how warnings verified.
 *
 * Verification: a "warning" is any issued stage above the lowest. The "event" of a case is an observed
 * exceedance in at least one lead window covered by the rules of that indicator × tier (the union of
 * their leads; a rule without leads covers every lead that has a probability in the case). hit = warning
 * and event, false alarm = warning without event, miss = event without warning. Cases where none of the
 * covered leads has an observation are counted as unverified and left out of the contingency counts.
 * Persistence runs from one start date to the next; with one start per year the counters span years,
 * which is what the operational rules would do only if runs were that far apart — read counts accordingly.
 */
import type { IsoDate, Tier } from '../types.ts';
import type { LeadProbability } from '../probability-types.ts';
import { decideStages } from './decide-stages.ts';
import { eventKey, trackKey, type EventKey, type TunedKey } from '../core/keys.ts';
import { EMPTY_HISTORY, type DecideConfig, type StageHistory } from './types.ts';

export interface BacktestCase {
  readonly startDate: IsoDate;
  readonly probabilities: readonly LeadProbability[];
  /** eventKey(region, indicator, tier, lead index) → observed exceedance in that lead window. */
  readonly observedEvents: ReadonlyMap<EventKey, boolean>;
}

export interface BacktestRow {
  readonly region: string;
  readonly indicator: string;
  readonly tier: Tier;
  readonly cases: number;
  /** Stage id → times issued, in ladder order. */
  readonly stageCounts: Readonly<Record<string, number>>;
  readonly hits: number;
  readonly misses: number;
  readonly falseAlarms: number;
  readonly correctNegatives: number;
  readonly unverified: number;
}

export interface BacktestOptions {
  readonly thresholdsFromCostLoss?: ReadonlyMap<TunedKey, number>;
  /** Default "ignore": skill comes from these same hindcasts, so gating on it would be circular. */
  readonly skillGate?: 'apply' | 'ignore';
}

type Counts = { -readonly [K in keyof BacktestRow]: BacktestRow[K] } & { stageCounts: Record<string, number> };

/** Leads covered by the rules of indicator × tier; null = every lead. */
function coveredLeads(config: DecideConfig, indicator: string, tier: Tier): Set<number> | null {
  const leads = new Set<number>();
  for (const r of config.rules) {
    if (r.indicator !== indicator || r.tier !== tier) continue;
    if (r.leads.length === 0) return null;
    for (const l of r.leads) leads.add(l);
  }
  return leads;
}

export function backtestRules(
  config: DecideConfig,
  casesByStartDate: readonly BacktestCase[],
  options: BacktestOptions = {},
): BacktestRow[] {
  const rows = new Map<string, Counts>();
  let history: StageHistory = EMPTY_HISTORY;
  const ordered = [...casesByStartDate].sort((a, b) => a.startDate.localeCompare(b.startDate));
  for (const c of ordered) {
    // A hindcast case carries the tiers it was made for; a region it does not cover is no case.
    const expectedTiers = new Set(c.probabilities.map((p) => p.lead.tier));
    const result = decideStages({
      config,
      probabilities: c.probabilities,
      history,
      thresholdsFromCostLoss: options.thresholdsFromCostLoss,
      skillGate: options.skillGate ?? 'ignore',
      expectedTiers,
    });
    history = result.nextHistory;
    for (const d of result.decisions.filter((x) => !x.missing)) {
      const key = trackKey(d.region, d.indicator, d.tier);
      let row = rows.get(key);
      if (!row) {
        row = {
          region: d.region,
          indicator: d.indicator,
          tier: d.tier,
          cases: 0,
          stageCounts: Object.fromEntries(config.stages.map((s) => [s.id, 0])),
          hits: 0,
          misses: 0,
          falseAlarms: 0,
          correctNegatives: 0,
          unverified: 0,
        };
        rows.set(key, row);
      }
      row.cases += 1;
      row.stageCounts[d.stageId] += 1;
      const covered = coveredLeads(config, d.indicator, d.tier);
      const leads = c.probabilities
        .filter((p) => p.region === d.region && p.indicator === d.indicator && p.lead.tier === d.tier)
        .map((p) => p.lead.index);
      const observed = leads
        .filter((l) => covered === null || covered.has(l))
        .map((l) => c.observedEvents.get(eventKey(d.region, d.indicator, d.tier, l)));
      if (observed.every((o) => o === undefined)) {
        row.unverified += 1;
        continue;
      }
      const event = observed.includes(true);
      const warning = d.stageId !== config.stages[0].id;
      if (warning && event) row.hits += 1;
      else if (warning) row.falseAlarms += 1;
      else if (event) row.misses += 1;
      else row.correctNegatives += 1;
    }
  }
  return [...rows.values()];
}

export function formatBacktest(rows: readonly BacktestRow[], format: 'text' | 'csv'): string {
  const stageIds = rows.length > 0 ? Object.keys(rows[0].stageCounts) : [];
  const header = ['region', 'indicator', 'tier', 'cases', ...stageIds, 'hits', 'misses', 'false_alarms', 'correct_negatives', 'unverified'];
  const body = rows.map((r) =>
    [
      r.region,
      r.indicator,
      r.tier,
      r.cases,
      ...stageIds.map((s) => r.stageCounts[s] ?? 0),
      r.hits,
      r.misses,
      r.falseAlarms,
      r.correctNegatives,
      r.unverified,
    ].map(String),
  );
  if (format === 'csv')
    return (
      [header, ...body].map((cells) => cells.map((c) => (/[",\n]/.test(c) ? `"${c.replace(/"/g, '""')}"` : c)).join(',')).join('\n') + '\n'
    );
  const widths = header.map((h, i) => Math.max(h.length, ...body.map((b) => b[i].length)));
  const line = (cells: string[]) =>
    cells
      .map((c, i) => (i < 3 ? c.padEnd(widths[i]) : c.padStart(widths[i])))
      .join('  ')
      .trimEnd();
  return [line(header), ...body.map(line)].join('\n') + '\n';
}
