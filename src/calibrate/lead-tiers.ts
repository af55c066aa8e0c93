/**
 * Lead windows per tier and aggregation of daily indicator values to them.
 *
 * Rules (Forelight's own, stated in bulletins and the skill report):
 * - `days`: lead day k is the k-th local day of the series (day 1 = first day after the issue time).
 * - `weeks`: aligned to the issue date, week k = lead days 7(k-1)+1 .. 7k; at most 6 weeks by default.
 * - `months`: calendar months, as seasonal bulletins speak of them ("December"). Month 1 is the first calendar
 *   month whose 1st day is a lead day (issued 2026-11-26 → month 1 = December 2026). The partial month holding
 *   the issue date is not a month lead (the day and week tiers speak for it); a month is a lead only when the
 *   series covers its last day. Daily data of a model calendar (`modelCalendar`, src/read/DECISIONS.md §3) takes
 *   the model's months (a 360_day month is 30 model days), each lead shown by its real first and last days and
 *   named by its model month (`LeadWindow.modelMonth`).
 * A member's value for a lead is NaN when fewer than MIN_VALID_FRACTION of the window's days are valid
 * (mean, max) — common practice, no source — and for `sum` (counts of days) when any day is missing, because a
 * count with a missing day understates.
 */
import { ForelightError } from '../core/errors.ts';
import { daysInCalendarMonth } from '../core/calendar-days.ts';
import type { IndicatorSeries, IsoDate, LeadWindow, ModelDays, Tier } from '../types.ts';

export const MIN_VALID_FRACTION = 0.75;
export const DEFAULT_MAX_LEADS: Readonly<Record<Tier, number>> = { days: Infinity, weeks: 6, months: Infinity };

const DAY_MS = 86_400_000;

function dayNumber(day: IsoDate): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day);
  if (!m)
    throw new ForelightError(
      'calibrate',
      'lead-date',
      `local day "${day}" is not YYYY-MM-DD`,
      'pass IsoDate strings from the indicators stage',
    );
  return Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])) / DAY_MS;
}

/** A lead window and the half-open range [from, to) of day positions in the series it covers. */
export interface LeadSpan {
  readonly lead: LeadWindow;
  readonly from: number;
  readonly to: number;
}

/** Month spans [from, to) over the model dates of consecutive days: whole model months only. */
function modelMonthSpans(model: ModelDays): { from: number; to: number; month: string }[] {
  const spans: { from: number; to: number; month: string }[] = [];
  let from = model.days.findIndex((d) => d.endsWith('-01'));
  while (from >= 0 && from < model.days.length) {
    const [y, m] = model.days[from].split('-').map(Number);
    const to = from + daysInCalendarMonth(model.calendar, y, m);
    if (to > model.days.length) break;
    spans.push({ from, to, month: model.days[from].slice(0, 7) });
    from = to;
  }
  return spans;
}

/**
 * Lead windows of `tier` over consecutive local days (lead day 1 first); `modelCalendar`: the model dates of
 * those days, whose months are then the month leads. Throws on a gap in the days.
 */
export function buildLeadSpans(
  days: readonly IsoDate[],
  tier: Tier,
  maxLeads: number = DEFAULT_MAX_LEADS[tier],
  { modelCalendar }: { readonly modelCalendar?: ModelDays } = {},
): LeadSpan[] {
  const nums = days.map(dayNumber);
  for (let i = 1; i < nums.length; i++) {
    if (nums[i] !== nums[i - 1] + 1) {
      throw new ForelightError(
        'calibrate',
        'lead-days-gap',
        `local days jump from ${days[i - 1]} to ${days[i]}`,
        'the indicators stage must pass consecutive daily values (NaN for missing days)',
      );
    }
  }
  const spans: LeadSpan[] = [];
  const push = (from: number, to: number) =>
    spans.push({ lead: { tier, index: spans.length + 1, start: days[from], end: days[to - 1] }, from, to });
  if (tier === 'days') {
    for (let i = 0; i < days.length && spans.length < maxLeads; i++) push(i, i + 1);
  } else if (tier === 'weeks') {
    for (let from = 0; from + 7 <= days.length && spans.length < maxLeads; from += 7) push(from, from + 7);
  } else if (modelCalendar) {
    for (const { from, to, month } of modelMonthSpans(modelCalendar).slice(0, maxLeads))
      spans.push({ lead: { tier, index: spans.length + 1, start: days[from], end: days[to - 1], modelMonth: month }, from, to });
  } else {
    let from = days.findIndex((d) => d.endsWith('-01'));
    while (from >= 0 && from < days.length && spans.length < maxLeads) {
      const d = new Date(nums[from] * DAY_MS);
      const next = Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + 1, 1) / DAY_MS;
      const to = from + (next - nums[from]);
      if (to > days.length) break;
      push(from, to);
      from = to;
    }
  }
  return spans;
}

/** Leads of one series: values member-major [member][lead]. */
export interface LeadValues {
  readonly leads: LeadWindow[];
  readonly members: number;
  readonly values: Float64Array;
  /** Member-major [member][lead]: 1 when a day of the lead lies beyond the formula's published table. */
  readonly beyondTable?: Uint8Array;
}

/** Aggregate daily values (member-major [member][day]) to the leads of `tier` by mean, max or sum. */
export function aggregateToLeads(series: IndicatorSeries, tier: Tier, how: 'mean' | 'max' | 'sum', maxLeads?: number): LeadValues {
  const spans = buildLeadSpans(series.days, tier, maxLeads, { modelCalendar: series.modelCalendar });
  const nDays = series.days.length;
  const nLeads = spans.length;
  const values = new Float64Array(series.members * nLeads);
  for (let m = 0; m < series.members; m++) {
    const base = m * nDays;
    for (let l = 0; l < nLeads; l++) {
      const { from, to } = spans[l];
      let valid = 0;
      let acc = how === 'max' ? -Infinity : 0;
      for (let t = from; t < to; t++) {
        const x = series.data[base + t];
        if (Number.isNaN(x)) continue;
        valid++;
        acc = how === 'max' ? Math.max(acc, x) : acc + x;
      }
      const width = to - from;
      const enough = how === 'sum' ? valid === width : valid > 0 && valid >= MIN_VALID_FRACTION * width;
      values[m * nLeads + l] = !enough ? Number.NaN : how === 'mean' ? acc / valid : acc;
    }
  }
  const leads = spans.map((s) => s.lead);
  const mask = series.beyondTable;
  if (!mask) return { leads, members: series.members, values };
  const beyondTable = new Uint8Array(series.members * nLeads);
  for (let m = 0; m < series.members; m++)
    spans.forEach(
      ({ from, to }, l) => (beyondTable[m * nLeads + l] = Number(mask.subarray(m * nDays + from, m * nDays + to).some(Boolean))),
    );
  return { leads, members: series.members, values, beyondTable };
}

/** One source's leads (any objects carrying a lead window, e.g. LeadProbability) for source combination. */
export interface SourceLeads<T extends { readonly lead: LeadWindow }> {
  readonly source: string;
  /** Lower number = higher priority (SourceConfig.priority). */
  readonly priority: number;
  /** ISO 8601 UTC issue (reference) time. */
  readonly issued: string;
  readonly leads: readonly T[];
}

export const COMBINE_RULE =
  'Within each tier, sources are ranked by priority (lower number first), then by issue time (newer first); ' +
  'a lead is kept unless any of its days is already covered by a kept lead of a higher-ranked source of the same tier. ' +
  'Leads of different tiers never displace each other.';

/** Merge the leads of several sources: the higher-ranked source wins each overlap, the rule is returned as text. */
export function combineSources<T extends { readonly lead: LeadWindow }>(
  perSource: readonly SourceLeads<T>[],
): {
  kept: { source: string; item: T }[];
  dropped: { source: string; item: T; coveredBy: string }[];
  rule: string;
} {
  const ranked = [...perSource].sort((a, b) => a.priority - b.priority || Date.parse(b.issued) - Date.parse(a.issued));
  const claimed = new Map<string, string>(); // `${tier}|${day number}` → winning source
  const kept: { source: string; item: T }[] = [];
  const dropped: { source: string; item: T; coveredBy: string }[] = [];
  for (const src of ranked) {
    const claimedNow: string[] = [];
    for (const item of src.leads) {
      const first = dayNumber(item.lead.start);
      const last = dayNumber(item.lead.end);
      let coveredBy: string | undefined;
      for (let d = first; d <= last && coveredBy === undefined; d++) coveredBy = claimed.get(`${item.lead.tier}|${d}`);
      if (coveredBy !== undefined) {
        dropped.push({ source: src.source, item, coveredBy });
        continue;
      }
      kept.push({ source: src.source, item });
      for (let d = first; d <= last; d++) claimedNow.push(`${item.lead.tier}|${d}`);
    }
    for (const key of claimedNow) claimed.set(key, src.source);
  }
  return { kept, dropped, rule: COMBINE_RULE };
}

/** The month (`MM`) a month lead speaks for: its model month in a model calendar, else that of its first day. */
export function leadMonth(lead: LeadWindow): string {
  return (lead.modelMonth ?? lead.start).slice(5, 7);
}

/** "day 3", "week 2", "month 1". */
export function leadName(tier: Tier, index: number): string {
  return `${tier.slice(0, -1)} ${index}`;
}

/** "lead day 3", "lead week 2", "lead month 1". */
export function leadLabel(lead: LeadWindow): string {
  return `lead ${leadName(lead.tier, lead.index)}`;
}
