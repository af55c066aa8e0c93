/**
 * The bulletin's statements checked against each other and against the decide stage's data, on the rendered view
 * model (RegionView) of every region, locale and audience. A finding is a bug, never a property of the data: the
 * bulletin goes out as rendered and each finding is an error diagnostic (`bulletin-contradiction`) in run.json, the
 * ledger and the log. Kinds:
 * - stage: the region's, a range's or the headline's stage differs from the decision, or the combined stage is not
 *   the highest range stage (escalation.combine: highest);
 * - rows: a row points above its range's stage without saying why (skill gate, no rule, tier cap, persistence), a
 *   row on which persistence raised the stage in this run says it was not used for the stage yet, a
 *   stage above the lowest is backed by no row and no note, an outlook cell's chance points above its stage unmarked,
 *   or "nothing reaches above" while a row does;
 * - words: a probability word is not the configured band of its number (probability-words), or the headline's
 *   chance and word are not those of its lead;
 * - skill: "sure" wording without a passed skill gate, a row used for the stage without one, a withheld row without
 *   the words, or a headline's how-sure sentence not from its lead's figures;
 * - threshold: the headline's threshold is not that of its lead, or a range's threshold text does not cover its leads;
 * - no-forecast: "no forecast available" (region, range or first screen) while values exist, or a range without data
 *   that does not say so.
 */
import { diagnostic, type Diagnostic } from '../core/diagnostics.ts';
import { NO_FORECAST_ID } from '../decide/types.ts';
import type { Translate } from './catalogue.ts';
import { USABLE } from './headline.ts';
import { formatPercent } from './locale-format.ts';
import type { RegionOutcome, RenderConfig, TierOutcome } from './model.ts';
import type { RegionView } from './region-view.ts';
import type { TierView } from './tier-view.ts';
import { sureSentence, type LeadView } from './view-model.ts';
import { pickLocale } from './stage-view.ts';

export type ContradictionKind = 'stage' | 'rows' | 'words' | 'skill' | 'threshold' | 'no-forecast';

export interface Contradiction {
  readonly kind: ContradictionKind;
  readonly region: string;
  readonly indicator?: string;
  readonly message: string;
}

const SURE = new Set(['high', 'medium', 'low']);
/** Threshold values compared as stored numbers; a tolerance for the float round trip only. */
const EPS = 1e-9;

/** The configured band word of `p` (probability-words: bands by `below`, ascending; the last band takes the rest). */
function bandWord(config: RenderConfig, p: number, locale: string): string {
  const bands = [...config.probabilityWords].sort((a, b) => a.below - b.below);
  const band = bands.find((b, i) => p < b.below && (i === 0 || p >= bands[i - 1].below)) ?? bands[bands.length - 1];
  return pickLocale(band.words, locale, `probability word band below ${band.below}`);
}

/** The catalogue's "not used for the stage yet" clause (use.awaiting up to its colon) in the bulletin's locale. */
function notUsedYet(t: Translate): string {
  return t('use.awaiting', { glyph: '', label: '', runs: 0, needed: 1, left: 1 }).split(':')[0].trim();
}

function checkTier(
  config: RenderConfig,
  locale: string,
  t: Translate,
  tv: TierView,
  tier: TierOutcome,
  say: (k: ContradictionKind, m: string) => void,
) {
  const d = tier.decision;
  const raisedNow = d.wait?.raisedFromId !== undefined;
  if (tv.stage.id !== d.stageId) say('stage', `shows ${tv.stage.id} but the decision is ${d.stageId}`);
  if (d.stageId === NO_FORECAST_ID && !d.missing) say('no-forecast', 'shows "no forecast available" without missing data');
  if (d.missing && tv.note === '') say('no-forecast', 'has no usable data but does not say so');
  if (tv.stage.id === NO_FORECAST_ID && tier.probabilities.some((p) => Number.isFinite(p.probability)))
    say('no-forecast', 'shows "no forecast available" beside forecast values');
  const byIndex = new Map(tier.probabilities.map((p) => [p.lead.index, p]));
  for (const l of tv.leads) {
    const p = byIndex.get(l.index);
    const row = `row ${l.dates}`;
    if (!p) {
      say('rows', `${row} has no probability behind it`);
      continue;
    }
    if (l.reached.rank > tv.stage.rank && l.note === '')
      say('rows', `${row} reaches ${l.reached.id} above the range's stage ${tv.stage.id} and says no reason`);
    if (raisedNow && l.use === 'awaiting' && l.note.startsWith(notUsedYet(t)))
      say('rows', `${row} says it was not used for the stage, but persistence raised the stage on it in this run`);
    if (Number.isFinite(p.probability)) {
      const word = bandWord(config, p.probability, locale);
      if (l.word !== word) say('words', `${row} says "${l.word}" for ${p.probability}, the configured word is "${word}"`);
      if (l.chance !== formatPercent(locale, p.probability)) say('words', `${row} prints ${l.chance} for ${p.probability}`);
    }
    if (SURE.has(l.sure) && !p.skill?.skilful) say('skill', `${row} says "${l.sure}" sure without a passed skill gate`);
    if (USABLE.has(l.use) && l.reached.rank > 0 && p.skill !== null && !p.skill.skilful)
      say('skill', `${row} is used for the stage although the skill gate did not pass`);
    if (l.withheld && (l.note === '' || SURE.has(l.sure))) say('skill', `${row} is withheld by the skill gate without saying so`);
    if (Math.abs(l.thresholdValue - p.threshold.value) > EPS) say('threshold', `${row} prints the threshold of another lead`);
    const { low, high } = tv.thresholdRange;
    if (Number.isFinite(p.threshold.value) && !(p.threshold.value >= low - EPS && p.threshold.value <= high + EPS))
      say('threshold', `${row}: threshold ${p.threshold.value} outside the range printed for it (${low} to ${high})`);
  }
  for (const g of tv.groups) {
    if (g.reached.rank > tv.stage.rank && g.note === '')
      say('rows', `row ${g.dates} reaches ${g.reached.id} above the range's stage ${tv.stage.id} and says no reason`);
  }
  // A row awaiting confirmation of a higher stage also backs the one issued (persistence raised the stage one step).
  const backed = tv.leads.some((l) => USABLE.has(l.use) && l.reached.rank >= tv.stage.rank);
  if (tv.stage.rank > 0 && !backed && tv.note === '') say('rows', `stage ${tv.stage.id} is backed by no row and says no reason`);
}

function checkHeadline(t: Translate, view: RegionView, say: (k: ContradictionKind, m: string) => void): void {
  const h = view.headline;
  const finite = view.tiers.some((tv) => tv.leads.some((l) => Number.isFinite(l.probability)));
  if (h === null) {
    if (finite) say('no-forecast', 'says no forecast could be used although forecast values exist');
    return;
  }
  const tv = view.tiers.find((x) => x.tier === h.tier && x.indicatorId === h.indicatorId);
  if (!tv) return say('stage', `headline names ${h.indicatorId} ${h.tier}, which the bulletin does not show`);
  const usable = (l: LeadView) => USABLE.has(l.use) && Number.isFinite(l.probability);
  if (h.kind === 'no-skill') {
    if (view.tiers.some((x) => x.leads.some(usable))) say('skill', 'says no forecast may set a stage although some row is used');
    return;
  }
  const lead = h.lead;
  if (!lead) return say('stage', `headline (${h.kind}) names no lead`);
  if (h.kind === 'triggered' && (tv.stage.rank !== view.stage.rank || !['sets-stage', 'capped'].includes(lead.use)))
    say(
      'stage',
      `headline presents ${h.indicatorId} ${h.tier} as setting ${view.stage.id}, but that range is ${tv.stage.id} (${lead.use})`,
    );
  const above = view.tiers.flatMap((x) => x.leads).filter((l) => l.reached.rank > view.stage.rank);
  if (h.kind === 'nearest' && above.length > 0)
    say('rows', `says nothing reaches above ${view.stage.id} while row ${above[0].dates} reaches ${above[0].reached.id}`);
  if (h.kind === 'pending' && (lead.reached.rank <= view.stage.rank || h.note === ''))
    say('rows', `headline points above ${view.stage.id} without a lead above it or a reason`);
  if (h.word !== lead.word || h.chance !== lead.chance)
    say('words', `headline says "${h.word}, ${h.chance}", its lead "${lead.word}, ${lead.chance}"`);
  if (h.sure !== sureSentence(t, lead)) say('skill', "headline how-sure sentence is not from its lead's skill figures");
  if (h.threshold !== lead.threshold) say('threshold', `headline threshold "${h.threshold}" differs from its lead's "${lead.threshold}"`);
  if (tv.thresholdRange.low === tv.thresholdRange.high && h.threshold !== tv.threshold)
    say('threshold', `headline threshold "${h.threshold}" differs from the one printed for the range "${tv.threshold}"`);
}

/** Every contradiction in one region's view against its outcome. */
export function checkRegionView(
  config: RenderConfig,
  outcome: RegionOutcome,
  view: RegionView,
  locale: string,
  t: Translate,
): Contradiction[] {
  const found: Contradiction[] = [];
  const region = outcome.region.id;
  const sayFor =
    (indicator?: string, what = '') =>
    (kind: ContradictionKind, message: string) =>
      found.push({ kind, region, indicator, message: `${what}${message}` });
  const say = sayFor(undefined, '');
  const expected = outcome.stage?.id ?? NO_FORECAST_ID;
  if (view.stage.id !== expected) say('stage', `shows ${view.stage.id} but the decision is ${expected}`);
  view.tiers.forEach((tv, i) => {
    const tier = outcome.perTier[i];
    if (!tier || tier.indicator.id !== tv.indicatorId || tier.tier !== tv.tier)
      return say('stage', `range ${i} does not match its decision`);
    checkTier(config, locale, t, tv, tier, sayFor(tv.indicatorId, `${tv.indicatorId} ${tv.tier}: `));
  });
  if (config.decision.combine === 'highest') {
    const ranks = view.tiers.filter((tv) => tv.stage.id !== NO_FORECAST_ID).map((tv) => tv.stage.rank);
    const top = ranks.length === 0 ? -1 : Math.max(...ranks);
    if (top !== view.stage.rank) say('stage', `region stage ${view.stage.id} is not the highest range stage`);
  }
  if (view.stage.id === NO_FORECAST_ID && view.tiers.some((tv) => tv.leads.some((l) => Number.isFinite(l.probability))))
    say('no-forecast', 'region shows "no forecast available" beside forecast values');
  for (const row of view.outlook)
    for (const cell of row.cells) {
      if (cell?.lead && cell.lead.reached.rank > cell.stage.rank && cell.mark !== '+')
        say('rows', `outlook ${row.hazard}: ${cell.chance} points to ${cell.lead.reached.id} above the cell's ${cell.stage.id} unmarked`);
    }
  checkHeadline(t, view, sayFor(view.headline?.indicatorId, 'first screen: '));
  return found;
}

/** The contradictions as diagnostics, one per finding, naming region, indicator, locale and audience. */
export function contradictionDiagnostics(found: readonly Contradiction[], locale: string, audience: string): Diagnostic[] {
  return found.map((c) =>
    diagnostic(
      'bulletin-contradiction',
      `bulletin for ${audience} (${locale}), region ${c.region}: ${c.kind}: ${c.message}`,
      'report it with run.json of this run; the bulletin went out as rendered',
      { region: c.region, ...(c.indicator ? { indicator: c.indicator } : {}) },
    ),
  );
}
