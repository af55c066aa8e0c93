/**
 * The first screen's statement about a region: which hazard, lead, dates, chance, threshold and how sure — and,
 * when the lead shown does not set the stage, the words why (its LeadUse note).
 */
import type { Tier } from '../types.ts';
import type { Translate } from './catalogue.ts';
import { formatDayRange } from './locale-format.ts';
import type { TierView } from './tier-view.ts';
import { TIERS, sureSentence, type LeadView } from './view-model.ts';
import { type StageView } from './stage-view.ts';

/**
 * What the first screen says about the region: `triggered` = a hazard set the region's stage; `pending` = a lead
 * points above the stage but does not set it (its note says why); `nearest` = nothing reaches above the stage, the
 * closest usable lead is shown; `no-skill` = forecasts exist but no lead may be used (no demonstrated skill or
 * no rule looks at it). No headline at all = no forecast value.
 */
export type HeadlineKind = 'triggered' | 'pending' | 'nearest' | 'no-skill';

export interface Headline {
  readonly kind: HeadlineKind;
  /** The tier and lead the headline speaks of (null lead for `no-skill`). */
  readonly tier: Tier;
  readonly indicatorId: string;
  readonly lead: LeadView | null;
  /** Why the lead did not set the stage ('' when it did). */
  readonly note: string;
  readonly hazard: string;
  readonly tierName: string;
  readonly threshold: string;
  readonly dates: string;
  readonly peakDates: string;
  readonly chance: string;
  readonly normal: string;
  readonly word: string;
  readonly sure: string;
  /** kind === 'triggered'. */
  readonly triggered: boolean;
}

/** Leads that may speak for the region on the first screen: used by the rules (counted, set, capped or awaiting). */
export const USABLE: ReadonlySet<LeadView['use']> = new Set(['sets-stage', 'counted', 'capped', 'awaiting']);

/**
 * The first screen's hazard: the tier whose deciding lead set the region's stage (highest issued, shortest range
 * first); else the usable lead reaching the highest stage, then the likeliest — `pending` when it points above the
 * stage (its note says why it does not set it), `nearest` otherwise; `no-skill` when forecasts exist but no lead may
 * be used; null when there is no forecast value at all.
 */
export function headlineOf(t: Translate, locale: string, tiers: readonly TierView[], stage: StageView): Headline | null {
  const setting = tiers
    .filter((tv) => tv.deciding && (tv.deciding.use === 'sets-stage' || tv.deciding.use === 'capped') && tv.stage.rank === stage.rank)
    .sort((a, b) => TIERS.indexOf(a.tier) - TIERS.indexOf(b.tier))[0];
  let tv: TierView | undefined = setting;
  let lead: LeadView | null = setting?.deciding ?? null;
  if (!tv) {
    for (const x of tiers) {
      for (const l of x.leads) {
        if (!USABLE.has(l.use) || !Number.isFinite(l.probability)) continue;
        if (
          lead === null ||
          l.reached.rank > lead.reached.rank ||
          (l.reached.rank === lead.reached.rank && l.probability > lead.probability)
        ) {
          tv = x;
          lead = l;
        }
      }
    }
  }
  if (!tv || !lead) {
    const known = tiers.find((x) => x.leads.some((l) => Number.isFinite(l.probability)));
    if (!known) return null;
    const empty = { dates: '', peakDates: '', chance: '', normal: '', word: '', sure: '', threshold: '', note: '' };
    return {
      kind: 'no-skill',
      tier: known.tier,
      indicatorId: known.indicatorId,
      lead: null,
      hazard: known.hazard,
      tierName: known.tierName,
      ...empty,
      triggered: false,
    };
  }
  const chosen: LeadView = lead;
  const kind: HeadlineKind = setting ? 'triggered' : chosen.reached.rank > stage.rank ? 'pending' : 'nearest';
  // The dates the stage concerns: the run of leads around the chosen one that reach the same stage for the same reason.
  const same = (l: LeadView) => l.reached.id === chosen.reached.id && l.note === chosen.note && USABLE.has(l.use);
  const at = tv.leads.indexOf(chosen);
  let first = at;
  let last = at;
  while (first > 0 && same(tv.leads[first - 1])) first -= 1;
  while (last < tv.leads.length - 1 && same(tv.leads[last + 1])) last += 1;
  return {
    kind,
    tier: tv.tier,
    indicatorId: tv.indicatorId,
    lead: chosen,
    note: chosen.note,
    hazard: tv.hazard,
    tierName: tv.tierName,
    threshold: chosen.threshold,
    dates: formatDayRange(locale, tv.leads[first].start, tv.leads[last].end),
    peakDates: chosen.dates,
    chance: chosen.chance,
    normal: chosen.normal,
    word: chosen.word,
    sure: sureSentence(t, chosen),
    triggered: kind === 'triggered',
  };
}
