/** Seasonal categories in words: the skill sentence follows the 90 % interval of the debiased RPSS only. */
import { describe, expect, it } from 'vitest';
import { loadCatalogue } from '../../src/render/catalogue.ts';
import { tercileLines, tercileVerdict } from '../../src/render/tercile-words.ts';
import type { LeadProbability, TercileOutlook } from '../../src/probability-types.ts';

const outlook = (low: number, high: number, period: 'month' | 'season' = 'month'): TercileOutlook => ({
  period,
  months: period === 'month' ? [1, 1] : [1, 3],
  start: '2026-12-01',
  end: period === 'month' ? '2026-12-31' : '2027-02-28',
  below: 0.2,
  near: 0.3,
  above: 0.5,
  members: 50,
  edges: { lower: 27, upper: 28 },
  skill: Number.isNaN(low) ? null : { years: 20, rpss: 0.1, rpssDebiased: 0.12, low, high },
});

describe('tercile words', () => {
  it('better only with the whole interval above 0; worse below 0; else unproven; unchecked without observations', () => {
    expect(tercileVerdict(outlook(0.01, 0.3))).toBe('better');
    expect(tercileVerdict(outlook(-0.05, 0.3))).toBe('unproven');
    expect(tercileVerdict(outlook(-0.3, -0.01))).toBe('worse');
    expect(tercileVerdict(outlook(NaN, NaN))).toBe('unchecked');
  });
  it('months then seasons, in en and fr', () => {
    const probs = [{ terciles: { month: outlook(-0.05, 0.3), season: outlook(0.02, 0.4, 'season') } } as unknown as LeadProbability];
    const en = tercileLines(loadCatalogue().forLocale('en'), 'en', probs);
    expect(en[0]).toMatch(
      /^Month 1 \(1\s–\s31 Dec\): 20% chance below normal, 30% near normal, 50% above normal \(thirds of the past years each\); /,
    );
    expect(en[0]).toContain(
      'past outlooks were not shown to do better than a normal-year guess over 20 past years (ranked probability skill 0.12, 90 % range -0.05 to 0.30).',
    );
    expect(en[1]).toMatch(/^Months 1–3 \(1 Dec 2026\s–\s28 Feb 2027\)/);
    expect(en[1]).toContain('did better than a normal-year guess in most of 20 past years');
    const fr = tercileLines(loadCatalogue().forLocale('fr'), 'fr', probs);
    expect(fr[0]).toMatch(/20\s%\sde probabilité en dessous de la normale/);
  });
});
