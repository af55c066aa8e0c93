// Static archive, and the archive pages and an e-mail opened in a real browser (headless Chromium via
// playwright-core): no console errors, no broken images, stage labels visible. Screenshots go to test-artifacts/.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchChromium } from '../support/headless-chromium.ts';
import { writeArchive, type ArchiveEntry } from '../../src/render/archive.ts';
import { renderBulletins, type RenderedRun } from '../../src/render/render-bulletins.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const ARTIFACTS = resolve(dirname(fileURLToPath(import.meta.url)), '../../test-artifacts/render');
const ARCHIVE = join(ARTIFACTS, 'archive');

let first: RenderedRun;
let second: RenderedRun;
let written: string[];

beforeAll(async () => {
  rmSync(ARTIFACTS, { recursive: true, force: true });
  mkdirSync(ARTIFACTS, { recursive: true });
  first = await renderBulletins(sampleConfig(), {
    ...sampleRun(),
    runId: '2026-11-26-a',
    issuedAt: '2026-11-26T06:30:00Z',
    nextIssue: '2026-11-30',
  });
  second = await renderBulletins(sampleConfig(), sampleRun());
  written = writeArchive(ARCHIVE, [first.archive, second.archive]);
});

describe('writeArchive', () => {
  it('writes the index, one page per run, charts as SVG, CAP XML and run.json', () => {
    expect(written).toContain('index.html');
    for (const run of ['2026-11-26-a', '2026-11-30-a']) {
      for (const f of [
        'index.html',
        'run.json',
        'charts/kessan-lowlands-tmax-3day.svg',
        'cap/forelight.' + run + '.kessan-lowlands.tmax-3day.xml',
      ]) {
        expect(existsSync(join(ARCHIVE, run, f)), `${run}/${f}`).toBe(true);
      }
    }
  });

  it('index lists runs newest first; per run each region with stage (glyph + label), the hazard that drove it and its dates', () => {
    const index = readFileSync(join(ARCHIVE, 'index.html'), 'utf8').replace(/[\u00a0\u2009\u202f]/g, ' ');
    expect(index.indexOf('2026-11-30-a/index.html')).toBeLessThan(index.indexOf('2026-11-26-a/index.html'));
    const kessanRow =
      /<th scope="row"[^>]*>Kessan Lowlands<\/th>\s*<td[^>]*><span[^>]*>◑ Brace<\/span><\/td>\s*<td[^>]*>Hot days \(3-day average of daily highs\)<\/td>\s*<td[^>]*>3 – 5 Dec<\/td>/;
    expect(index).toMatch(kessanRow);
    expect(index).toMatch(/<th scope="row"[^>]*>Orrin Coast<\/th>\s*<td[^>]*><span[^>]*>○ Quiet<\/span><\/td>\s*<td[^>]*>—<\/td>/);
    expect(index).not.toMatch(/<script|https?:\/\//);
  });

  it('run pages name each CAP link by region and hazard; each region has a history page with a timeline', () => {
    const page = readFileSync(join(ARCHIVE, '2026-11-30-a', 'index.html'), 'utf8');
    expect(page).toContain('>CAP alert: Kessan Lowlands, Hot days (3-day average of daily highs)</a>');
    expect(page).toContain('>CAP alert: Tulva Delta, Weather favouring malaria</a>');
    expect(page).not.toMatch(/CAP alert \d/);
    const history = readFileSync(join(ARCHIVE, 'regions', 'kessan-lowlands.html'), 'utf8');
    expect(history).toContain('History of Kessan Lowlands');
    expect(history.indexOf('30 Nov 2026')).toBeGreaterThan(0);
    const svg = readFileSync(join(ARCHIVE, 'regions', 'kessan-lowlands.svg'), 'utf8');
    for (const label of ['○ Quiet', '◔ Mindful', '◑ Brace', '● Act now']) expect(svg).toContain(`>${label}</text>`);
    expect(spawnSync('xmllint', ['--noout', '-'], { input: svg, encoding: 'utf8' }).status).toBe(0);
  });

  it('the run page keeps the full per-lead table (the e-mail only has the merged one)', () => {
    const page = readFileSync(join(ARCHIVE, '2026-11-30-a', 'index.html'), 'utf8');
    expect(page).toContain('Hot days (3-day average of daily highs), Next days: every date');
    expect(page).toContain('Fri 4 Dec');
  });

  it('every relative link and image in the archive resolves to a written file', () => {
    const pages = written.filter((f) => f.endsWith('.html'));
    for (const page of pages) {
      const html = readFileSync(join(ARCHIVE, page), 'utf8');
      for (const m of html.matchAll(/(?:href|src)="([^"#]+)"/g)) {
        expect(existsSync(resolve(ARCHIVE, dirname(page), m[1])), `${page} → ${m[1]}`).toBe(true);
      }
    }
  });

  it('accepts entries round-tripped through JSON (as the ledger stores them)', () => {
    const entry = JSON.parse(JSON.stringify(second.archive)) as ArchiveEntry;
    const out = join(ARTIFACTS, 'archive-json');
    expect(writeArchive(out, [entry])).toContain('2026-11-30-a/index.html');
  });
});

describe('in headless Chromium', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchChromium();
  });
  afterAll(async () => {
    await browser?.close();
  });

  async function open(file: string, shot: string): Promise<{ page: Page; errors: string[] }> {
    const page = await browser.newPage({ viewport: { width: 820, height: 1100 } });
    const errors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    page.on('pageerror', (e) => errors.push(e.message));
    page.on('requestfailed', (r) => errors.push(`failed: ${r.url()}`));
    await page.goto(pathToFileURL(file).href, { waitUntil: 'load' });
    await page.screenshot({ path: join(ARTIFACTS, shot), fullPage: true });
    return { page, errors };
  }

  async function brokenImages(page: Page): Promise<string[]> {
    return page.$$eval('img', (imgs) => imgs.filter((i) => !(i.complete && i.naturalWidth > 0)).map((i) => i.getAttribute('src') ?? ''));
  }

  it('archive index: no console errors, stage labels visible', async () => {
    const { page, errors } = await open(join(ARCHIVE, 'index.html'), 'archive-index.png');
    expect(errors).toEqual([]);
    await expect(page.getByText('◑ Brace').first().isVisible()).resolves.toBe(true);
    await expect(page.getByRole('link', { name: '30 Nov 2026' }).first().isVisible()).resolves.toBe(true);
  });

  it('archive bulletin page: no console errors, every chart SVG loads, labels and cautions visible', async () => {
    const { page, errors } = await open(join(ARCHIVE, '2026-11-30-a', 'index.html'), 'archive-page.png');
    expect(errors).toEqual([]);
    expect(await page.locator('img').count()).toBe(6);
    expect(await brokenImages(page)).toEqual([]);
    await expect(page.getByText('◑ Brace').first().isVisible()).resolves.toBe(true);
    await expect(page.getByText('Read before acting').isVisible()).resolves.toBe(true);
  });

  it('team e-mail (cid: images swapped for data: URLs): no console errors, no broken images, labels visible', async () => {
    const b = second.bulletins.find((x) => x.team === 'kessan-health')!;
    let html = b.html;
    for (const a of b.attachments)
      html = html.replaceAll(`cid:${a.cid}`, `data:${a.contentType};base64,${Buffer.from(a.content).toString('base64')}`);
    const file = join(ARTIFACTS, 'email-kessan-health.html');
    writeFileSync(file, html);
    const { page, errors } = await open(file, 'email-kessan-health.png');
    expect(errors).toEqual([]);
    expect(await page.locator('img').count()).toBe(2);
    expect(await brokenImages(page)).toEqual([]);
    for (const label of ['◑ Brace', '◔ Mindful', '○ Quiet']) await expect(page.getByText(label).first().isVisible()).resolves.toBe(true);
  });

  it('French team e-mail renders too', async () => {
    const b = second.bulletins.find((x) => x.team === 'tulva-health')!;
    let html = b.html;
    for (const a of b.attachments)
      html = html.replaceAll(`cid:${a.cid}`, `data:${a.contentType};base64,${Buffer.from(a.content).toString('base64')}`);
    const file = join(ARTIFACTS, 'email-tulva-health.html');
    writeFileSync(file, html);
    const { page, errors } = await open(file, 'email-tulva-health.png');
    expect(errors).toEqual([]);
    expect(await brokenImages(page)).toEqual([]);
    await expect(page.getByText('◔ Vigilant').first().isVisible()).resolves.toBe(true);
    await expect(page.getByText("À lire avant d'agir").isVisible()).resolves.toBe(true);
  });
});
