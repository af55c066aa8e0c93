// The sample-run bulletins (fixed fixture), the national summary and the archive pages in Debian's Chromium (playwright-core) at a
// phone (390 × 844) and a desktop (1280 × 800) viewport: no horizontal scrolling (scrollWidth ≤ viewport), the
// first screen (stage, dates, probability, how sure, action) above the fold, and in every chart no two text
// boxes overlapping (bounding boxes of tick labels, stage-line labels and legend entries, compared pairwise).
// Screenshots go to test-artifacts/phone/ (git-ignored) for review. The HTML the demo itself writes (outbox .html
// and archive of its three runs) is opened at 390 px in test/pipeline/demo-consistency.test.ts.
import { mkdirSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchChromium, layoutProblems } from '../support/headless-chromium.ts';
import { htmlWithInlineImages } from '../../src/deliver/outbox.ts';
import { writeArchive } from '../../src/render/archive.ts';
import { EMAIL_BUDGET_BYTES, renderBulletins, type RenderedRun } from '../../src/render/render-bulletins.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const OUT = resolve(dirname(fileURLToPath(import.meta.url)), '../../test-artifacts/phone');
const ARCHIVE = join(OUT, 'archive');
const VIEWPORTS = [
  { width: 390, height: 844 },
  { width: 1280, height: 800 },
];
/** E-mail size budget per bulletin (HTML + text + attachments), stated in README (common practice, no source). */
const BUDGET_BYTES = EMAIL_BUDGET_BYTES;

let run: RenderedRun;
let browser: Browser;
const pages: { name: string; file: string; team: boolean }[] = [];

beforeAll(async () => {
  rmSync(OUT, { recursive: true, force: true });
  mkdirSync(OUT, { recursive: true });
  const first = await renderBulletins(sampleConfig(), {
    ...sampleRun(),
    runId: '2026-11-26-a',
    issuedAt: '2026-11-26T06:30:00Z',
    nextIssue: '2026-11-30',
  });
  run = await renderBulletins(sampleConfig(), sampleRun());
  writeArchive(ARCHIVE, [first.archive, run.archive]);
  for (const b of run.bulletins) {
    const file = join(OUT, `email-${b.team}.html`);
    writeFileSync(file, htmlWithInlineImages(b));
    pages.push({ name: `email-${b.team}`, file, team: !b.team.startsWith('national') });
  }
  pages.push({ name: 'archive-index', file: join(ARCHIVE, 'index.html'), team: false });
  pages.push({ name: 'archive-run', file: join(ARCHIVE, '2026-11-30-a', 'index.html'), team: false });
  for (const f of readdirSync(join(ARCHIVE, 'regions')).filter((x) => x.endsWith('.html')))
    pages.push({ name: `archive-region-${f.replace('.html', '')}`, file: join(ARCHIVE, 'regions', f), team: false });
  browser = await launchChromium();
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

describe.each(VIEWPORTS)('at $width × $height', (viewport) => {
  it('no page is wider than the screen; the first screen of every team bulletin shows stage, dates, probability, how sure and action', async () => {
    const page = await browser.newPage({ viewport });
    const problems: string[] = [];
    for (const p of pages) {
      await page.goto(pathToFileURL(p.file).href, { waitUntil: 'load' });
      problems.push(...(await layoutProblems(page, p.name, p.team ? { mayLack: [] } : null)));
      await page.screenshot({ path: join(OUT, `${p.name}-${viewport.width}-first-screen.png`) });
      await page.screenshot({ path: join(OUT, `${p.name}-${viewport.width}.png`), fullPage: true });
    }
    await page.close();
    expect(problems).toEqual([]);
  }, 120_000);
});

describe('national summary first screen', () => {
  it('at 390 × 844 the highest stage line and the start of the region × range table are above the fold', async () => {
    const page = await browser.newPage({ viewport: VIEWPORTS[0] });
    await page.goto(pathToFileURL(join(OUT, 'email-national-desk.html')).href);
    const stage = await page.locator('[data-first-screen="national"] [data-role="stage"]').boundingBox();
    const table = await page.locator('[data-first-screen="national"] [data-role="outlook"] tbody tr').last().boundingBox();
    expect(stage!.y + stage!.height).toBeLessThan(844);
    expect(table!.y + table!.height).toBeLessThan(844);
    await page.close();
  });
});

describe('charts in Chromium', () => {
  it('no two text boxes overlap in any chart or timeline (tick labels, stage-line labels, legend)', async () => {
    const page = await browser.newPage({ viewport: { width: 400, height: 900 } });
    const svgs = [
      ...readdirSync(join(ARCHIVE, '2026-11-30-a', 'charts')).map((f) => join(ARCHIVE, '2026-11-30-a', 'charts', f)),
      ...readdirSync(join(ARCHIVE, 'regions'))
        .filter((f) => f.endsWith('.svg'))
        .map((f) => join(ARCHIVE, 'regions', f)),
    ];
    expect(svgs.length).toBeGreaterThan(6);
    const overlaps: string[] = [];
    for (const file of svgs) {
      await page.goto(pathToFileURL(file).href);
      const boxes = await page.$$eval('text.tick, text.legend', (els) =>
        els.map((e) => {
          const r = e.getBoundingClientRect();
          return { t: e.textContent ?? '', x: r.left, y: r.top, w: r.width, h: r.height, right: r.right };
        }),
      );
      const width = await page.evaluate(() => document.documentElement.getBoundingClientRect().width);
      for (const [i, a] of boxes.entries()) {
        if (a.x < -0.5 || a.right > Math.max(width, 360) + 0.5) overlaps.push(`${file}: "${a.t}" outside the drawing`);
        for (const b of boxes.slice(i + 1)) {
          const ix = Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x);
          const iy = Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y);
          if (ix > 0.5 && iy > 0.5) overlaps.push(`${file}: "${a.t}" overlaps "${b.t}"`);
        }
      }
    }
    await page.close();
    expect(overlaps).toEqual([]);
  }, 60_000);
});

describe('size budget', () => {
  it(`every e-mail (HTML, text and attachments) is within ${BUDGET_BYTES / 1024} kB`, () => {
    for (const b of run.bulletins) {
      const bytes = Buffer.byteLength(b.html) + Buffer.byteLength(b.text) + b.attachments.reduce((n, a) => n + a.content.length, 0);
      expect(bytes, b.team).toBeLessThanOrEqual(BUDGET_BYTES);
    }
  });
});
