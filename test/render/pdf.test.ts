// Printable bulletins: headless Chromium (playwright-core page.pdf) prints each bulletin to an A4 PDF, attached to
// the e-mail and kept in the archive. Checked with Debian's poppler-utils: pdfinfo (pages, page size: A4 is
// 595 × 842 pt, ISO 216) and pdftotext (stage glyph and label, dates, action, cautions are real text, so the page
// reads in black and white). Without Chromium the bulletins still render, without the PDF, and one note says so.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { renderBulletins, type RenderedRun } from '../../src/render/render-bulletins.ts';
import { applyTypography } from '../../src/render/typography.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const dir = mkdtempSync(join(tmpdir(), 'forelight-pdf-'));
const withPdf = (chromium: string | null) => {
  const c = sampleConfig();
  return { ...c, delivery: { ...c.delivery, pdfChromium: chromium } };
};
/** Size budget of one PDF (inside the 300 kB e-mail budget; common practice, no source). */
const PDF_BUDGET = 150 * 1024;

let out: RenderedRun;
beforeAll(async () => {
  out = await renderBulletins(withPdf('/usr/bin/chromium'), sampleRun());
}, 120_000);

function pdfOf(team: string): string {
  const b = out.bulletins.find((x) => x.team === team)!;
  const a = b.attachments.find((x) => x.contentType === 'application/pdf');
  expect(a, `${team} has a PDF`).toBeDefined();
  const file = join(dir, a!.filename);
  writeFileSync(file, a!.content);
  return file;
}

const info = (file: string) => spawnSync('pdfinfo', [file], { encoding: 'utf8' }).stdout;
const text = (file: string) =>
  spawnSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).stdout.replace(/[\u00a0\u2009\u202f]/g, ' ');

describe('PDF per bulletin (Chromium → pdfinfo / pdftotext)', () => {
  it('every team bulletin is one A4 page within the size budget; the national summary at most three pages', () => {
    for (const b of out.bulletins) {
      const file = pdfOf(b.team);
      const meta = info(file);
      expect(meta).toMatch(/Page size:\s+595(\.\d+)? x 841(\.\d+)? pts \(A4\)|Page size:\s+595(\.\d+)? x 842(\.\d+)? pts \(A4\)/);
      const pages = Number(/Pages:\s+(\d+)/.exec(meta)![1]);
      if (b.team === 'national-desk') expect(pages).toBeLessThanOrEqual(3);
      else expect(pages, b.team).toBe(1);
      expect(b.attachments.find((a) => a.contentType === 'application/pdf')!.content.length).toBeLessThanOrEqual(PDF_BUDGET);
    }
  });

  it('the page carries stage glyph and label, hazard, dates, chance, action and every caution as text', () => {
    const k = text(pdfOf('kessan-health')).replace(/\s+/g, ' ');
    for (const s of [
      '◑ Brace',
      'Hot days',
      'When: 3 – 5 Dec',
      '70% chance',
      'Alert clinics and community health workers',
      'Stage for this range: ◑ Brace',
    ])
      expect(k).toContain(s);
    for (const c of sampleConfig().cautions.en) expect(k).toContain(c.split(' ').slice(0, 6).join(' '));
    const f = text(pdfOf('tulva-health')).replace(/\s+/g, ' ');
    expect(f).toContain('◔ Vigilant');
    expect(f).toContain(applyTypography('fr', 'Quand : 1 déc. 2026').replace(/[\u00a0\u202f]/g, ' '));
  });

  it('the PDF is attached (not inline) and archived', () => {
    expect(out.archive.pdfs?.map((p) => p.filename)).toContain('forelight-2026-11-30-a-kessan-health.pdf');
    expect(out.notes).toEqual([]);
  });
});

describe('without Chromium', () => {
  it('bulletins go out without PDF; the run notes say so once (render notes and run.json)', async () => {
    const r = await renderBulletins(withPdf('/nonexistent/chromium'), sampleRun());
    expect(r.bulletins).toHaveLength(5);
    for (const b of r.bulletins) expect(b.attachments.some((a) => a.contentType === 'application/pdf')).toBe(false);
    expect(r.notes).toHaveLength(1);
    expect(r.notes[0]).toMatch(/^no PDF bulletins: Chromium not found at \/nonexistent\/chromium .*install the Debian package chromium/);
    const notes = (JSON.parse(r.json) as { notes: string[] }).notes;
    expect(notes.filter((n) => n.startsWith('no PDF bulletins'))).toHaveLength(1);
  });
});
