/**
 * Trend-aware climate: a hindcast (or observed) climate whose years span a warming world is detrended per lead and
 * re-centred on the year it speaks for. At lead l the ordinary least-squares line x ≈ a + b·year is fitted to every
 * valid value (all years × members; Wilks, "Statistical Methods in the Atmospheric Sciences", 3rd ed., section
 * 7.2, simple linear regression, from memory), and each value of year y is moved along it to the target year T:
 *
 *   x' = x + b·(T − y).
 *
 * Which year is the target, and which years the line is fitted on, follow the question asked of the sample:
 * - the climate of the forecast: T = the issue year (`LeadClimate.recentreOn`), the line fitted on every year;
 * - leave-one-year-out (verification, skill, quantile mapping, terciles): T = the held-out year, the line fitted
 *   on the other years only, so the year judged never sets its own trend (no leak).
 * `leadSample` in climate.ts applies this whenever `recentreOn` is set, so thresholds, probabilities, quantile
 * mapping, terciles and skill all see one and the same re-centred climate. With fewer than two distinct years
 * the slope is 0 (nothing to fit). Common practice (e.g. removing a linear trend from hindcasts before
 * computing anomalies in seasonal forecasting), no single source for the re-centring rule itself.
 */
import type { ClimateTrend } from '../types.ts';
import type { LeadClimate } from './climate.ts';

export interface LeadTrend {
  /** b: change per year, in the climate's units. */
  readonly slope: number;
  /** a + b·year: the line's value at the target. */
  readonly intercept: number;
  /** Distinct years the line was fitted on. */
  readonly years: number;
}

/** The least-squares line through the valid (year, value) pairs at lead position l, leaving out `excludeYear`. */
export function leadTrend(c: LeadClimate, l: number, excludeYear?: number): LeadTrend {
  const nLeads = c.leads.length;
  let n = 0;
  let sx = 0;
  let sy = 0;
  const distinct = new Set<number>();
  for (let y = 0; y < c.years.length; y++) {
    if (c.years[y] === excludeYear) continue;
    for (let m = 0; m < c.members; m++) {
      const v = c.values[(y * c.members + m) * nLeads + l];
      if (Number.isNaN(v)) continue;
      n++;
      sx += c.years[y];
      sy += v;
      distinct.add(c.years[y]);
    }
  }
  if (n === 0) return { slope: 0, intercept: Number.NaN, years: 0 };
  const mx = sx / n;
  const my = sy / n;
  let sxx = 0;
  let sxy = 0;
  for (let y = 0; y < c.years.length; y++) {
    if (c.years[y] === excludeYear) continue;
    for (let m = 0; m < c.members; m++) {
      const v = c.values[(y * c.members + m) * nLeads + l];
      if (Number.isNaN(v)) continue;
      sxx += (c.years[y] - mx) ** 2;
      sxy += (c.years[y] - mx) * (v - my);
    }
  }
  const slope = distinct.size < 2 || sxx === 0 ? 0 : sxy / sxx;
  return { slope, intercept: my - slope * mx, years: distinct.size };
}

/**
 * Values at lead position l (all years × members, NaN kept, year-major), moved along the lead's trend to the
 * target year: the held-out year when `excludeYear` is given (fitted and returned without it), else
 * `c.recentreOn`. Unchanged copies when the climate is not trend-aware.
 */
export function recentredValues(c: LeadClimate, l: number, excludeYear?: number): Float64Array {
  const nLeads = c.leads.length;
  const out = new Float64Array(c.years.length * c.members).fill(Number.NaN);
  const target = c.recentreOn === undefined ? undefined : (excludeYear ?? c.recentreOn);
  const slope = target === undefined ? 0 : leadTrend(c, l, excludeYear).slope;
  for (let y = 0; y < c.years.length; y++) {
    if (c.years[y] === excludeYear) continue;
    const shift = target === undefined ? 0 : slope * (target - c.years[y]);
    for (let m = 0; m < c.members; m++) out[y * c.members + m] = c.values[(y * c.members + m) * nLeads + l] + shift;
  }
  return out;
}

function perDecade(c: LeadClimate | null, l: number): number | null {
  if (!c || l >= c.leads.length) return null;
  const t = leadTrend(c, l);
  return t.years < 2 ? null : t.slope * 10;
}

/** The trends a trend-aware hindcast climate removes at lead position l, for run.json and the bulletin; null when it is not trend-aware. */
export function climateTrendAt(hindcast: LeadClimate | null, observed: LeadClimate | null, l: number): ClimateTrend | null {
  if (!hindcast || hindcast.recentreOn === undefined) return null;
  return {
    onYear: hindcast.recentreOn,
    firstYear: Math.min(...hindcast.years),
    lastYear: Math.max(...hindcast.years),
    hindcastPerDecade: perDecade(hindcast, l),
    observedPerDecade: observed?.recentreOn === undefined ? null : perDecade(observed, l),
    units: hindcast.units,
  };
}

/** ", detrended and re-centred on 2026" for a threshold's origin text; '' when the climate is not trend-aware. */
export function recentreNote(c: LeadClimate): string {
  return c.recentreOn === undefined ? '' : `, detrended and re-centred on ${c.recentreOn}`;
}
