/**
 * Axis ticks for the exceedance charts: d3-scale's nice linear ticks for the probability axis and d3's time
 * ticks (d3-time intervals: days, weeks, months) for the date axis, thinned until no two labels overlap at the
 * drawn width. A label names the month where the month changes (first tick, or the first tick of a new month),
 * otherwise only the day ("30 Nov 1 Dec 3 5 7 Dec" reads as dates, never as "301 2 3").
 */
import { scaleLinear, scaleUtc, type ScaleTime } from 'd3-scale';
import { toIntlLocale } from './locale-format.ts';

export interface Tick {
  readonly x: number;
  readonly label: string;
  readonly width: number;
}

/** Width of a label in DejaVu Sans at `size` px: 0.62 em per character (measured in Chromium, see the charts test). */
export function textWidth(text: string, size: number): number {
  return [...text].length * size * 0.62;
}

/** Probability ticks 0..1 (d3 nice ticks) and their labels in whole percent. */
export function probabilityTicks(locale: string, count = 5): { value: number; label: string }[] {
  const fmt = new Intl.NumberFormat(toIntlLocale(locale), { maximumFractionDigits: 0 });
  return scaleLinear()
    .domain([0, 1])
    .ticks(count)
    .map((v) => ({ value: v, label: fmt.format(v * 100) }));
}

function labelsFor(locale: string, dates: readonly Date[], monthly: boolean): string[] {
  const tag = toIntlLocale(locale);
  const dayMonth = new Intl.DateTimeFormat(tag, { day: 'numeric', month: 'short', timeZone: 'UTC' });
  const day = new Intl.DateTimeFormat(tag, { day: 'numeric', timeZone: 'UTC' });
  const month = new Intl.DateTimeFormat(tag, { month: 'short', timeZone: 'UTC' });
  const monthYear = new Intl.DateTimeFormat(tag, { month: 'short', year: 'numeric', timeZone: 'UTC' });
  return dates.map((d, i) => {
    const prev = dates[i - 1];
    if (monthly) return i === 0 || d.getUTCMonth() === 0 ? monthYear.format(d) : month.format(d);
    return !prev || prev.getUTCMonth() !== d.getUTCMonth() ? dayMonth.format(d) : day.format(d);
  });
}

/**
 * Date ticks between `start` and `end` over pixels [x0, x1]: the largest d3 tick count whose labels, `size` px
 * wide each plus a 6 px gap, neither overlap nor leave [minX, maxX] (the drawing's edges).
 */
export function dateTicks(
  locale: string,
  start: Date,
  end: Date,
  x0: number,
  x1: number,
  size: number,
  minX = x0,
  maxX = x1,
): { scale: ScaleTime<number, number>; ticks: Tick[] } {
  const scale = scaleUtc().domain([start, end]).range([x0, x1]);
  for (let count = 10; count >= 1; count--) {
    const dates = scale.ticks(count).filter((d) => d.getTime() >= start.getTime() && d.getTime() <= end.getTime());
    const labels = labelsFor(locale, dates, dates.length > 0 && dates.every((d) => d.getUTCDate() === 1));
    const ticks = dates.map((d, i) => ({ x: scale(d), label: labels[i], width: textWidth(labels[i], size) }));
    const fits = ticks.every(
      (t, i) =>
        (i === 0 || t.x - t.width / 2 >= ticks[i - 1].x + ticks[i - 1].width / 2 + 6) &&
        t.x - t.width / 2 >= minX &&
        t.x + t.width / 2 <= maxX,
    );
    if (fits) return { scale, ticks };
  }
  return { scale, ticks: [] };
}
