// Wording helpers: probability words, stage views, contrast of badge text, header/XML escaping.
import { describe, expect, it } from 'vitest';
import { ForelightError } from '../../src/core/errors.ts';
import { MAX_SUBJECT_CHARS, capHeaderText, escapeXml, toHeaderText, toXmlChars } from '../../src/render/safe-text.ts';
import { formatThreshold, inkFor, probabilityWord, toStageView } from '../../src/render/view-model.ts';
import { sampleConfig, sampleStages } from './fixtures/sample-config.ts';

describe('probabilityWord (config.probabilityWords, first band with p < below)', () => {
  const cfg = sampleConfig();
  it.each([[0, 'very unlikely'], [0.1, 'unlikely'], [0.5, 'about an even chance'], [0.65, 'likely'], [1, 'very likely']])('p=%s → %s', (p, word) => {
    expect(probabilityWord(cfg, p, 'en')).toBe(word);
  });
  it('NaN gets a dash, never the top word', () => {
    expect(probabilityWord(cfg, Number.NaN, 'en')).toBe('–');
  });
});

describe('toStageView', () => {
  it('team actions override the default only in the locales they give', () => {
    const mindful = sampleStages[1];
    expect(toStageView(mindful, 1, 'fr', 'tulva-health').actions).toMatch(/^Revoir les plans, vérifier les stocks de moustiquaires/);
    expect(toStageView(mindful, 1, 'en', 'tulva-health').actions).toMatch(/^Review the heat and malaria plans/);
  });
  it('a missing translation is a one-line render error naming the stage and locale', () => {
    expect(() => toStageView(sampleStages[0], 0, 'pt', 'default')).toThrow(ForelightError);
    expect(() => toStageView(sampleStages[0], 0, 'pt', 'default')).toThrow(/^stage "quiet" label has no text for locale "pt"/);
  });
});

describe('inkFor (WCAG 2.1 relative luminance, contrast ratio definition)', () => {
  it('dark text on the light ladder colours, white on the dark ones', () => {
    expect(sampleStages.map((s) => inkFor(s.colour))).toEqual(['#000000', '#000000', '#ffffff', '#ffffff']);
  });
});

describe('escaping', () => {
  it('header text loses CR, LF, other controls and Unicode line separators', () => {
    expect(toHeaderText('A\r\nBcc: x@y\u0000\u2028 B\t C')).toBe('A Bcc: x@y B C');
  });
  it('subject lines are capped (RFC 5322 §2.1.1: 998 characters at most, 78 recommended) at a "; " boundary, with "…"', () => {
    const regions = Array.from({ length: 30 }, (_, i) => `Region number ${i + 1}: Brace ◑`).join('; ');
    const capped = capHeaderText(`Veloria outlook — ${regions}`);
    expect([...capped].length).toBeLessThanOrEqual(MAX_SUBJECT_CHARS);
    expect(capped).toMatch(/Brace ◑ …$/);
    expect(capHeaderText('short subject')).toBe('short subject');
  });
  it('XML text escapes specials and drops characters XML 1.0 forbids', () => {
    expect(escapeXml(`<a href="x">&'`)).toBe('&lt;a href=&quot;x&quot;&gt;&amp;&apos;');
    expect(toXmlChars('a\u0001b\u000bc\td')).toBe('abc\td');
  });
  it('thresholds print with the unit symbol', () => {
    expect(formatThreshold('en', 39, 'degC')).toBe('39\u00a0°C');
    expect(formatThreshold('fr', 0.5, '1')).toBe('0,5');
  });
});
