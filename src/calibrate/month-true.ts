/**
 * Month-true pooling for the months tier. Hindcast starts within ±window-days of the forecast's day of year can
 * begin their month leads in different calendar months (a start on 12 Nov has month 1 = December, one on 9 Dec has
 * month 1 = January); stacking them by lead position would pool December with January. Only the starts whose month 1
 * is the calendar month most starts share are kept (the largest group by distinct years; on a tie the earlier
 * month of the year, December before January across the year end being the earlier lead of the season). When the
 * kept starts would number fewer distinct years than `minYears`, the mixing cannot be avoided: every start is
 * pooled and a `climate-mixed-months` diagnostic says so. Common practice (no source): seasonal hindcasts are
 * verified by target month.
 */
import { diagnostic, type Diagnostic, type Place } from '../core/diagnostics.ts';
import type { LeadValues } from './lead-tiers.ts';

/** Calendar month ("MM") of an entry's month 1, or '' when it has no month lead. */
const firstMonth = (leads: LeadValues): string => leads.leads[0]?.start.slice(5, 7) ?? '';

const yearsOf = (entries: readonly { year: number }[]): number => new Set(entries.map((e) => e.year)).size;

/** Starts of the months tier whose month leads are the same calendar months (see the module comment). */
export function sameLeadMonths<T extends { readonly year: number; readonly leads: LeadValues }>(
  what: string,
  entries: readonly T[],
  minYears: number,
  place: Place = {},
): { kept: T[]; problems: Diagnostic[] } {
  const groups = new Map<string, T[]>();
  for (const e of entries) groups.set(firstMonth(e.leads), [...(groups.get(firstMonth(e.leads)) ?? []), e]);
  if (groups.size <= 1) return { kept: [...entries], problems: [] };
  const ranked = [...groups.entries()].sort((a, b) => yearsOf(b[1]) - yearsOf(a[1]) || seasonOrder(a[0], b[0]));
  const [month, kept] = ranked[0];
  const others = ranked
    .slice(1)
    .map(([m, g]) => `${g.length} with month 1 = ${monthName(m)}`)
    .join(', ');
  if (yearsOf(kept) >= minYears) return { kept, problems: [] };
  return {
    kept: [...entries],
    problems: [
      diagnostic(
        'climate-mixed-months',
        `${what}: hindcast starts begin their month leads in different calendar months (${kept.length} with month 1 = ` +
          `${monthName(month)}, ${others}); the ${yearsOf(kept)} years of the largest group are fewer than min-hindcast-years ` +
          `${minYears}, so every start is pooled and each month lead mixes calendar months`,
        'provide hindcast starts on the same day of the month as the forecast, or narrow calibration.window-days',
        place,
      ),
    ],
  };
}

const NAMES = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];
const monthName = (mm: string): string => NAMES[Number(mm) - 1] ?? 'none';

/** Earlier lead of the season first: months compared on the circle, the one less than 6 months before the other. */
function seasonOrder(a: string, b: string): number {
  const d = (Number(b) - Number(a) + 12) % 12;
  return d === 0 ? 0 : d < 6 ? -1 : 1;
}
