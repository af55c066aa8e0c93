/**
 * Printable bulletins: each team's print page (`print.html.njk`) rendered to an A4 PDF by headless Chromium
 * (playwright-core `page.pdf`). Chromium is a runtime dependency of PDF output only: when the configured
 * executable is missing or fails to start, no PDF is made and one note says so (the bulletins still go out).
 */
import { existsSync } from 'node:fs';
import { chromium } from 'playwright-core';
import { errorMessage } from '../core/errors.ts';

export interface PdfJob {
  readonly key: string;
  readonly html: string;
}
export interface PdfResult {
  readonly pdfs: ReadonlyMap<string, Uint8Array>;
  readonly note: string | null;
}

/** Headless Chromium flags for a closed network: no background connections, no sandbox (runs as root in CI). */
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-dev-shm-usage',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

/** Why PDFs cannot be made with `executable` (null when they can be tried). */
export function pdfUnavailable(executable: string | null | undefined): string | null {
  if (!executable) return null;
  return existsSync(executable)
    ? null
    : `no PDF bulletins: Chromium not found at ${executable} (delivery.pdf-chromium); install the Debian package chromium or set pdf-chromium: null`;
}

/** One PDF per job, A4 portrait, backgrounds printed (stage colours; glyphs carry the stage in black and white). */
export async function renderPdfs(executable: string | null | undefined, jobs: readonly PdfJob[]): Promise<PdfResult> {
  if (!executable || jobs.length === 0) return { pdfs: new Map(), note: null };
  const missing = pdfUnavailable(executable);
  if (missing) return { pdfs: new Map(), note: missing };
  let browser;
  try {
    browser = await chromium.launch({ executablePath: executable, args: CHROMIUM_ARGS });
  } catch (err) {
    return {
      pdfs: new Map(),
      note: `no PDF bulletins: Chromium at ${executable} did not start (${errorMessage(err).split('\n')[0]})`,
    };
  }
  try {
    const pdfs = new Map<string, Uint8Array>();
    const page = await browser.newPage();
    for (const job of jobs) {
      await page.setContent(job.html, { waitUntil: 'load' });
      const pdf = await page.pdf({
        format: 'A4',
        printBackground: true,
        margin: { top: '12mm', bottom: '12mm', left: '12mm', right: '12mm' },
      });
      pdfs.set(job.key, new Uint8Array(pdf));
    }
    return { pdfs, note: null };
  } finally {
    await browser.close();
  }
}
