/**
 * Month-true pooling for the months tier. Hindcast starts within ±window-days of the forecast's day of year can
 * begin their month leads in different calendar months (a start on 12 Nov has month 1 = December, one on 9 Dec has
 * month 1 = January); stacking them by lead position would pool December with January. The forecast's own month 1
 * (of its indicator, after any lag) decides: only the starts whose month 1 is the same calendar month are kept, so every month lead pools the calendar
 * month the forecast speaks of. When the kept starts would number fewer distinct years than `minYears` (or none
 * share the forecast's month), the mixing cannot be avoided: every start is pooled and a `climate-mixed-months`
 * diagnostic says so. Common practice (no source): seasonal hindcasts are verified by target month.
 */
import { diagnostic, type Diagnostic, type Place } from '../core/diagnostics.ts';
import { leadMonth, type LeadValues } from './lead-tiers.ts';

/** Calendar month ("MM") of an entry's month 1 (its model month in a model calendar), or '' when it has no month lead. */
const firstMonth = (leads: LeadValues): string => (leads.leads[0] ? leadMonth(leads.leads[0]) : '');

const yearsOf = (entries: readonly { year: number }[]): number => new Set(entries.map((e) => e.year)).size;

/**
 * Starts of the months tier whose month leads are the forecast's calendar months (see the module comment);
 * `forecastMonth` is the calendar month ("MM") of the forecast's month 1, '' when the forecast has no month lead.
 */
export function sameLeadMonths<T extends { readonly year: number; readonly leads: LeadValues }>(
  what: string,
  entries: readonly T[],
  forecastMonth: string,
  minYears: number,
  place: Place = {},
): { kept: T[]; problems: Diagnostic[] } {
  const groups = new Map<string, T[]>();
  for (const e of entries) groups.set(firstMonth(e.leads), [...(groups.get(firstMonth(e.leads)) ?? []), e]);
  const kept = groups.get(forecastMonth) ?? [];
  if (kept.length === entries.length || (kept.length > 0 && yearsOf(kept) >= minYears)) return { kept, problems: [] };
  const counts = [...groups.entries()]
    .sort((a, b) => b[1].length - a[1].length || a[0].localeCompare(b[0]))
    .map(([m, g]) => `${g.length} with month 1 = ${monthName(m)}`)
    .join(', ');
  return {
    kept: [...entries],
    problems: [
      diagnostic(
        'climate-mixed-months',
        `${what}: ${forecastMonth ? `the forecast's month 1 is ${monthName(forecastMonth)}` : 'the forecast has no month lead'} ` +
          `but the hindcast starts begin their month leads in other calendar months too (${counts}); ${yearsOf(kept)} years share the forecast's month 1, ` +
          `fewer than min-hindcast-years ${minYears}, so every start is pooled and each month lead mixes calendar months`,
        'provide hindcast starts on the same day of the month as the forecast, or narrow calibration.window-days',
        place,
      ),
    ],
  };
}

const NAMES = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];
const monthName = (mm: string): string => NAMES[Number(mm) - 1] ?? 'none';
