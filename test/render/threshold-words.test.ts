/** Threshold words: a malaria index as a fraction with its category, a percentile as "n of N past years" (issue finding 7). */
import { describe, expect, it } from 'vitest';
import { loadCatalogue } from '../../src/render/catalogue.ts';
import { formatIndex, pastYearsShare, thresholdWords } from '../../src/render/threshold-words.ts';
import type { LeadProbability } from '../../src/probability-types.ts';
import { indicator } from '../indicators/fixtures.ts';

const lead = (value: number, units: string) => ({ threshold: { value, units, origin: 'test' } }) as unknown as LeadProbability;
const catalogue = loadCatalogue();

describe('threshold words', () => {
  it('percentiles as a share of past years, smallest denominator first (our wording, no source)', () => {
    expect(pastYearsShare(90)).toEqual({ n: 9, of: 10 });
    expect(pastYearsShare(75)).toEqual({ n: 15, of: 20 });
    expect(pastYearsShare(99)).toEqual({ n: 99, of: 100 });
    expect(pastYearsShare(99.5)).toEqual({ n: 199, of: 200 });
    expect(pastYearsShare(97.3)).toEqual({ n: 973, of: 1000 });
  });

  it('an index never prints as 1 when it is below 1: 0.995 is not "suitability above 1"', () => {
    expect(formatIndex('en', 0.995)).toBe('0.995');
    expect(formatIndex('en', 0.9996)).toBe('0.999');
    expect(formatIndex('en', 0.74)).toBe('0.74');
    expect(formatIndex('en', 1)).toBe('1.00');
    expect(formatIndex('fr', 0.5)).toBe('0,50');
  });

  it('malaria: fraction 0–1 with its category word, and the percentile as past years, in en and fr', () => {
    const mal = indicator('malaria-suitability', {});
    const percentile = { kind: 'percentile', percentile: 80 } as const;
    expect(thresholdWords(catalogue.forLocale('en'), 'en', mal, percentile, lead(0.995, '1'))).toBe(
      '0.995 on a scale from 0 to 1 (suitable), higher than in 8 of 10 past years',
    );
    expect(thresholdWords(catalogue.forLocale('fr'), 'fr', mal, percentile, lead(0.6, '1'))).toBe(
      '0,60 sur une échelle de 0 à 1 (limite), plus élevé que lors de 8 années passées sur 10',
    );
    const fixed = { kind: 'absolute', value: 0.2, units: '1' } as const;
    expect(thresholdWords(catalogue.forLocale('en'), 'en', mal, fixed, lead(0.2, '1'))).toBe('0.20 on a scale from 0 to 1 (unsuitable)');
  });

  it('other indicators keep the value and unit; no threshold says so', () => {
    const hot = indicator('tmax-mean', {});
    const t = catalogue.forLocale('en');
    expect(thresholdWords(t, 'en', hot, { kind: 'percentile', percentile: 90 }, lead(34.21, 'degC'))).toBe(
      '34.2\u00a0°C, higher than in 9 of 10 past years',
    );
    expect(thresholdWords(t, 'en', hot, undefined, undefined)).toBe('no threshold available');
  });
});
