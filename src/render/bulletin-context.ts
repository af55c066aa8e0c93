/**
 * The variables every bulletin template receives (team e-mail, national summary, archive page, PDF), built
 * once per locale and audience from the region views. No sentence here: templates call `t()`.
 */
import type { TeamConfig } from '../config/types.ts';
import { formatDay } from './locale-format.ts';
import type { BulletinRun, RenderConfig } from './model.ts';
import type { OutlookCell, RegionView } from './region-view.ts';
import { TIERS } from './view-model.ts';
import { type StageView } from './stage-view.ts';
import type { Translate } from './catalogue.ts';
import { applyTypography } from './typography.ts';

export interface ChartRef {
  readonly src: string;
  readonly alt: string;
  readonly title: string;
  readonly width: number;
}

/** One row of the national region × range table: the region's stage and, per range, its highest tier stage. */
export interface NationalRow {
  readonly id: string;
  readonly name: string;
  readonly stage: StageView;
  readonly cells: readonly (OutlookCell | null)[];
}

export function nationalRows(regions: readonly RegionView[]): NationalRow[] {
  return regions.map((r) => ({
    id: r.id,
    name: r.name,
    stage: r.stage,
    cells: TIERS.map((_, i) =>
      r.outlook
        .map((row) => row.cells[i])
        .filter((c): c is OutlookCell => c !== null)
        .reduce<OutlookCell | null>((a, c) => (a === null || c.stage.rank > a.stage.rank ? c : a), null),
    ),
  }));
}

/** The highest stage among regions and the names of the regions at it. */
export function topStage(regions: readonly RegionView[]): { stage: StageView | null; names: string[] } {
  const stage = regions.reduce<StageView | null>((a, r) => (a === null || r.stage.rank > a.rank ? r.stage : a), null);
  return { stage, names: regions.filter((r) => stage !== null && r.stage.rank === stage.rank).map((r) => r.name) };
}

export function countryName(config: RenderConfig, locale: string): string {
  return applyTypography(locale, config.countryNames[locale] ?? config.country);
}

/** "Hazard: how its region value was formed", once per distinct line over the regions (the PDF's short note). */
function regionValueLines(regions: readonly RegionView[]): string[] {
  return [...new Set(regions.flatMap((r) => r.indicators.map((ind) => `${ind.hazard}: ${ind.regionValue}`)))];
}

/** Template variables for one audience (`team` null for the archive) in one locale. */
export function bulletinContext(
  config: RenderConfig,
  run: BulletinRun,
  t: Translate,
  locale: string,
  team: TeamConfig | null,
  regions: readonly RegionView[],
  extra: { issuedDay: string; cautions: readonly string[]; charts: (r: RegionView, indicator: string) => ChartRef | null },
) {
  const top = topStage(regions);
  return {
    country: countryName(config, locale),
    team: team ? { id: team.id, name: applyTypography(locale, team.name), national: team.national } : null,
    exercise: run.mode === 'exercise',
    runId: run.runId,
    issued: formatDay(locale, extra.issuedDay),
    nextIssue: formatDay(locale, run.nextIssue),
    cautions: extra.cautions,
    ladderText: config.stages.map((s) => `${s.glyph} ${applyTypography(locale, s.label[locale] ?? s.id)}`).join(', '),
    forecasts: run.forecastDates.map((f) => ({
      tier: f.tier,
      date: formatDay(locale, f.referenceTime.slice(0, 10)),
      older: f.basedOnOlder ? 'yes' : 'no',
    })),
    regions: regions.map((r) => ({ ...r, indicators: r.indicators.map((ind) => ({ ...ind, chart: extra.charts(r, ind.id) })) })),
    highest: top.stage,
    topRegions: top.names.join(t('list.separator')),
    nationalRows: nationalRows(regions),
    regionValues: regionValueLines(regions),
  };
}
