/**
 * Static HTML archive of issued bulletins: `index.html` (per run: region, stage, the hazard that drove it and
 * for which dates), per run `<runId>/index.html`, `charts/*.svg`, `cap/*.xml`, `pdf/*.pdf`, `run.json`, and per
 * region `regions/<region>.html` with its stage history and a small timeline (`regions/<region>.svg`).
 * Regenerated in full from the list of issued runs the ledger keeps; no scripts or external resources.
 */
import { writeFileAtomic } from '../core/write-atomic.ts';
import { join } from 'node:path';
import { renderTimelineSvg, TIMELINE_WIDTH } from './archive-timeline.ts';
import { formatDay } from './locale-format.ts';
import { toToken } from './safe-text.ts';
import { createTemplateEnv } from './template-env.ts';

export interface ArchiveRegion {
  readonly id: string;
  readonly name: string;
  readonly stageId: string;
  /** Position in the ladder, 0 = lowest. */
  readonly rank: number;
  readonly label: string;
  readonly glyph: string;
  readonly colour: string;
  readonly ink: string;
  /** The hazard that set the stage and the dates it concerns ('' when nothing passed a trigger level; absent in older entries). */
  readonly hazard?: string;
  readonly dates?: string;
}

/** One issued run, as `renderBulletins` returns it (serialisable: the ledger may store it as JSON). */
export interface ArchiveEntry {
  readonly runId: string;
  readonly issuedAt: string;
  /** Local issue day `YYYY-MM-DD`. */
  readonly issuedDay: string;
  readonly locale: string;
  readonly title: string;
  readonly regions: readonly ArchiveRegion[];
  /** Rendered (already escaped) HTML body of the run page; charts referenced as `charts/<file>.svg`. */
  readonly bodyHtml: string;
  readonly charts: readonly { readonly filename: string; readonly svg: string }[];
  /** CAP alerts with the region and hazard they concern (names absent in older entries). */
  readonly capAlerts: readonly {
    readonly filename: string;
    readonly xml: string;
    readonly regionName?: string;
    readonly hazard?: string;
  }[];
  /** Printable PDFs per team, base64 (absent when Chromium was not available). */
  readonly pdfs?: readonly { readonly filename: string; readonly team: string; readonly base64: string }[];
  /** Reliability diagrams (render/reliability-chart.ts), written to `charts/` and linked from the run page. */
  readonly reliability?: readonly { readonly filename: string; readonly label: string; readonly svg: string }[];
  /** The stage ladder in the entry's locale, lowest first (absent in older entries). */
  readonly ladder?: readonly { readonly glyph: string; readonly label: string }[];
  readonly json: string;
}

export interface ArchiveOptions {
  /** Operator template directory (`config.templates`), searched before the shipped templates. */
  readonly templates?: string;
  /** Locale of the index page; defaults to the newest entry's locale, else "en". */
  readonly locale?: string;
  /** Region maps per source (`maps/<source>.svg`, what each region averages), linked from the index and region pages. */
  readonly maps?: readonly { readonly source: string; readonly file: string }[];
}

/** Folder of the region maps inside the archive. */
export const MAPS_FOLDER = 'maps';

/** Write the whole archive under `dir`; returns the paths written (relative to `dir`). */
export function writeArchive(dir: string, entries: readonly ArchiveEntry[], options: ArchiveOptions = {}): string[] {
  const env = createTemplateEnv(options.templates ?? '');
  const sorted = [...entries].sort((a, b) => b.issuedAt.localeCompare(a.issuedAt));
  const locale = options.locale ?? sorted[0]?.locale ?? 'en';
  const written: string[] = [];
  const put = (rel: string, content: string | Buffer): void => {
    const path = join(dir, rel);
    writeFileAtomic(path, content, 'render');
    written.push(rel);
  };

  const runs = sorted.map((e) => ({
    ...e,
    pdfs: e.pdfs ?? [],
    reliability: e.reliability ?? [],
    folder: toToken(e.runId),
    date: formatDay(locale, e.issuedDay),
  }));
  for (const run of runs) {
    for (const c of [...run.charts, ...run.reliability]) put(`${run.folder}/charts/${c.filename}`, c.svg);
    for (const a of run.capAlerts) put(`${run.folder}/cap/${a.filename}`, a.xml);
    for (const p of run.pdfs) put(`${run.folder}/pdf/${p.filename}`, Buffer.from(p.base64, 'base64'));
    put(`${run.folder}/run.json`, run.json);
    put(`${run.folder}/index.html`, env.render('archive-page.html.njk', run.locale, { run, date: formatDay(run.locale, run.issuedDay) }));
  }

  const regionIds = [...new Map(runs.flatMap((r) => r.regions.map((g) => [g.id, g.name] as const))).entries()];
  const t = env.t(locale);
  const byRegion = regionIds.map(([id, name]) => ({
    id,
    name,
    file: `${toToken(id)}.html`,
    items: runs.flatMap((r) => r.regions.filter((g) => g.id === id).map((g) => ({ folder: r.folder, date: r.date, stage: g }))),
  }));
  for (const g of byRegion) {
    const oldestFirst = [...g.items].reverse();
    const ladder = runs[0]?.ladder ?? ladderOf(runs.flatMap((r) => r.regions));
    const points = oldestFirst.map((i) => ({
      date: i.date,
      rank: i.stage.rank,
      glyph: i.stage.glyph,
      colour: i.stage.colour,
      ink: i.stage.ink,
    }));
    const alt = t('archive.timelineAlt', {
      region: g.name,
      points: oldestFirst.map((i) => `${i.date}: ${i.stage.glyph} ${i.stage.label}`).join(', '),
    });
    put(`regions/${g.file.replace(/\.html$/, '.svg')}`, renderTimelineSvg(points, ladder, alt));
    put(
      `regions/${g.file}`,
      env.render('archive-region.html.njk', locale, {
        region: g,
        timelineAlt: alt,
        timelineWidth: TIMELINE_WIDTH,
        maps: options.maps ?? [],
      }),
    );
  }
  put('index.html', env.render('archive-index.html.njk', locale, { runs, byRegion, maps: options.maps ?? [] }));
  return written;
}

/** The ladder as seen in the entries (rank → glyph and label); ranks never seen get the nearest lower label. */
function ladderOf(seen: readonly ArchiveRegion[]): { glyph: string; label: string }[] {
  const top = Math.max(0, ...seen.map((s) => s.rank));
  const ladder: { glyph: string; label: string }[] = [];
  for (let rank = 0; rank <= top; rank++) {
    const s = seen.find((x) => x.rank === rank);
    ladder.push(s ? { glyph: s.glyph, label: s.label } : { glyph: '·', label: String(rank + 1) });
  }
  return ladder;
}
