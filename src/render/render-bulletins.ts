/**
 * The render stage: per team an HTML + plain-text bulletin (team locale) for the regions it covers, a national
 * summary for `national: true` teams, CAP 1.2 alerts, `run.json`, and an archive entry for `writeArchive`.
 * Refuses to render (throws) when a locale in use has no cautions.
 */
import type { Bulletin, Tier } from '../types.ts';
import type { Config, TeamConfig } from '../config/types.ts';
import { ForelightError } from '../core/errors.ts';
import { localDayNumber, regionClock, type LocalClock } from '../core/local-clock.ts';
import type { ArchiveEntry } from './archive.ts';
import { buildCapAlerts } from './cap.ts';
import { buildChartSpecs, chartWidth, renderChartPng, renderChartSvg, type ChartSpec, type ChartWords } from './charts.ts';
import { formatDay, formatPercent, toIntlLocale } from './locale-format.ts';
import type { BulletinRun, CapAlert, PreviousIssue } from './model.ts';
import { renderRunJson } from './run-json.ts';
import { toHeaderText, toToken } from './safe-text.ts';
import { createTemplateEnv, type TemplateEnv } from './template-env.ts';
import { buildRegionView, type RegionView } from './view-model.ts';

export interface RenderedRun {
  readonly bulletins: Bulletin[];
  readonly capAlerts: CapAlert[];
  readonly json: string;
  /** Everything `writeArchive` needs for this run (keep it in the ledger's list of issued runs). */
  readonly archive: ArchiveEntry;
}

/** Cautions of a locale; throws when there are none, so no bulletin can go out without them. */
export function cautionsFor(config: Config, locale: string): readonly string[] {
  const list = (config.cautions[locale] ?? []).filter((c) => c.trim() !== '');
  if (list.length === 0) {
    throw new ForelightError('render', 'no-cautions', `config.cautions has no caution text for locale "${locale}"`, `add cautions.${locale} to the config YAML; bulletins are never sent without them`);
  }
  return list;
}

/** A recipient address with control characters removed; throws when what remains is not one plain address. */
function cleanAddress(team: TeamConfig, raw: string): string {
  const addr = toHeaderText(raw);
  if (!/^[^\s@<>,;:"()[\]\\]+@[^\s@<>,;:"()[\]\\]+$/.test(addr)) {
    throw new ForelightError('render', 'bad-recipient', `team "${team.id}" recipient ${JSON.stringify(raw)} is not a single e-mail address`, 'write one plain address per recipients entry');
  }
  return addr;
}

/** Local calendar day of an instant on a region's clock. */
function localDay(iso: string, clock: LocalClock): string {
  return new Date(localDayNumber(clock, Date.parse(iso)) * 86_400_000).toISOString().slice(0, 10);
}

function chartWords(env: TemplateEnv, locale: string): ChartWords {
  const tag = toIntlLocale(locale);
  const monthFmt = new Intl.DateTimeFormat(tag, { month: 'short', timeZone: 'UTC' });
  const dayFmt = new Intl.DateTimeFormat(tag, { day: 'numeric', month: 'short', timeZone: 'UTC' });
  return {
    title: (region, indicator) => env.phrase(locale, 'chartTitle', { region, indicator }),
    description: (region, indicator, panels) => env.phrase(locale, 'chartDescription', {
      region, indicator,
      panels: panels.map((p) => ({ title: p.title, values: p.points.map((pt) => `${pt.tick}: ${formatPercent(locale, pt.probability)}`).join(', ') })),
    }),
    tier: (tier: Tier) => env.phrase(locale, 'tierName', { tier }),
    tick: (tier, _index, start) => {
      const d = new Date(`${start}T00:00:00Z`);
      return tier === 'days' ? String(d.getUTCDate()) : tier === 'weeks' ? dayFmt.format(d) : monthFmt.format(d);
    },
    yLabel: env.phrase(locale, 'chartYLabel', {}),
    legend: { chance: env.phrase(locale, 'chartLegendChance', {}), normal: env.phrase(locale, 'chartLegendNormal', {}), noSkill: env.phrase(locale, 'chartLegendNoSkill', {}) },
  };
}

interface LocaleCharts { specs: Map<string, ChartSpec[]>; svg: Map<string, string>; png: Map<string, Uint8Array> }

/** Render a run for every team, plus CAP, JSON and the archive entry. */
export async function renderBulletins(config: Config, run: BulletinRun, previous?: PreviousIssue): Promise<RenderedRun> {
  const env = createTemplateEnv(config.templates);
  const nationalTeams = config.teams.filter((t) => t.national);
  const archiveLocale = nationalTeams[0]?.locale ?? config.teams[0]?.locale ?? 'en';
  for (const locale of new Set([...config.teams.map((t) => t.locale), archiveLocale])) cautionsFor(config, locale);
  const issuedDay = localDay(run.issuedAt, regionClock(run.regions[0]?.region ?? { utcOffsetHours: 0 }));

  const charts = new Map<string, LocaleCharts>();
  const chartsFor = (locale: string): LocaleCharts => {
    let c = charts.get(locale);
    if (!c) {
      const words = chartWords(env, locale);
      c = { specs: new Map(), svg: new Map(), png: new Map() };
      for (const r of run.regions) {
        const specs = buildChartSpecs(config, r, locale, words);
        c.specs.set(r.region.id, specs);
        for (const s of specs) c.svg.set(s.key, renderChartSvg(s));
      }
      charts.set(locale, c);
    }
    return c;
  };

  const capAlerts = buildCapAlerts(config, env, run, previous);

  const context = (team: TeamConfig | null, locale: string, regions: RegionView[], chartSrc: (key: string) => string) => {
    const c = chartsFor(locale);
    return {
      country: config.country,
      team: team ? { id: team.id, name: team.name, national: team.national } : null,
      exercise: run.mode === 'exercise',
      runId: run.runId,
      issued: formatDay(locale, issuedDay),
      nextIssue: formatDay(locale, run.nextIssue),
      cautions: cautionsFor(config, locale),
      ladder: config.stages.map((s) => ({ glyph: s.glyph, label: s.label[locale] ?? s.id })),
      forecasts: run.forecastDates.map((f) => ({ name: f.name, date: formatDay(locale, f.referenceTime.slice(0, 10)), basedOnOlder: f.basedOnOlder ?? false })),
      regions: regions.map((r) => ({
        ...r,
        indicators: r.indicators.map((ind) => {
          const spec = (c.specs.get(r.id) ?? []).find((s) => s.indicator === ind.id);
          return { ...ind, chart: spec ? { src: chartSrc(spec.key), alt: spec.description, title: spec.title, width: chartWidth(spec) } : null };
        }),
      })),
      highest: regions.reduce<RegionView | null>((a, r) => (a === null || r.stage.rank > a.stage.rank ? r : a), null),
    };
  };

  // Check every address before rendering anything, so a bad recipient fails fast and names its team.
  const recipients = new Map(config.teams.map((t) => [t.id, t.recipients.map((a) => cleanAddress(t, a))]));
  const bulletins: Bulletin[] = [];
  for (const team of config.teams) {
    const locale = team.locale;
    const covered = team.national ? run.regions : run.regions.filter((r) => r.region.teams.includes(team.id));
    if (covered.length === 0) continue;
    const views = covered.map((r) => buildRegionView(config, r, locale, team.id));
    const ctx = context(team, locale, views, (key) => `cid:${key}@forelight`);
    const kind = team.national ? 'national' : 'team';
    const c = chartsFor(locale);
    const attachments = views.flatMap((v) => (c.specs.get(v.id) ?? []).map((s) => {
      let png = c.png.get(s.key);
      if (!png) {
        png = renderChartPng(c.svg.get(s.key) as string);
        c.png.set(s.key, png);
      }
      return { cid: `${s.key}@forelight`, filename: `${s.key}.png`, contentType: 'image/png', content: png };
    }));
    bulletins.push({
      id: toToken(`${run.runId}-${team.id}`),
      team: team.id,
      locale,
      to: recipients.get(team.id) ?? [],
      subject: toHeaderText(env.phrase(locale, 'subject', ctx)),
      html: env.render(`${locale}/${kind}.html.njk`, ctx),
      text: env.render(`${locale}/${kind}.txt.njk`, ctx),
      attachments,
    });
  }

  const archiveViews = run.regions.map((r) => buildRegionView(config, r, archiveLocale, nationalTeams[0]?.id ?? 'default'));
  const archiveCtx = context(nationalTeams[0] ?? null, archiveLocale, archiveViews, (key) => `charts/${key}.svg`);
  const archiveCharts = chartsFor(archiveLocale);
  const json = renderRunJson(config, run, capAlerts);
  const archive: ArchiveEntry = {
    runId: run.runId,
    issuedAt: run.issuedAt,
    issuedDay,
    locale: archiveLocale,
    title: toHeaderText(env.phrase(archiveLocale, 'subject', archiveCtx)),
    regions: archiveViews.map((v) => ({ id: v.id, name: v.name, stageId: v.stage.id, rank: v.stage.rank, label: v.stage.label, glyph: v.stage.glyph, colour: v.stage.colour, ink: v.stage.ink })),
    bodyHtml: env.render(`${archiveLocale}/archive-body.html.njk`, archiveCtx),
    charts: [...archiveCharts.svg].map(([key, svg]) => ({ filename: `${key}.svg`, svg })),
    capAlerts: capAlerts.map((a) => ({ filename: `${toToken(a.id)}.xml`, xml: a.xml })),
    json,
  };
  return { bulletins, capAlerts, json, archive };
}
