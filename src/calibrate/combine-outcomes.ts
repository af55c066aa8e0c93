/**
 * Probabilities kept after combining sources: the leads of each region × indicator × tier grouped by source and
 * merged by the source-combination rule (`combineSources`, lead-tiers.ts); the notes say the rule and what it dropped.
 */
import { trackKey, type TrackKey } from '../core/keys.ts';
import type { LeadProbability } from '../probability-types.ts';
import { combineSources } from './lead-tiers.ts';
import type { SourceOutcome } from './source-probabilities.ts';

/** A source's rank in the combination: priority (lower first), then issue (reference) time, newer first. */
export type SourceRank = (source: string) => { readonly priority: number; readonly issued: string };

export function combineOutcomes(outcomes: readonly SourceOutcome[], rank: SourceRank): { kept: LeadProbability[]; notes: string[] } {
  const groups = new Map<TrackKey, Map<string, LeadProbability[]>>();
  for (const o of outcomes) {
    for (const p of o.probabilities) {
      const key = trackKey(p.region, p.indicator, p.lead.tier);
      const bySource = groups.get(key) ?? new Map<string, LeadProbability[]>();
      groups.set(key, bySource);
      bySource.set(o.source, [...(bySource.get(o.source) ?? []), p]);
    }
  }
  const kept: LeadProbability[] = [];
  const notes = new Set<string>();
  for (const bySource of groups.values()) {
    const merged = combineSources([...bySource.entries()].map(([source, leads]) => ({ source, ...rank(source), leads })));
    kept.push(...merged.kept.map((k) => k.item));
    if (bySource.size > 1) notes.add(merged.rule);
    for (const d of merged.dropped)
      notes.add(`${d.source} ${d.item.lead.tier} ${d.item.lead.index} for ${d.item.region} replaced by ${d.coveredBy}`);
  }
  return { kept, notes: [...notes] };
}
