// The technical note states how each region value was formed (issue 17, "state the choice in bulletins' technical
// note"): area mean, population mean, share of the area above a level and share of the people above a level, in the
// HTML and text parts and in the printed PDF (read back with poppler's pdftotext), in English and French.
// Two renders of the sample run: (a) tmax-3day = share of the area above 35 °C, malaria-pf = population mean;
// (b) tmax-3day = share of the people above 35 °C, malaria-pf = area mean (the default), HTML and text only.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Config, RegionValueConfig } from '../../src/config/types.ts';
import { renderBulletins, type RenderedRun } from '../../src/render/render-bulletins.ts';
import type { Bulletin } from '../../src/bulletin-types.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const dir = mkdtempSync(join(tmpdir(), 'forelight-region-note-'));

function configWith(tmax: RegionValueConfig, malaria: RegionValueConfig, chromium: string | null): Config {
  const c = sampleConfig();
  const regionValue = (id: string) => (id === 'tmax-3day' ? tmax : malaria);
  return {
    ...c,
    population: { file: '/data/veloria-people.tif', values: 'people-per-pixel' },
    indicators: c.indicators.map((i) => ({ ...i, regionValue: regionValue(i.id) })),
    delivery: { ...c.delivery, pdfChromium: chromium },
  };
}

/** Spaces of any width as one plain space, so wording is compared whatever the typography or line wrapping. */
const flat = (s: string) => s.replace(/[\s\u00a0\u2009\u202f]+/g, ' ');
const html = (b: Bulletin) =>
  flat(
    b.html
      .replace(/<[^>]+>/g, ' ')
      .replaceAll('&#39;', "'")
      .replaceAll('&quot;', '"'),
  );
function pdfText(b: Bulletin): string {
  const pdf = b.attachments.find((a) => a.contentType === 'application/pdf');
  expect(pdf, `${b.team} has a PDF`).toBeDefined();
  const file = join(dir, pdf!.filename);
  writeFileSync(file, pdf!.content);
  return flat(spawnSync('pdftotext', [file, '-'], { encoding: 'utf8' }).stdout);
}

const PHRASES = {
  shareArea: {
    en: /its value is the percentage of the region's area where it is above 35 ?°C/,
    fr: /sa valeur est le pourcentage de la surface de la région où il dépasse 35 ?°C/,
  },
  sharePeople: {
    en: /its value is the percentage of the region's people \(population raster veloria-people\.tif\) where it is above 35 ?°C/,
    fr: /sa valeur est le pourcentage de la population de la région \(grille de population veloria-people\.tif\) où il dépasse 35 ?°C/,
  },
  peopleMean: {
    en: /weighted by the people living in the part it shares with the region \(population raster veloria-people\.tif\)/,
    fr: /pondérées par la population qui vit dans la partie commune \(grille de population veloria-people\.tif\)/,
  },
  areaMean: {
    en: /each weighted by the area it shares with the region/,
    fr: /pondérées par la surface commune/,
  },
} as const;

let shares: RenderedRun;
let means: RenderedRun;
beforeAll(async () => {
  shares = await renderBulletins(
    configWith({ weights: 'area', shareAbove: 35 }, { weights: 'population' }, '/usr/bin/chromium'),
    sampleRun(),
  );
  means = await renderBulletins(configWith({ weights: 'population', shareAbove: 35 }, { weights: 'area' }, null), sampleRun());
}, 180_000);

const team = (run: RenderedRun, id: string) => run.bulletins.find((b) => b.team === id)!;

describe('technical note: how region values are formed (en: kessan-health, fr: tulva-health)', () => {
  it.each([
    ['en', 'kessan-health'],
    ['fr', 'tulva-health'],
  ] as const)('%s: share of the area above a level and population mean, in HTML, text and PDF', (locale, id) => {
    const b = team(shares, id);
    expect(b.locale).toBe(locale);
    for (const [part, text] of [
      ['html', html(b)],
      ['text', flat(b.text)],
      ['pdf', pdfText(b)],
    ])
      for (const phrase of [PHRASES.shareArea[locale], PHRASES.peopleMean[locale]]) expect(text, `${part}: ${phrase}`).toMatch(phrase);
  });

  it.each([
    ['en', 'kessan-health'],
    ['fr', 'tulva-health'],
  ] as const)('%s: share of the people above a level and area mean, in HTML and text; never the other choice', (locale, id) => {
    const b = team(means, id);
    for (const [part, text] of [
      ['html', html(b)],
      ['text', flat(b.text)],
    ]) {
      expect(text, part).toMatch(PHRASES.sharePeople[locale]);
      expect(text, part).toMatch(PHRASES.areaMean[locale]);
      expect(text, part).not.toMatch(PHRASES.shareArea[locale]);
      expect(text, part).not.toMatch(PHRASES.peopleMean[locale]);
    }
  });

  it('the national PDF states each choice once, not once per region', () => {
    const text = pdfText(team(shares, 'national-desk'));
    expect(text.match(new RegExp(PHRASES.shareArea.en.source, 'g'))).toHaveLength(1);
    expect(text.match(new RegExp(PHRASES.peopleMean.en.source, 'g'))).toHaveLength(1);
  });
});
