/**
 * Lead values of a climate sample over years: hindcasts (members > 1) or observations (members = 1), for one
 * source × region × indicator × tier. Leads are matched to a forecast's by tier and index.
 */
import type { LeadValues } from './lead-tiers.ts';
import { diagnostic, type Diagnostic, type Place } from '../core/diagnostics.ts';
import { sortValid } from '../core/percentile.ts';
import { recentredValues } from './trend-climate.ts';
import type { LeadClimate } from './lead-climate.ts';

/**
 * Stack per-year lead values (from `aggregateToLeads` of each hindcast start or observed year) into a climate
 * sample. Years whose member count differs from the first year's are left out, each with a diagnostic at
 * `place`; a year with fewer leads has NaN for the missing ones.
 */
export function stackYears(
  what: string,
  units: string,
  perYear: readonly { year: number; leads: LeadValues }[],
  place: Place = {},
): { climate: LeadClimate | null; problems: Diagnostic[] } {
  const problems: Diagnostic[] = [];
  if (perYear.length === 0) return { climate: null, problems: [diagnostic('hindcast-none', `${what}: no years given`, '', place)] };
  const members = perYear[0].leads.members;
  const used = perYear.filter((y) => {
    if (y.leads.members === members) return true;
    problems.push(
      diagnostic(
        'hindcast-members',
        `${what}: year ${y.year} has ${y.leads.members} members, year ${perYear[0].year} has ${members}; year ${y.year} left out`,
        'regenerate it with the same ensemble',
        place,
      ),
    );
    return false;
  });
  const longest = used.reduce((a, y) => (y.leads.leads.length > a.leads.leads.length ? y : a), used[0]);
  const nLeads = longest.leads.leads.length;
  const values = new Float64Array(used.length * members * nLeads).fill(Number.NaN);
  used.forEach((y, yi) => {
    const n = y.leads.leads.length;
    for (let m = 0; m < members; m++) values.set(y.leads.values.subarray(m * n, (m + 1) * n), (yi * members + m) * nLeads);
  });
  return { climate: { years: used.map((y) => y.year), members, leads: longest.leads.leads, units, values }, problems };
}

const samples = new WeakMap<LeadClimate, Map<number, Float64Array>>();

/**
 * Sorted valid values of all years × members at lead position `l`, optionally leaving out one year. A
 * trend-aware climate's values are re-centred on its issue year, or, leaving one year out, on that year with the
 * trend fitted without it (trend-climate.ts). The full sample is computed once per climate and lead (a lead's
 * probability, base rate, threshold checks and terciles each ask for it) and shared, so callers only read it; a
 * sample leaving out a year is asked for once and not kept (keeping one per year would hold the climate in memory as
 * many times as it has years).
 */
export function leadSample(c: LeadClimate, l: number, excludeYear?: number): Float64Array {
  if (excludeYear !== undefined) return sortValid(recentredValues(c, l, excludeYear));
  let byLead = samples.get(c);
  if (!byLead) samples.set(c, (byLead = new Map()));
  let sample = byLead.get(l);
  if (!sample) byLead.set(l, (sample = sortValid(recentredValues(c, l, undefined))));
  return sample;
}

/** Values of the members of one year (position y) at lead position l. */
export function yearMembers(c: LeadClimate, y: number, l: number): Float64Array {
  const out = new Float64Array(c.members);
  for (let m = 0; m < c.members; m++) out[m] = c.values[(y * c.members + m) * c.leads.length + l];
  return out;
}

/** "2006–2025" (or "2006" for a single year). */
export function yearSpan(years: readonly number[]): string {
  const lo = Math.min(...years);
  const hi = Math.max(...years);
  return lo === hi ? `${lo}` : `${lo}–${hi}`;
}

/** Number of distinct years in a climate sample (what minHindcastYears counts). */
export function distinctYears(c: LeadClimate): number {
  return new Set(c.years).size;
}

function dayOfYear(monthDay: string): number {
  const [m, d] = monthDay.split('-').map(Number);
  return (Date.UTC(2001, m - 1, d) - Date.UTC(2001, 0, 1)) / 86_400_000; // a non-leap year; 02-29 counts as 03-01
}

/**
 * The hindcast start month-days ("MM-DD") whose day of year lies within ±windowDays of the forecast start's
 * (circular over the year end, so 12-30 is 3 days from 01-02).
 */
export function startsWithinWindow(forecastStart: string, hindcastStarts: readonly string[], windowDays: number): string[] {
  const f = dayOfYear(forecastStart.slice(5, 10));
  return hindcastStarts.filter((s) => {
    const diff = Math.abs(dayOfYear(s.slice(-5)) - f);
    return Math.min(diff, 365 - diff) <= windowDays;
  });
}
