/**
 * Sample percentiles (EHF's T95, day-of-year thresholds, model-climate thresholds, quantile mapping): linear
 * interpolation between order statistics, Hyndman & Fan (1996),
 * "Sample quantiles in statistical packages", The American Statistician 50:361-365, definition 7 — numpy's
 * default (`numpy.percentile(x, q, method='linear')`). For n sorted values x(0..n-1) and q in [0, 100]:
 *
 *     h = (n - 1) q / 100,   Q = x(floor h) + (h - floor h) (x(floor h + 1) - x(floor h))
 *
 * NaN values are skipped (as `numpy.nanpercentile`); no valid value gives NaN. Here: the inverse (percent rank,
 * for quantile mapping) and a leave-some-out variant that avoids re-sorting.
 *
 * Definition 6 (`method: 'weibull'`, numpy's method='weibull'), h = (n + 1) q / 100 − 1 clamped to 0..n−1, is
 * the unbiased plotting position: a new value from the same distribution exceeds it with probability
 * 1 − q/100 whatever n is (Hyndman & Fan 1996, property P6). Cross-validated thresholds from samples of
 * different sizes (19 observed values, 209 hindcast values) therefore give the same event frequency.
 */
export type PercentileMethod = 'linear' | 'weibull';

function position(n: number, q: number, method: PercentileMethod): number {
  return method === 'linear' ? ((n - 1) * q) / 100 : Math.min(Math.max(((n + 1) * q) / 100 - 1, 0), n - 1);
}
import { ForelightError } from './errors.ts';

/** q-th percentile (0..100) of the non-NaN values, numpy 'linear' / Hyndman-Fan type 7 (or 'weibull', type 6). */
export function percentileLinear(values: ArrayLike<number>, q: number, method: PercentileMethod = 'linear'): number {
  if (!(q >= 0 && q <= 100)) throw new RangeError(`percentile must be within 0..100, got ${q}`);
  const x = sortValid(values);
  const n = x.length;
  if (n === 0) return NaN;
  const h = position(n, q, method);
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return x[lo] + (h - lo) * (x[hi] - x[lo]);
}

function checkPercent(q: number): void {
  if (!(q >= 0 && q <= 100)) {
    throw new ForelightError('calibrate', 'percentile-range', `percentile ${q} is outside 0..100`, 'pass a percentile between 0 and 100');
  }
}

/** Valid (non-NaN) values of `values`, sorted ascending, in a new array. */
export function sortValid(values: ArrayLike<number>): Float64Array {
  let n = 0;
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i])) n++;
  const out = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i])) out[k++] = values[i];
  return out.sort();
}

/**
 * Inverse of the type-7 rule: the percent q (0..100) at which `percentileLinear(sorted, q)` equals x, i.e. the
 * empirical CDF interpolated linearly between order statistics, with plotting positions k/(n-1). Among tied order
 * statistics the midpoint of their positions is taken. Values below the minimum give 0, above the maximum 100;
 * `clipped` reports that the value lay outside the sample (no extrapolation).
 */
export function percentRankOfSorted(sorted: ArrayLike<number>, x: number): { percent: number; clipped: boolean } {
  const n = sorted.length;
  if (n === 0 || Number.isNaN(x)) return { percent: Number.NaN, clipped: false };
  if (x < sorted[0]) return { percent: 0, clipped: true };
  if (x > sorted[n - 1]) return { percent: 100, clipped: true };
  if (n === 1) return { percent: 50, clipped: false };
  let first = 0;
  while (first < n && sorted[first] < x) first++;
  let last = first;
  while (last + 1 < n && sorted[last + 1] === x) last++;
  let pos: number;
  if (first < n && sorted[first] === x) pos = (first + last) / 2;
  else pos = first - 1 + (x - sorted[first - 1]) / (sorted[first] - sorted[first - 1]);
  return { percent: (100 * pos) / (n - 1), clipped: false };
}

function lowerBound(sorted: ArrayLike<number>, x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Type-7 (or type-6) percentile of `sorted` with the values of `removed` (sorted, NaN-free, each present in `sorted`) taken
 * out, without copying: O(r log n) per call. Used for leave-one-year-out thresholds.
 */
export function percentileOfSortedWithout(
  sorted: ArrayLike<number>,
  removed: ArrayLike<number>,
  q: number,
  method: PercentileMethod = 'linear',
): number {
  checkPercent(q);
  const n = sorted.length - removed.length;
  if (n <= 0) return Number.NaN;
  const positions = new Int32Array(removed.length);
  for (let j = 0; j < removed.length; j++) {
    positions[j] = j > 0 && removed[j] === removed[j - 1] ? positions[j - 1] + 1 : lowerBound(sorted, removed[j]);
  }
  const at = (k: number): number => {
    let idx = k;
    for (let j = 0; j < positions.length && positions[j] <= idx; j++) idx++;
    return sorted[idx];
  };
  const h = position(n, q, method);
  const lo = Math.floor(h);
  const a = at(lo);
  return lo + 1 < n ? a + (h - lo) * (at(lo + 1) - a) : a;
}
