/** Localised words a chart needs, from the message catalogue. */
import type { Tier } from '../types.ts';
import type { Translate } from './catalogue.ts';
import type { ChartWords } from './chart-spec.ts';
import { formatDayRange, formatPercent } from './locale-format.ts';

export function chartWords(t: Translate, locale: string, hazard: (indicator: string) => string): ChartWords {
  return {
    hazard,
    title: (region, name) => t('chart.title', { region, hazard: name }),
    description: (region, name, panels) =>
      t('chart.alt', {
        region,
        hazard: name,
        panels: panels
          .map((p) =>
            t('chart.panel', {
              range: p.title,
              values: p.points.map((pt) => `${pt.dates}: ${formatPercent(locale, pt.probability)}`).join(', '),
            }),
          )
          .join(' '),
      }),
    tier: (tier: Tier) => t(`tier.${tier}`),
    dates: (start, end) => formatDayRange(locale, start, end),
    yLabel: t('chart.yLabel'),
    legend: {
      chance: t('chart.legendChance'),
      normal: t('chart.legendNormal'),
      line: t('chart.legendLine'),
      noSkill: t('chart.legendNoSkill'),
    },
  };
}
