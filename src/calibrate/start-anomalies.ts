/**
 * Days and weeks tiers: hindcast starts within ±window-days of the forecast's day of year see different points of
 * the seasonal cycle (a start two weeks earlier is cooler at every lead in the warming season); pooling their raw
 * values would widen the climate and shift it towards the mean start. Instead each value becomes an anomaly from
 * its own start's model climate and is added back at the forecast's start:
 *
 *   x' = x − c_s(l) + ĉ(l),
 *
 * c_s(l) = mean over years × members of start s at lead l (its own lead-dependent climate, so model drift with
 * lead is kept), ĉ(l) = a(l) of the least-squares line c_s(l) ≈ a(l) + b(l)·δ_s over the starts, δ_s = days from
 * the forecast's lead day 1 to start s's (circular over the year end), i.e. the starts' climates smoothed over
 * start dates and read at the forecast's own date. With one start there is nothing to pool across and the values
 * are kept. Only the mean moves: a seasonal change of spread between starts is not adjusted. Common practice, no
 * single source: lead-dependent model climates from hindcasts around the forecast date, anomalies pooled
 * (method name here: "start-anomaly pooling"). Observations get the same treatment from their own climates.
 */
import type { IsoDate } from '../types.ts';
import type { LeadValues } from './lead-tiers.ts';

const DAY_MS = 86_400_000;

/** Days from `from` to `to` by day of year, circular: in (−183, 183]; the year is ignored. */
function dayOfYearOffset(from: IsoDate, to: IsoDate): number {
  const doy = (d: IsoDate) => (Date.UTC(2001, Number(d.slice(5, 7)) - 1, Number(d.slice(8, 10))) - Date.UTC(2001, 0, 1)) / DAY_MS;
  const d = (((doy(to) - doy(from)) % 365) + 365) % 365;
  return d > 182 ? d - 365 : d;
}

const leadOne = (leads: LeadValues): IsoDate | undefined => leads.leads[0]?.start;

/** Least-squares line through (x, y); its value at x = 0 (the mean when the x are all equal). */
function interceptAtZero(x: readonly number[], y: readonly number[]): number {
  const n = x.length;
  const mx = x.reduce((a, b) => a + b, 0) / n;
  const my = y.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (x[i] - mx) ** 2;
    sxy += (x[i] - mx) * (y[i] - my);
  }
  return sxx === 0 ? my : my - (sxy / sxx) * mx;
}

/** Mean of the valid values of the entries at lead l (all members), NaN without any. */
function leadMean(entries: readonly { leads: LeadValues }[], l: number): number {
  let sum = 0;
  let n = 0;
  for (const { leads } of entries) {
    const nl = leads.leads.length;
    if (l >= nl) continue;
    for (let m = 0; m < leads.members; m++) {
      const x = leads.values[m * nl + l];
      if (!Number.isNaN(x)) ((sum += x), n++);
    }
  }
  return n === 0 ? Number.NaN : sum / n;
}

/**
 * The entries with every value moved from its start's model climate to the forecast's start (see the module
 * comment); `forecastLeadOne` is the forecast's lead day 1. Entries are grouped by the month-day of their lead
 * day 1; unchanged when there is one group or no forecast date.
 */
export function atForecastStart<T extends { readonly leads: LeadValues }>(entries: readonly T[], forecastLeadOne: IsoDate | null): T[] {
  const groups = new Map<string, T[]>();
  for (const e of entries) {
    const key = leadOne(e.leads)?.slice(5) ?? '';
    groups.set(key, [...(groups.get(key) ?? []), e]);
  }
  if (forecastLeadOne === null || groups.size <= 1 || groups.has('')) return [...entries];
  const starts = [...groups.entries()].map(([md, g]) => ({ g, offset: dayOfYearOffset(forecastLeadOne, `2001-${md}`) }));
  const nLeads = Math.max(...entries.map((e) => e.leads.leads.length));
  const shift = new Map<T[], Float64Array>(starts.map(({ g }) => [g, new Float64Array(nLeads)]));
  for (let l = 0; l < nLeads; l++) {
    const own = starts.map(({ g, offset }) => ({ g, offset, mean: leadMean(g, l) })).filter((s) => Number.isFinite(s.mean));
    if (own.length === 0) continue;
    const at = interceptAtZero(
      own.map((s) => s.offset),
      own.map((s) => s.mean),
    );
    for (const s of own) (shift.get(s.g) as Float64Array)[l] = at - s.mean;
  }
  const byEntry = new Map<T, Float64Array>();
  for (const [, g] of groups) for (const e of g) byEntry.set(e, shift.get(g) as Float64Array);
  return entries.map((e) => {
    const s = byEntry.get(e) as Float64Array;
    const nl = e.leads.leads.length;
    const values = e.leads.values.map((x, i) => x + s[i % nl]);
    return { ...e, leads: { ...e.leads, values } };
  });
}
