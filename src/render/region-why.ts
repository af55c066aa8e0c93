/**
 * Why a region has its stage, in plain words: the evidence that drives it, a stage held back by persistence, leads
 * beyond a formula's table, and every part without usable data (never silently left out).
 */
import { NO_FORECAST_ID } from '../decide/types.ts';
import type { Translate } from './catalogue.ts';
import type { RegionOutcome, RenderConfig, TierOutcome } from './model.ts';
import type { TierView } from './tier-view.ts';
import { isBeyondTable } from './tier-method.ts';
import type { StageView } from './stage-view.ts';

/** What the explanation of a region's stage reads: its outcome, its ranges' views, its stage and the ladder by rank. */
export interface WhyInputs {
  readonly t: Translate;
  readonly config: RenderConfig;
  readonly region: RegionOutcome;
  readonly tiers: readonly TierView[];
  readonly stage: StageView;
  readonly byRank: readonly StageView[];
}

/** Why a range's stage is not what its rows point to: kept higher by persistence, or no usable data. */
export function tierNote(t: Translate, tier: TierOutcome, stage: StageView): string {
  const { missing, wait } = tier.decision;
  if (missing) return t('tier.missing', { reason: missing.reason, held: missing.held ? 'yes' : 'no' });
  if (wait?.direction === 'lower')
    return t('tier.heldHigher', { glyph: stage.glyph, label: stage.label, runs: wait.runs, needed: wait.needed });
  return '';
}

/**
 * The parts without usable data, each in plain words with the reason and whether the last stage is kept (issue:
 * a missing tier is said, never silently left out); one sentence per tier range, indicators of one range merged.
 */
function missingText(t: Translate, region: RegionOutcome, tiers: readonly TierView[]): string {
  const said = new Map<string, string>();
  region.perTier.forEach((tier, i) => {
    const m = tier.decision.missing;
    if (!m || said.has(tier.tier)) return;
    said.set(
      tier.tier,
      t('why.missing', {
        range: tier.tier,
        reason: m.reason,
        held: m.held ? 'yes' : 'no',
        glyph: tiers[i].stage.glyph,
        label: tiers[i].stage.label,
      }),
    );
  });
  return [...said.values()].join(' ');
}

/** Why the region has its stage: the evidence that drives it, a stage held back by persistence, and any part without data. */
export function whyText(why: WhyInputs): string {
  const { t, region, tiers } = why;
  const beyond = tiers.filter((tv) => tv.leads.some(isBeyondTable)).map((tv) => tv.hazard);
  const beyondText = beyond.length > 0 ? t('why.beyondTable', { hazards: [...new Set(beyond)].join(', ') }) : '';
  return [evidenceText(why), beyondText, missingText(t, region, tiers)].filter(Boolean).join(' ');
}

function evidenceText({ t, config, region, tiers, stage, byRank }: WhyInputs): string {
  if (stage.id === NO_FORECAST_ID) return '';
  const rank = (id: string): number => config.stages.findIndex((s) => s.id === id);
  const [driver] = tiers
    .map((tv, i) => ({ tv, d: region.perTier[i].decision }))
    .filter((x) => !x.d.missing)
    .sort((a, b) => rank(b.d.rawStageId) - rank(a.d.rawStageId) || rank(b.d.stageId) - rank(a.d.stageId));
  if (!driver && region.perTier.some((x) => x.decision.missing)) return '';
  if (!driver || !driver.tv.deciding) return t('why.none');
  const lead = driver.tv.deciding;
  const evidence = t('why.evidence', {
    hazard: driver.tv.hazard,
    range: driver.tv.tier,
    chance: lead.chance,
    dates: lead.dates,
    normal: lead.normal,
  });
  const raw = rank(driver.d.rawStageId);
  if (raw === stage.rank) return evidence;
  const up = raw > stage.rank;
  const held = t(up ? 'why.heldUp' : 'why.heldDown', {
    glyph: byRank[raw].glyph,
    label: byRank[raw].label,
    runs: up ? config.decision.escalateAfterRuns : config.decision.relaxAfterRuns,
  });
  return `${evidence} ${held}`;
}
