/** Debian's Chromium (/usr/bin/chromium) headless through playwright-core, as the layout tests open pages with it. */
import { chromium, type Browser } from 'playwright-core';

export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-dev-shm-usage',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--no-first-run',
    ],
  });
}
