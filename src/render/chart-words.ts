/** Localised words a chart needs, from the message catalogue. */
import type { Tier } from '../types.ts';
import type { Translate } from './catalogue.ts';
import type { ChartWords } from './charts.ts';
import { formatPercent, toIntlLocale } from './locale-format.ts';

export function chartWords(t: Translate, locale: string, hazard: (indicator: string) => string): ChartWords {
  const tag = toIntlLocale(locale);
  const monthFmt = new Intl.DateTimeFormat(tag, { month: 'short', timeZone: 'UTC' });
  const dayFmt = new Intl.DateTimeFormat(tag, { day: 'numeric', month: 'short', timeZone: 'UTC' });
  return {
    hazard,
    title: (region, hazard) => t('chart.title', { region, hazard }),
    description: (region, hazard, panels) => t('chart.alt', {
      region, hazard,
      panels: panels.map((p) => t('chart.panel', { range: p.title, values: p.points.map((pt) => `${pt.tick}: ${formatPercent(locale, pt.probability)}`).join(', ') })).join(' '),
    }),
    tier: (tier: Tier) => t(`tier.${tier}`),
    tick: (tier, _index, start) => {
      const d = new Date(`${start}T00:00:00Z`);
      return tier === 'days' ? dayFmt.format(d) : tier === 'weeks' ? dayFmt.format(d) : monthFmt.format(d);
    },
    yLabel: t('chart.yLabel'),
    legend: { chance: t('chart.legendChance'), normal: t('chart.legendNormal'), noSkill: t('chart.legendNoSkill') },
  };
}
