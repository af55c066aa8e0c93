/**
 * Trend-aware climate: a hindcast (or observed) climate whose years span a warming world is detrended and
 * re-centred on the year it speaks for. One least-squares line per tier's climate, x ≈ a_l + b·year, with its own
 * level a_l per lead and one slope b for all leads, is fitted to every valid value (all years × members × leads;
 * ordinary least squares, Wilks, "Statistical Methods in the Atmospheric Sciences", 3rd ed., section 7.2, from
 * memory). One slope rather than one per lead: a lead's own 20-year slope is mostly weather noise (the sample's
 * day leads, generated without any trend, gave −0.6 to −0.1 K per decade lead by lead in the hindcasts and −1.2 to
 * −0.3 in the observations), while the warming is the same
 * climate signal at neighbouring leads. Each value of year y is moved along the line to the target year T:
 *
 *   x' = x + b·(T − y).
 *
 * Which year is the target, and which years the line is fitted on, follow the question asked of the sample:
 * - the climate of the forecast: T = the issue year (`LeadClimate.recentreOn`), the line fitted on every year;
 * - leave-one-year-out (verification, skill, quantile mapping, terciles): T = the held-out year, the line fitted
 *   on the other years only, so the year judged never sets its own trend (no leak).
 * `leadSample` in climate.ts applies this whenever `recentreOn` is set, so thresholds, probabilities, quantile
 * mapping, terciles and skill all see one and the same re-centred climate. The slope is applied only when the
 * data tell it from zero (`climateSlope`: two-sided 90 % t test on the year means), else it is 0 and the climate is
 * used as it is; so with fewer than three distinct years. Common practice (e.g. removing a linear trend from hindcasts before
 * computing anomalies in seasonal forecasting), no single source for the re-centring rule itself.
 */
import type { ClimateTrend, TrendFit } from '../probability-types.ts';
import { studentTQuantile } from './student-t.ts';
import type { LeadClimate } from './lead-climate.ts';

export interface ClimateSlope {
  /** b applied: change per year, in the climate's units, common to every lead; 0 when `applied` is false. */
  readonly slope: number;
  /** The least-squares slope as fitted, applied or not. */
  readonly fitted: number;
  /** Standard error of the slope from the year means (see `climateSlope`); NaN with fewer than three years. */
  readonly standardError: number;
  /** t(0.95, n − 2) for the n years fitted; NaN with fewer than three years. */
  readonly criticalT: number;
  /** |fitted| > criticalT × standardError: the trend is told from zero (two-sided 90 %). */
  readonly applied: boolean;
  /** Distinct years the line was fitted on. */
  readonly years: number;
}

const memo = new WeakMap<LeadClimate, Map<number | 'all', ClimateSlope>>();

/**
 * The least-squares slope of x ≈ a_l + b·year over the valid values of every lead (one intercept per lead, one
 * slope), leaving out `excludeYear`: b = Σ_l Σ (year − ȳ_l)(x − x̄_l) / Σ_l Σ (year − ȳ_l)², applied only when
 * told from zero. The test takes one value per year, as the line's level per lead does: the year's mean of
 * x − x̄_l over its members and leads, regressed on the year (ordinary least squares, residual variance on n − 2
 * degrees of freedom, n = years); |b| > t(0.95, n − 2) × that slope's standard error. Members and leads of one year
 * share its weather, so counting each value as independent would shrink the error by about √(values per year) and
 * pass noise as a trend. Remembered per climate object (climates are read-only).
 */
export function climateSlope(c: LeadClimate, excludeYear?: number): ClimateSlope {
  const key = excludeYear ?? 'all';
  const known = memo.get(c)?.get(key);
  if (known) return known;
  const nLeads = c.leads.length;
  // Keyed by the year itself: starts pooled within a window repeat a year (lead-climate.ts) and share its weather.
  const perYear = new Map<number, { sum: number; n: number }>();
  let num = 0;
  let den = 0;
  for (let l = 0; l < nLeads; l++) {
    let n = 0;
    let sx = 0;
    let sy = 0;
    const each = (f: (y: number, v: number) => void) => {
      for (let y = 0; y < c.years.length; y++) {
        if (c.years[y] === excludeYear) continue;
        for (let m = 0; m < c.members; m++) {
          const v = c.values[(y * c.members + m) * nLeads + l];
          if (!Number.isNaN(v)) f(y, v);
        }
      }
    };
    each((y, v) => ((n += 1), (sx += c.years[y]), (sy += v)));
    if (n === 0) continue;
    const [mx, my] = [sx / n, sy / n];
    each((y, v) => {
      num += (c.years[y] - mx) * (v - my);
      den += (c.years[y] - mx) ** 2;
      const year = perYear.get(c.years[y]) ?? perYear.set(c.years[y], { sum: 0, n: 0 }).get(c.years[y])!;
      year.sum += v - my;
      year.n += 1;
    });
  }
  const fitted = den === 0 ? 0 : num / den;
  const { standardError, years } = yearMeanError([...perYear].map(([year, p]) => [year, p.sum / p.n]));
  const criticalT = years >= 3 ? studentTQuantile(0.95, years - 2) : Number.NaN;
  const applied = years >= 3 && Math.abs(fitted) > criticalT * standardError;
  const result = { slope: applied ? fitted : 0, fitted, standardError, criticalT, applied, years };
  memo.set(c, (memo.get(c) ?? new Map()).set(key, result));
  return result;
}

/** The standard error of the least-squares slope of (year, mean) pairs: √(Σ residual² / (n − 2) / Σ (year − ȳ)²). */
function yearMeanError(points: readonly number[][]): { standardError: number; years: number } {
  const n = points.length;
  if (n < 3) return { standardError: Number.NaN, years: n };
  const [my, mz] = [points.reduce((a, p) => a + p[0], 0) / n, points.reduce((a, p) => a + p[1], 0) / n];
  const sxx = points.reduce((a, p) => a + (p[0] - my) ** 2, 0);
  const b = points.reduce((a, p) => a + (p[0] - my) * (p[1] - mz), 0) / sxx;
  const rss = points.reduce((a, p) => a + (p[1] - mz - b * (p[0] - my)) ** 2, 0);
  return { standardError: Math.sqrt(rss / (n - 2) / sxx), years: n };
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
  const slope = target === undefined ? 0 : climateSlope(c, excludeYear).slope;
  for (let y = 0; y < c.years.length; y++) {
    if (c.years[y] === excludeYear) continue;
    const shift = target === undefined ? 0 : slope * (target - c.years[y]);
    for (let m = 0; m < c.members; m++) out[y * c.members + m] = c.values[(y * c.members + m) * nLeads + l] + shift;
  }
  return out;
}

function fitAt(c: LeadClimate | null, l: number): TrendFit | null {
  if (!c || l >= c.leads.length) return null;
  const t = climateSlope(c);
  if (t.years < 2) return null;
  return { perDecade: t.fitted * 10, standardErrorPerDecade: t.standardError * 10, criticalT: t.criticalT, applied: t.applied };
}

/** The trends a trend-aware hindcast climate removes at lead position l, for run.json and the bulletin; null when it is not trend-aware. */
export function climateTrendAt(hindcast: LeadClimate | null, observed: LeadClimate | null, l: number): ClimateTrend | null {
  if (!hindcast || hindcast.recentreOn === undefined) return null;
  return {
    onYear: hindcast.recentreOn,
    firstYear: Math.min(...hindcast.years),
    lastYear: Math.max(...hindcast.years),
    hindcast: fitAt(hindcast, l),
    observed: observed?.recentreOn === undefined ? null : fitAt(observed, l),
    units: hindcast.units,
  };
}

/** ", detrended and re-centred on 2026" for a threshold's origin text; '' when the climate is not trend-aware. */
export function recentreNote(c: LeadClimate): string {
  return c.recentreOn === undefined ? '' : `, detrended and re-centred on ${c.recentreOn}`;
}
