/**
 * OASIS CAP 1.2 alerts (OASIS Standard, 1 July 2010, "Common Alerting Protocol Version 1.2"): one `<alert>` per
 * region × indicator whose stage is above the lowest, plus a Cancel when an alerted region × indicator drops back
 * to the lowest stage.
 *
 * Choices (documented for the lead):
 * - status: `Actual` for live runs, `Exercise` for `run.mode === 'exercise'` (the demo), so a demo alert can never
 *   be mistaken for a real one by a CAP consumer.
 * - scope: `Restricted` with a `<restriction>` — bulletins go to health teams, not to the public.
 * - msgType: `Alert` when no earlier active alert is known, `Update` (references the earlier one) while above the
 *   lowest stage, `Cancel` (references it) when back at the lowest stage.
 * - certainty from the exceedance probability p of the deciding lead: p > 0.5 Likely, p = 0.5 exactly Possible
 *   (CHECKS.md §13), 0.05 <= p <= 0.5 Possible, p < 0.05 Unlikely (the 0.05 cut for "p ~ 0" is our choice, no source).
 * - sent is UTC written `-00:00` (CAP 1.2 §3.3.2: "Z" must not be used, UTC is "-00:00"); onset/expires are local
 *   midnights of the lead window in the region's offset.
 * - identifier: `forelight.<runId>.<region>.<indicator>` — stable for a run, unique per region × indicator.
 */
import type { LeadProbability } from '../probability-types.ts';
import { localDayStartIso, regionClock } from '../core/local-clock.ts';
import { shapeRingSets } from '../config/region-shape.ts';
import { escapeXml, toToken, toXmlChars } from './safe-text.ts';
import type { BulletinRun, CapAlert, PreviousIssue, RegionOutcome, TierOutcome, RenderConfig } from './model.ts';
import type { TemplateEnv } from './template-env.ts';
import { countryName } from './bulletin-context.ts';
import { buildRegionView, type RegionView } from './region-view.ts';
import { sureSentence } from './view-model.ts';
import { stageIndex } from './stage-view.ts';
import { NO_FORECAST_ID } from '../decide/types.ts';

export const CAP_NAMESPACE = 'urn:oasis:names:tc:emergency:cap:1.2';

/** CAP certainty for an exceedance probability (see module comment). */
export function capCertainty(p: number): 'Likely' | 'Possible' | 'Unlikely' {
  if (p > 0.5) return 'Likely';
  return p >= 0.05 ? 'Possible' : 'Unlikely';
}

/** CAP dateTime of an instant in UTC: `2026-11-30T06:00:00-00:00` (no fractional seconds). */
export function capUtc(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) throw new RangeError(`not an ISO instant: ${JSON.stringify(iso)}`);
  return `${d.toISOString().slice(0, 19)}-00:00`;
}

/** CAP dateTime of the local start of `day` (`YYYY-MM-DD`) in the region's time zone or at its UTC offset. */
export function capLocalMidnight(day: string, region: { readonly utcOffsetHours: number; readonly timeZone?: string }): string {
  return localDayStartIso(regionClock(region), day);
}

function nextDay(day: string): string {
  const d = new Date(`${day}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d.toISOString().slice(0, 10);
}

/**
 * CAP polygons (CAP 1.2 §3.2.4 `polygon`, one per outer ring; an area may hold several): "lat,lon lat,lon …",
 * closed (first = last); boxes become 5 points. Holes cannot be written in CAP, so the outline covers them;
 * longitudes are written in −180..180 (WGS 84, CAP 1.2 §3.3.4).
 */
export function capPolygons(region: RegionOutcome['region']): string[] {
  return shapeRingSets(region.shape).map(([outer]) => {
    const ring = [...outer];
    const first = ring[0];
    const last = ring[ring.length - 1];
    if (first[0] !== last[0] || first[1] !== last[1]) ring.push(first);
    return ring.map(([lon, lat]) => `${lat},${lon > 180 ? lon - 360 : lon}`).join(' ');
  });
}

/** Sender: the bare address of `delivery.from` (CAP forbids spaces, commas and `<`/`&`). */
export function capSender(config: RenderConfig): string {
  const m = /<([^>]+)>/.exec(config.delivery.from);
  return (m ? m[1] : config.delivery.from).replace(/[^A-Za-z0-9._@-]/g, '');
}

interface IndicatorStage {
  id: string;
  name: string;
  rank: number;
  stageId: string;
  tier: TierOutcome;
}

/**
 * Highest stage per indicator of a region; ties go to the shortest tier (listed first in perTier order). Tiers with
 * "no forecast available" take no part; an indicator with no other tier is left out (see DECISIONS.md: no alert).
 */
function indicatorStages(config: RenderConfig, outcome: RegionOutcome): IndicatorStage[] {
  const rankOf = stageIndex(config);
  const best = new Map<string, IndicatorStage>();
  for (const t of outcome.perTier) {
    if (t.decision.stageId === NO_FORECAST_ID) continue;
    const rank = rankOf(t.decision.stageId).rank;
    const seen = best.get(t.indicator.id);
    if (!seen || rank > seen.rank)
      best.set(t.indicator.id, { id: t.indicator.id, name: t.indicator.name, rank, stageId: t.decision.stageId, tier: t });
  }
  return [...best.values()];
}

function localesFor(config: RenderConfig, outcome: RegionOutcome): string[] {
  const teams = config.teams.filter((t) => outcome.region.teams.includes(t.id) || t.national);
  const locales = [...new Set(teams.map((t) => t.locale))];
  return locales.length > 0 ? locales : ['en'];
}

function el(name: string, value: string | number): string {
  return `<${name}>${escapeXml(toXmlChars(String(value)))}</${name}>`;
}

function infoXml(
  config: RenderConfig,
  env: TemplateEnv,
  outcome: RegionOutcome,
  ind: IndicatorStage,
  view: RegionView,
  locale: string,
): string {
  const stage = config.stages[ind.rank];
  const decision = ind.tier.decision;
  const lead =
    decision.lead ??
    ind.tier.probabilities.reduce<LeadProbability | null>((a, p) => (a === null || p.probability > a.probability ? p : a), null);
  const tierView = view.tiers.find((t) => t.tier === ind.tier.tier && t.indicatorId === ind.id) ?? view.tiers[0];
  const stageView = tierView.stage;
  const leadView = tierView.leads.find((l) => lead !== null && l.index === lead.lead.index) ?? null;
  const t = env.t(locale);
  const hazard = tierView.hazard;
  const p = lead?.probability ?? 0;
  const parts = [
    el('language', locale),
    el('category', 'Health'),
    el('category', 'Met'),
    el('event', t('cap.event', { hazard })),
    el('urgency', stage.cap.urgency),
    el('severity', stage.cap.severity),
    el('certainty', capCertainty(p)),
    el('audience', t('cap.audience')),
  ];
  if (lead) {
    parts.push(el('onset', capLocalMidnight(lead.lead.start, outcome.region)));
    parts.push(el('expires', capLocalMidnight(nextDay(lead.lead.end), outcome.region)));
  }
  parts.push(
    el('senderName', t('cap.senderName', { country: countryName(config, locale) })),
    el(
      'headline',
      t('cap.headline', {
        region: outcome.region.name,
        glyph: stageView.glyph,
        label: stageView.label,
        hazard,
        dates: leadView?.dates ?? 'none',
      }),
    ),
    el(
      'description',
      leadView
        ? t('cap.description', {
            meaning: stageView.meaning,
            hazard,
            threshold: leadView.threshold,
            dates: leadView.dates,
            chance: leadView.chance,
            word: leadView.word,
            normal: leadView.normal,
            sure: sureSentence(t, leadView),
          })
        : stageView.meaning,
    ),
    el('instruction', stageView.actions),
  );
  const params: [string, string][] = [
    ['forelight:stage', stage.id],
    ['forelight:tier', ind.tier.tier],
  ];
  if (lead) {
    params.push(['forelight:lead', `${lead.lead.tier} ${lead.lead.index} (${lead.lead.start}/${lead.lead.end})`]);
    params.push(['forelight:exceedanceProbability', lead.probability.toFixed(2)]);
    params.push(['forelight:baseRate', lead.baseRate.toFixed(2)]);
    params.push(['forelight:threshold', `${lead.operator} ${lead.threshold.value} ${lead.threshold.units}`]);
    if (lead.skill) {
      const g = lead.skill.gate;
      params.push([
        'forelight:fairBrierSkillScore',
        `${g.fairBrierSkillScore.toFixed(2)} (90 % interval ${g.low.toFixed(2)} to ${g.high.toFixed(2)}, ${g.leads}, ${g.events} events in ${g.years} years)`,
      ]);
      params.push(['forelight:skillShown', lead.skill.skilful ? 'yes' : 'no']);
    }
  }
  for (const [k, v] of params) parts.push(`<parameter>${el('valueName', k)}${el('value', v)}</parameter>`);
  parts.push(
    `<area>${el('areaDesc', outcome.region.name)}${capPolygons(outcome.region)
      .map((p) => el('polygon', p))
      .join('')}</area>`,
  );
  return `<info>${parts.join('')}</info>`;
}

/** All CAP alerts of a run; `previous` supplies the alerts to Update or Cancel. */
export function buildCapAlerts(config: RenderConfig, env: TemplateEnv, run: BulletinRun, previous?: PreviousIssue): CapAlert[] {
  const sender = capSender(config);
  const sent = capUtc(run.issuedAt);
  const alerts: CapAlert[] = [];
  for (const outcome of run.regions) {
    const locales = localesFor(config, outcome);
    const views = new Map(locales.map((l) => [l, buildRegionView(config, outcome, l, 'default', env.t(l))]));
    for (const ind of indicatorStages(config, outcome)) {
      const before = previous?.alerts.find((a) => a.region === outcome.region.id && a.indicator === ind.id) ?? null;
      const active = ind.rank > 0;
      const priorActive = before !== null && stageIndex(config)(before.stageId).rank > 0;
      if (!active && !priorActive) continue;
      // After a Cancel (previous alert at the lowest stage) a new rise is a fresh Alert, not an Update.
      const msgType = !active ? 'Cancel' : priorActive ? 'Update' : 'Alert';
      const identifier = `forelight.${toToken(run.runId)}.${toToken(outcome.region.id)}.${toToken(ind.id)}`;
      const head = [
        el('identifier', identifier),
        el('sender', sender),
        el('sent', sent),
        el('status', run.mode === 'exercise' ? 'Exercise' : 'Actual'),
        el('msgType', msgType),
        el('source', 'Forelight'),
        el('scope', 'Restricted'),
        el('restriction', env.t(locales[0])('cap.restriction')),
      ];
      if (run.mode === 'exercise') head.push(el('note', env.t(locales[0])('cap.exerciseNote')));
      if (before && priorActive) head.push(el('references', `${before.sender},${before.id},${before.sent}`));
      const infos = locales.map((l) => infoXml(config, env, outcome, ind, views.get(l) as RegionView, l));
      const xml = `<?xml version="1.0" encoding="UTF-8"?>\n<alert xmlns="${CAP_NAMESPACE}">${head.join('')}${infos.join('')}</alert>\n`;
      alerts.push({ id: identifier, region: outcome.region.id, indicator: ind.id, msgType, sent, sender, stageId: ind.stageId, xml });
    }
  }
  return alerts;
}
