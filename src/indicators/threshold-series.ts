/**
 * Day-count and window indicators on one temperature series: trailing running mean, run of consecutive hot days,
 * and heat load (degree-days above a threshold). Thresholds are per calendar day (a function of the date) so a
 * day-of-year climatological threshold lets early-season heat count more than the same heat late in the season.
 * `antecedent` (optional): analysed values of the days right before lead day 1 (last element = the day before),
 * the same for every member; without them a window that is not complete at the start gives NaN, and a hot-day
 * run starts counting at lead day 1.
 */
import type { IsoDate } from '../types.ts';
import { addDays } from '../core/iso-dates.ts';

export interface DailySeries {
  readonly days: readonly IsoDate[];
  readonly members: number;
  /** member-major [member][day] */
  readonly data: Float64Array;
}

function extendedRow(s: DailySeries, m: number, antecedent: Float64Array, buf: Float64Array): Float64Array {
  const steps = s.days.length;
  buf.set(antecedent);
  buf.set(s.data.subarray(m * steps, (m + 1) * steps), antecedent.length);
  return buf;
}

/**
 * Runs `fill` once per member on that member's antecedent-extended row `x` (antecedent days first, then the
 * series days); `fill` writes the member's `steps` results from `out[base]` on. One reused row buffer.
 */
function perMember(
  s: DailySeries,
  antecedent: Float64Array,
  fill: (x: Float64Array, antecedentDays: number, out: Float64Array, base: number) => void,
): Float64Array {
  const steps = s.days.length;
  const out = new Float64Array(s.members * steps);
  const buf = new Float64Array(antecedent.length + steps);
  for (let m = 0; m < s.members; m++) fill(extendedRow(s, m, antecedent, buf), antecedent.length, out, m * steps);
  return out;
}

/** Trailing running mean over `windowDays` (value on day i = mean of days i−w+1..i); NaN when incomplete. */
export function runningMeanSeries(s: DailySeries, windowDays: number, antecedent: Float64Array = new Float64Array(0)): Float64Array {
  return perMember(s, antecedent, (x, a, out, base) => {
    for (let i = 0; i < s.days.length; i++) {
      const j = a + i;
      if (j + 1 < windowDays) {
        out[base + i] = NaN;
        continue;
      }
      let sum = 0;
      for (let k = j - windowDays + 1; k <= j; k++) sum += x[k];
      out[base + i] = sum / windowDays;
    }
  });
}

/** Thresholds for the antecedent days followed by the series days. */
function thresholdsFor(s: DailySeries, antecedentLength: number, thresholdC: (date: IsoDate) => number): Float64Array {
  const thr = new Float64Array(antecedentLength + s.days.length);
  for (let k = 0; k < antecedentLength; k++) thr[k] = thresholdC(addDays(s.days[0], k - antecedentLength));
  for (let i = 0; i < s.days.length; i++) thr[antecedentLength + i] = thresholdC(s.days[i]);
  return thr;
}

/**
 * Length of the run of consecutive days with value > threshold (strictly) ending on each day [days].
 * A missing day makes the run unknown (NaN) until the next day at or below the threshold.
 */
export function hotDaysRunSeries(
  s: DailySeries,
  thresholdC: (date: IsoDate) => number,
  antecedent: Float64Array = new Float64Array(0),
): Float64Array {
  const thr = thresholdsFor(s, antecedent.length, thresholdC);
  return perMember(s, antecedent, (x, a, out, base) => {
    let run = 0;
    let unknown = false;
    for (let j = 0; j < a + s.days.length; j++) {
      if (Number.isNaN(x[j]) || Number.isNaN(thr[j])) unknown = true;
      else if (x[j] > thr[j]) run++;
      else {
        run = 0;
        unknown = false;
      }
      if (j >= a) out[base + j - a] = unknown ? NaN : run;
    }
  });
}

/** Heat load: sum over the trailing `windowDays` of max(0, value − threshold) [°C·day]; NaN when incomplete. */
export function heatLoadSeries(
  s: DailySeries,
  windowDays: number,
  thresholdC: (date: IsoDate) => number,
  antecedent: Float64Array = new Float64Array(0),
): Float64Array {
  const thr = thresholdsFor(s, antecedent.length, thresholdC);
  return perMember(s, antecedent, (x, a, out, base) => {
    for (let i = 0; i < s.days.length; i++) {
      const j = a + i;
      let sum = j + 1 < windowDays ? NaN : 0;
      for (let k = Math.max(0, j - windowDays + 1); k <= j; k++) sum += Math.max(0, x[k] - thr[k]);
      out[base + i] = sum;
    }
  });
}
