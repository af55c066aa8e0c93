// Wording helpers: probability words, stage views, contrast of badge text, header/XML escaping.
import { describe, expect, it } from 'vitest';
import { ForelightError } from '../../src/core/errors.ts';
import { MAX_SUBJECT_CHARS, capHeaderText, escapeXml, toHeaderText, toXmlChars } from '../../src/render/safe-text.ts';
import { probabilityWord, sureLevel, sureSentence } from '../../src/render/view-model.ts';
import { formatThreshold } from '../../src/render/locale-format.ts';
import { inkFor, toStageView } from '../../src/render/stage-view.ts';
import { loadCatalogue } from '../../src/render/catalogue.ts';
import { skillSummary } from '../support/skill-summary.ts';
import { sampleConfig, sampleStages } from './fixtures/sample-config.ts';

describe('probabilityWord (config.probabilityWords, first band with p < below)', () => {
  const cfg = sampleConfig();
  it.each([
    [0, 'very unlikely'],
    [0.1, 'unlikely'],
    [0.5, 'about an even chance'],
    [0.65, 'likely'],
    [1, 'very likely'],
  ])('p=%s → %s', (p, word) => {
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

describe('how sure: wording from the skill gate figures only', () => {
  const t = loadCatalogue().forLocale('en');
  const lead = (s: ReturnType<typeof skillSummary>) => {
    const level = sureLevel(s);
    const pooled = s.basis === 'observed';
    return {
      sure: level,
      potential: !pooled,
      years: pooled ? s.gate.years : s.years,
      events: pooled ? s.gate.events : s.events,
      score: '0.25',
      low: pooled ? '0.10' : '',
      high: pooled ? '0.40' : '',
    };
  };
  it('a passed gate says "better than a normal-year guess" with the years, interval and events', () => {
    expect(sureLevel(skillSummary(0.1))).toBe('medium'); // pooled fair BSS 0.25
    expect(sureSentence(t, lead(skillSummary(0.1)))).toBe(
      'Moderately sure: at this range, past forecasts did better than a normal-year guess over 20 past years (skill score 0.25, 90 % range 0.10 to 0.40; 12 events).',
    );
  });
  it('an interval reaching 0, too few events, or a perfect-model estimate never claims skill', () => {
    expect(sureSentence(t, lead(skillSummary(-0.05)))).toMatch(
      /^Not sure at all: at this range, past forecasts were not shown to do better/,
    );
    expect(sureSentence(t, lead(skillSummary(0.3, { events: 3 })))).toBe(
      'Not sure at all: too few past events to judge this range (3 in 20 past years). Treat as normal conditions.',
    );
    const potential = sureSentence(t, lead(skillSummary(0.5, { basis: 'potential' })));
    expect(potential).toMatch(/^Not sure at all: .* it cannot raise the stage\.$/);
    expect(potential).not.toMatch(/did better|Fairly|Moderately/);
  });
});
