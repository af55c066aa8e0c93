/**
 * The render stage: per team an HTML + plain-text bulletin (team locale) for the regions it covers, a national
 * summary for `national: true` teams, CAP 1.2 alerts, `run.json`, and an archive entry for `writeArchive`.
 * Refuses to render (throws) when a locale in use has no cautions.
 */
import type { Bulletin } from '../bulletin-types.ts';
import type { TeamConfig } from '../config/types.ts';
import { ForelightError } from '../core/errors.ts';
import { localDayNumber, regionClock, type LocalClock } from '../core/local-clock.ts';
import type { ArchiveEntry } from './archive.ts';
import { bulletinContext, topStage } from './bulletin-context.ts';
import type { Translate } from './catalogue.ts';
import { buildCapAlerts } from './cap.ts';
import { checkRegionView, contradictionDiagnostics } from './consistency.ts';
import type { Diagnostic } from '../core/diagnostics.ts';
import { reliabilityCharts } from './reliability-chart.ts';
import { chartPngsWithin } from './chart-png.ts';
import { runCharts } from './run-charts.ts';
import type { BulletinRun, CapAlert, PreviousIssue, RenderConfig } from './model.ts';
import { buildRegionView, type RegionView } from './region-view.ts';
import { renderPdfs } from './pdf.ts';
import { renderRunJson } from './run-json.ts';
import { capHeaderText, toHeaderText, toToken } from './safe-text.ts';
import { createTemplateEnv } from './template-env.ts';
import { applyTypography } from './typography.ts';

export interface RenderedRun {
  readonly bulletins: Bulletin[];
  readonly capAlerts: CapAlert[];
  readonly json: string;
  /** Everything `writeArchive` needs for this run (keep it in the ledger's list of issued runs). */
  readonly archive: ArchiveEntry;
  /** Run notes of the render stage (e.g. no PDF because Chromium is missing), also written to run.json. */
  readonly notes: readonly string[];
  /** Statements of the rendered bulletins that disagree (render/consistency.ts), also in run.json's problems. */
  readonly contradictions: readonly Diagnostic[];
}

/** Cautions of a locale (with its typography); throws when there are none, so no bulletin can go out without them. */
export function cautionsFor(config: RenderConfig, locale: string): readonly string[] {
  const list = (config.cautions[locale] ?? []).filter((c) => c.trim() !== '');
  if (list.length === 0) {
    throw new ForelightError(
      'render',
      'no-cautions',
      `config.cautions has no caution text for locale "${locale}"`,
      `add cautions.${locale} to the config YAML; bulletins are never sent without them`,
    );
  }
  return list.map((c) => applyTypography(locale, c));
}

/** A recipient address with control characters removed; throws when what remains is not one plain address. */
function cleanAddress(team: TeamConfig, raw: string): string {
  const addr = toHeaderText(raw);
  if (!/^[^\s@<>,;:"()[\]\\]+@[^\s@<>,;:"()[\]\\]+$/.test(addr)) {
    throw new ForelightError(
      'render',
      'bad-recipient',
      `team "${team.id}" recipient ${JSON.stringify(raw)} is not a single e-mail address`,
      'write one plain address per recipients entry',
    );
  }
  return addr;
}

/** Local calendar day of an instant on a region's clock. */
function localDay(iso: string, clock: LocalClock): string {
  return new Date(localDayNumber(clock, Date.parse(iso)) * 86_400_000).toISOString().slice(0, 10);
}

/** Size budget of one e-mail: HTML, text, charts and PDF, before transfer encoding (README, "Outputs"). */
export const EMAIL_BUDGET_BYTES = 300 * 1024;
/** Room kept for the printable PDF (one A4 page is 30–70 kB). */
const PDF_ALLOWANCE_BYTES = 80 * 1024;

/** Render a run for every team, plus CAP, JSON and the archive entry. */
export async function renderBulletins(config: RenderConfig, run: BulletinRun, previous?: PreviousIssue): Promise<RenderedRun> {
  const env = createTemplateEnv(config.templates);
  const nationalTeams = config.teams.filter((t) => t.national);
  const archiveLocale = nationalTeams[0]?.locale ?? config.teams[0]?.locale ?? 'en';
  for (const locale of new Set([...config.teams.map((t) => t.locale), archiveLocale])) cautionsFor(config, locale);
  const issuedDay = localDay(run.issuedAt, regionClock(run.regions[0]?.region ?? { utcOffsetHours: 0 }));

  const { chartsFor, chartRef } = runCharts(config, run, env);
  // Every view rendered is checked for statements that disagree (one finding per region, locale and text).
  const contradictions = new Map<string, Diagnostic>();
  const views = (locale: string, audience: string, regions: BulletinRun['regions']): RegionView[] =>
    regions.map((r) => {
      const view = buildRegionView(config, r, locale, audience, env.t(locale));
      const found = checkRegionView(config, r, view, locale, env.t(locale));
      for (const d of contradictionDiagnostics(found, locale, audience)) contradictions.set(d.message, d);
      return view;
    });

  const capAlerts = buildCapAlerts(config, env, run, previous);

  // Check every address before rendering anything, so a bad recipient fails fast and names its team.
  const recipients = new Map(config.teams.map((t) => [t.id, t.recipients.map((a) => cleanAddress(t, a))]));
  const drafts: (Omit<Bulletin, 'attachments'> & { attachments: Bulletin['attachments'][number][]; print: string })[] = [];
  for (const team of config.teams) {
    const locale = team.locale;
    const t = env.t(locale);
    const covered = team.national ? run.regions : run.regions.filter((r) => r.region.teams.includes(team.id));
    if (covered.length === 0) continue;
    const regionViews = views(locale, team.id, covered);
    // The national summary carries no charts (size budget); the team bulletins one per region × indicator.
    const ctx = bulletinContext(config, run, t, locale, team, regionViews, {
      issuedDay,
      cautions: cautionsFor(config, locale),
      charts: team.national ? () => null : chartRef(locale, (key) => `cid:${key}@forelight`),
    });
    const kind = team.national ? 'national' : 'team';
    const c = chartsFor(locale);
    const specs = team.national ? [] : regionViews.flatMap((v) => c.specs.get(v.id) ?? []);
    // Charts take what the budget leaves after the text parts and a typical PDF.
    const html = env.render(`${kind}.html.njk`, locale, ctx);
    const text = env.render(`${kind}.txt.njk`, locale, ctx);
    const { pngs } = chartPngsWithin(
      specs.map((s) => c.svg.get(s.key) as string),
      EMAIL_BUDGET_BYTES - Buffer.byteLength(html) - Buffer.byteLength(text) - PDF_ALLOWANCE_BYTES,
    );
    const attachments = specs.map((s, i) => ({
      cid: `${s.key}@forelight`,
      filename: `${s.key}.png`,
      contentType: 'image/png',
      content: pngs[i],
    }));
    drafts.push({
      id: toToken(`${run.runId}-${team.id}`),
      team: team.id,
      locale,
      to: recipients.get(team.id) ?? [],
      subject: capHeaderText(subjectOf(t, ctx, regionViews, team.national)),
      html,
      text,
      attachments,
      print: env.render('print.html.njk', locale, ctx),
    });
  }
  // One printable A4 PDF per bulletin, attached and archived; without Chromium the bulletins go out without it.
  const printed = await renderPdfs(
    config.delivery.pdfChromium,
    drafts.map((d) => ({ key: d.id, html: d.print })),
  );
  const pdfName = (d: { team: string }) => `forelight-${toToken(run.runId)}-${toToken(d.team)}.pdf`;
  const bulletins: Bulletin[] = drafts.map(({ print: _print, ...d }) => {
    const pdf = printed.pdfs.get(d.id);
    return pdf
      ? {
          ...d,
          attachments: [
            ...d.attachments,
            { cid: `${d.id}.pdf@forelight`, filename: pdfName(d), contentType: 'application/pdf', content: pdf },
          ],
        }
      : d;
  });
  const notes = printed.note ? [printed.note] : [];

  const archiveViews = views(archiveLocale, nationalTeams[0]?.id ?? 'default', run.regions);
  const at = env.t(archiveLocale);
  const archiveCtx = bulletinContext(config, run, at, archiveLocale, null, archiveViews, {
    issuedDay,
    cautions: cautionsFor(config, archiveLocale),
    charts: chartRef(archiveLocale, (key) => `charts/${key}.svg`),
  });
  const found = [...contradictions.values()];
  const json = renderRunJson(
    config,
    { ...run, notes: [...(run.notes ?? []), ...notes], problems: [...(run.problems ?? []), ...found] },
    capAlerts,
  );
  const archive: ArchiveEntry = {
    runId: run.runId,
    issuedAt: run.issuedAt,
    issuedDay,
    locale: archiveLocale,
    title: toHeaderText(subjectOf(at, archiveCtx, archiveViews, true)),
    regions: archiveViews.map((v) => ({
      id: v.id,
      name: v.name,
      stageId: v.stage.id,
      rank: v.stage.rank,
      label: v.stage.label,
      glyph: v.stage.glyph,
      colour: v.stage.colour,
      ink: v.stage.ink,
      hazard: v.headline?.triggered ? v.headline.hazard : '',
      dates: v.headline?.triggered ? v.headline.dates : '',
    })),
    bodyHtml: env.render('archive-body.html.njk', archiveLocale, archiveCtx),
    charts: [...chartsFor(archiveLocale).svg].map(([key, svg]) => ({ filename: `${key}.svg`, svg })),
    capAlerts: capAlerts.map((a) => ({
      filename: `${toToken(a.id)}.xml`,
      xml: a.xml,
      regionName: run.regions.find((r) => r.region.id === a.region)?.region.name ?? a.region,
      hazard: archiveViews.flatMap((v) => v.indicators).find((i) => i.id === a.indicator)?.hazard ?? a.indicator,
    })),
    pdfs: bulletins.flatMap((b) =>
      b.attachments
        .filter((a) => a.contentType === 'application/pdf')
        .map((a) => ({
          filename: a.filename,
          team: config.teams.find((t) => t.id === b.team)?.name ?? b.team,
          base64: Buffer.from(a.content).toString('base64'),
        })),
    ),
    reliability: reliabilityCharts(
      run.regions,
      at,
      (id) => archiveViews.flatMap((v) => v.indicators).find((i) => i.id === id)?.hazard ?? id,
    ),
    ladder: config.stages.map((s) => ({ glyph: s.glyph, label: applyTypography(archiveLocale, s.label[archiveLocale] ?? s.id) })),
    json,
  };
  return { bulletins, capAlerts, json, archive, notes, contradictions: found };
}

/** Subject: each region's stage for a team; for the national summary the top stage and every region at it. */
function subjectOf(t: Translate, ctx: ReturnType<typeof bulletinContext>, regions: readonly RegionView[], national: boolean): string {
  const base = { exercise: ctx.exercise ? 'yes' : 'no', country: ctx.country, issued: ctx.issued };
  if (national) {
    const top = topStage(regions);
    return t('subject.national', {
      ...base,
      label: top.stage?.label ?? '',
      glyph: top.stage?.glyph ?? '',
      regions: top.names.join(t('list.separator')),
    });
  }
  const list = regions
    .map((r) => t('subject.regionStage', { region: r.name, label: r.stage.label, glyph: r.stage.glyph }))
    .join(t('list.separator'));
  return t('subject.team', { ...base, regions: list });
}
