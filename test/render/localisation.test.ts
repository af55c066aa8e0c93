// Localisation: one catalogue per language with the same keys, every key the code and templates use present,
// no English left in a French rendering (e-mail, plain text, national summary, archive page, CAP), and French
// typography (no-break space before : ; ! ? %, Imprimerie nationale 2002, "Lexique des règles typographiques").
import { mkdtempSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadCatalogue, missingKeys, SHIPPED_MESSAGES } from '../../src/render/catalogue.ts';
import { renderBulletins, type RenderedRun } from '../../src/render/render-bulletins.ts';
import { SHIPPED_TEMPLATES } from '../../src/render/template-env.ts';
import { frenchSpacingFaults } from '../../src/render/typography.ts';
import { sampleConfig } from './fixtures/sample-config.ts';
import { sampleRun } from './fixtures/sample-run.ts';

const catalogue = loadCatalogue();
const locales = readdirSync(SHIPPED_MESSAGES)
  .filter((f) => f.endsWith('.yaml'))
  .map((f) => f.slice(0, -5));

/** English words that never belong in French prose (common practice, no source: a stop-word list). */
const ENGLISH =
  /\b(the|and|of|with|for|above|below|normal year|threshold|forecast|days?|weeks?|months?|skill|hindcasts?|issued|next|stage|percentile|based|run|what|team|should|heat|malaria|outlook|Republic|past|cases|unlikely|likely)\b/i;

/** Visible text of an HTML document: tags dropped, entities decoded. */
function visibleText(html: string): string {
  return html
    .replace(/<(style|script)[\s\S]*?<\/\1>/g, ' ')
    .replace(/<[^>]+>/g, ' ')
    .replace(/&#39;/g, "'")
    .replace(/&quot;/g, '"')
    .replace(/&amp;/g, '&')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>');
}

/** Names that stay as written in every language (proper names from the YAML, file names, the product). */
function withoutNames(text: string): string {
  return text.replace(/Tulva Delta|Kessan Lowlands|Marrow Highlands|Orrin Coast|run\.json|Forelight|\b2026-11-30-a\b/g, '');
}

function englishIn(text: string): string[] {
  return withoutNames(text)
    .split(/(?<=[.!?])\s+|\n/)
    .filter((sentence) => ENGLISH.test(sentence));
}

describe('message catalogues', () => {
  it('shipped languages are en and fr, with exactly the same keys', () => {
    expect(locales.sort()).toEqual(['en', 'fr']);
    for (const l of locales) {
      expect(missingKeys(catalogue, l, 'en'), `${l} lacks`).toEqual([]);
      expect(missingKeys(catalogue, 'en', l), `en lacks`).toEqual([]);
    }
  });

  it('every key the templates and the render code name exists in every catalogue, and every message parses', () => {
    const sources = [
      ...readdirSync(SHIPPED_TEMPLATES)
        .filter((f) => f.endsWith('.njk'))
        .map((f) => readFileSync(join(SHIPPED_TEMPLATES, f), 'utf8')),
      ...readdirSync(new URL('../../src/render/', import.meta.url))
        .filter((f) => f.endsWith('.ts'))
        .map((f) => readFileSync(new URL(`../../src/render/${f}`, import.meta.url), 'utf8')),
    ];
    const used = new Set(sources.flatMap((s) => [...s.matchAll(/\bt\('([a-z][\w-]*\.[\w.-]*\w)'/g)].map((m) => m[1])));
    expect(used.size).toBeGreaterThan(40);
    for (const l of locales) {
      const have = new Set(catalogue.keys(l));
      expect(
        [...used].filter((k) => !have.has(k)),
        l,
      ).toEqual([]);
      for (const k of catalogue.keys(l))
        expect(() => catalogue.forLocale(l)(k, { days: 3, count: 2, cases: 20 }), `${l} ${k}`).not.toThrow();
    }
  });

  it('a language with a missing key is reported, and rendering with it fails naming the key', () => {
    const dir = mkdtempSync(join(tmpdir(), 'forelight-msg-'));
    mkdirSync(join(dir, 'messages'));
    writeFileSync(join(dir, 'messages', 'xx.yaml'), 'title.team: "{country}"\n');
    const c = loadCatalogue(dir);
    expect(missingKeys(c, 'xx')).toContain('first.action');
    expect(() => c.forLocale('xx')('first.action')).toThrow(/message "first.action" is missing from the xx catalogue/);
    expect(() => loadCatalogue().forLocale('pt')).toThrow(/no message catalogue for locale "pt"/);
  });
});

describe('a French rendering has no English and French typography', () => {
  let fr: RenderedRun;
  beforeAll(async () => {
    const cfg = sampleConfig();
    // Every team in French, the national desk too, so the national summary and the archive are French as well.
    fr = await renderBulletins(
      {
        ...cfg,
        teams: cfg.teams.map((t) => ({ ...t, locale: 'fr', name: t.national ? 'Bureau national climat et santé' : 'Équipe sanitaire' })),
      },
      sampleRun(),
    );
  });

  it('the English detector itself flags English (so the next test can fail)', () => {
    expect(englishIn('Seuil : 33 °C. Threshold: 33 °C.')).toEqual(['Threshold: 33 °C.']);
  });

  it('e-mails (HTML and text), the archive page and the CAP French info blocks', () => {
    const texts: [string, string][] = fr.bulletins.flatMap(
      (b) =>
        [
          [`${b.team} text`, b.text],
          [`${b.team} html`, visibleText(b.html)],
          [`${b.team} subject`, b.subject],
        ] as [string, string][],
    );
    texts.push(['archive', visibleText(fr.archive.bodyHtml)]);
    for (const a of fr.capAlerts) {
      for (const info of a.xml.match(/<info><language>fr<\/language>[\s\S]*?<\/info>/g) ?? []) {
        const fields = [...info.matchAll(/<(event|headline|description|instruction|audience|senderName)>([^<]*)</g)]
          .map((m) => m[2])
          .join('\n');
        texts.push([`cap ${a.id}`, fields]);
      }
    }
    expect(texts.length).toBeGreaterThan(15);
    for (const [where, text] of texts) expect(englishIn(text), where).toEqual([]);
  });

  it('no-break spaces before : ; ! ? % everywhere in French', () => {
    for (const b of fr.bulletins) {
      expect(frenchSpacingFaults(b.text), b.team).toEqual([]);
      expect(frenchSpacingFaults(visibleText(b.html)), b.team).toEqual([]);
      expect(frenchSpacingFaults(b.subject), b.team).toEqual([]);
    }
    expect(frenchSpacingFaults(visibleText(fr.archive.bodyHtml))).toEqual([]);
  });

  it('the checker catches a plain space before a colon and a missing one before a semicolon', () => {
    const faults = frenchSpacingFaults('Seuil : 33 °C; fin');
    expect(faults).toHaveLength(2);
    expect(faults[1]).toMatch(/°C;$/);
  });

  it('French grammar of the fixed sentences: articles and agreement (from the catalogue, checked by hand against usage)', () => {
    const t = loadCatalogue().forLocale('fr');
    expect(t('header.for', { team: 'Équipe sanitaire du delta de Tulva' })).toBe('Destinataire\u00a0: Équipe sanitaire du delta de Tulva');
    expect(t('cautions.short', { count: 1 })).toContain('la précaution');
    expect(t('cautions.short', { count: 5 })).toContain('les 5\u00a0précautions'.replace('\u00a0', ' '));
    expect(t('header.issued', { issued: '30 nov. 2026', next: '3 déc. 2026' })).toBe(
      'Émis le 30 nov. 2026 · prochain bulletin le 3 déc. 2026',
    );
  });
});
