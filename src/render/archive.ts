/**
 * Static HTML archive of issued bulletins: `index.html` (by date, by region, by stage — glyph + label on every
 * stage) and per run `<runId>/index.html`, `<runId>/charts/*.svg`, `<runId>/cap/*.xml`, `<runId>/run.json`.
 * Regenerated in full from the list of issued runs the ledger keeps; no scripts or external resources.
 */
import { writeFileAtomic } from '../core/write-atomic.ts';
import { join } from 'node:path';
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
  readonly capAlerts: readonly { readonly filename: string; readonly xml: string }[];
  readonly json: string;
}

export interface ArchiveOptions {
  /** Operator template directory (`config.templates`), searched before the shipped templates. */
  readonly templates?: string;
  /** Locale of the index page; defaults to the newest entry's locale, else "en". */
  readonly locale?: string;
}

/** Write the whole archive under `dir`; returns the paths written (relative to `dir`). */
export function writeArchive(dir: string, entries: readonly ArchiveEntry[], options: ArchiveOptions = {}): string[] {
  const env = createTemplateEnv(options.templates ?? '');
  const sorted = [...entries].sort((a, b) => b.issuedAt.localeCompare(a.issuedAt));
  const locale = options.locale ?? sorted[0]?.locale ?? 'en';
  const written: string[] = [];
  const put = (rel: string, content: string): void => {
    const path = join(dir, rel);
    writeFileAtomic(path, content, 'render');
    written.push(rel);
  };

  const runs = sorted.map((e) => ({ ...e, folder: toToken(e.runId), date: formatDay(locale, e.issuedDay) }));
  for (const run of runs) {
    for (const c of run.charts) put(`${run.folder}/charts/${c.filename}`, c.svg);
    for (const a of run.capAlerts) put(`${run.folder}/cap/${a.filename}`, a.xml);
    put(`${run.folder}/run.json`, run.json);
    put(`${run.folder}/index.html`, env.render(`${run.locale}/archive-page.html.njk`, { run, date: formatDay(run.locale, run.issuedDay) }));
  }

  const regionIds = [...new Map(runs.flatMap((r) => r.regions.map((g) => [g.id, g.name] as const))).entries()];
  const byRegion = regionIds.map(([id, name]) => ({
    id, name,
    runs: runs.flatMap((r) => r.regions.filter((g) => g.id === id).map((g) => ({ folder: r.folder, date: r.date, stage: g }))),
  }));
  const stageRows = new Map<string, { stage: ArchiveRegion; items: { folder: string; date: string; region: string }[] }>();
  for (const r of runs) {
    for (const g of r.regions) {
      const row = stageRows.get(g.stageId) ?? { stage: g, items: [] };
      row.items.push({ folder: r.folder, date: r.date, region: g.name });
      stageRows.set(g.stageId, row);
    }
  }
  put('index.html', env.render(`${locale}/archive-index.html.njk`, { runs, byRegion, byStage: [...stageRows.values()].sort((a, b) => b.stage.rank - a.stage.rank) }));
  return written;
}
