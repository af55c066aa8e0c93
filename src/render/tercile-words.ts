/**
 * Seasonal categories in words (the months tier's section): each month's and each 3-month season's chances of a
 * below-, near- and above-normal outcome (terciles of the hindcast climate, calibrate/terciles.ts) with a skill
 * sentence derived only from the 90 % interval of the debiased RPSS (Weigel et al. 2007): "did better than a
 * normal-year guess" only when the whole interval is above 0, "did worse" when it is below 0, otherwise "not
 * shown to do better". Without observations the outlook is said to be unchecked, never skilful.
 */
import type { LeadProbability, TercileOutlook } from '../probability-types.ts';
import type { Translate } from './catalogue.ts';
import { formatDayRange, formatNumber, formatPercent } from './locale-format.ts';

/** Which skill sentence an outlook gets (exported for tests). */
export function tercileVerdict(o: TercileOutlook): 'better' | 'worse' | 'unproven' | 'unchecked' {
  const s = o.skill;
  if (!s || !Number.isFinite(s.low)) return 'unchecked';
  return s.low > 0 ? 'better' : s.high < 0 ? 'worse' : 'unproven';
}

function line(t: Translate, locale: string, o: TercileOutlook): string {
  const num = (v: number | undefined) => (v !== undefined && Number.isFinite(v) ? formatNumber(locale, v, 2, 2) : '–');
  const skill = t(`tercile.${tercileVerdict(o)}`, {
    years: o.skill?.years ?? 0,
    score: num(o.skill?.rpssDebiased),
    low: num(o.skill?.low),
    high: num(o.skill?.high),
  });
  return t('tercile.line', {
    period: o.period,
    first: o.months[0],
    last: o.months[1],
    dates: formatDayRange(locale, o.start, o.end),
    below: formatPercent(locale, o.below),
    near: formatPercent(locale, o.near),
    above: formatPercent(locale, o.above),
    skill,
  });
}

/** One sentence per month, then per season, of the leads that carry tercile outlooks. */
export function tercileLines(t: Translate, locale: string, probabilities: readonly LeadProbability[]): string[] {
  const months = probabilities.flatMap((p) => (p.terciles ? [p.terciles.month] : []));
  const seasons = probabilities.flatMap((p) => (p.terciles?.season ? [p.terciles.season] : []));
  return [...months, ...seasons].map((o) => line(t, locale, o));
}
