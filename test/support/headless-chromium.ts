/** Debian's Chromium (/usr/bin/chromium) headless through playwright-core, as the layout tests open pages with it. */
import { chromium, type Browser, type Page } from 'playwright-core';
import { CHROMIUM_ARGS } from '../../src/render/pdf.ts';

export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [...CHROMIUM_ARGS],
  });
}

/** First-screen elements of a team bulletin (data-role), and those that may be absent (how sure: only with a lead that may set the stage). */
export const FIRST_SCREEN = ['stage', 'hazard', 'dates', 'probability', 'sure', 'action'];

/**
 * What is wrong with the page loaded in `page` at its viewport: wider than the screen (horizontal scrolling), broken
 * images, and for a team bulletin (`firstScreen`) a first-screen element missing, unless listed in `mayLack`, or
 * ending below the fold.
 */
export async function layoutProblems(page: Page, name: string, firstScreen: { mayLack: readonly string[] } | null): Promise<string[]> {
  const viewport = page.viewportSize()!;
  const problems: string[] = [];
  const width = await page.evaluate(() => document.documentElement.scrollWidth);
  if (width > viewport.width) problems.push(`${name}: scrollWidth ${width} > ${viewport.width}`);
  const broken = await page.$$eval('img', (imgs) => imgs.filter((i) => !(i.complete && i.naturalWidth > 0)).length);
  if (broken > 0) problems.push(`${name}: ${broken} broken image(s)`);
  if (!firstScreen) return problems;
  for (const role of FIRST_SCREEN) {
    const el = await page.$(`[data-role~="${role}"]`);
    const box = el ? await el.boundingBox() : null;
    if (!box) {
      if (!firstScreen.mayLack.includes(role)) problems.push(`${name}: no ${role}`);
    } else if (box.y + box.height > viewport.height)
      problems.push(`${name}: ${role} ends at ${Math.round(box.y + box.height)} px, below ${viewport.height}`);
  }
  return problems;
}
