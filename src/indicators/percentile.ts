/**
 * Day-of-year climatological percentile thresholds, from the shared type-7 percentile of src/core/percentile.ts.
 * Method: linear interpolation between order statistics, Hyndman & Fan (1996) [hyndmanFan1996] definition 7,
 * identical to numpy.percentile(method='linear'), the numpy default:
 *     h = (n − 1) q/100,  Q = x_(⌊h⌋) + (h − ⌊h⌋)(x_(⌊h⌋+1) − x_(⌊h⌋))   (0-based sorted x)
 * NaN values are skipped (as numpy.nanpercentile); an empty sample gives NaN. q in 0..100.
 */
import type { IsoDate } from '../types.ts';
import { dayOfYearSlot } from '../core/iso-dates.ts';
import { percentileLinear } from '../core/percentile.ts';

/**
 * Location-specific day-of-year threshold from a daily climatology: for each calendar day, the q-th percentile
 * (type 7) of all values whose day of year lies within ±⌊smoothingWindowDays/2⌋ days (circular, 29 February
 * shares the calendar with the other years). Returns a function of the date (°C in, °C out) for
 * `IndicatorContext.climatology.dayOfYearThresholdC`. Calendar days with no value give NaN.
 * smoothingWindowDays: odd, 1..61 (e.g. 15, a common choice for percentile thresholds; no specific source).
 */
export function dayOfYearPercentileThreshold(
  dailyValuesByDate: ReadonlyMap<IsoDate, number>,
  q: number,
  smoothingWindowDays: number,
): (date: IsoDate) => number {
  if (!(Number.isInteger(smoothingWindowDays) && smoothingWindowDays % 2 === 1 && smoothingWindowDays <= 61)) {
    throw new RangeError(`smoothingWindowDays must be an odd whole number 1..61, got ${smoothingWindowDays}`);
  }
  const half = (smoothingWindowDays - 1) / 2;
  const bySlot: number[][] = Array.from({ length: 366 }, () => []);
  for (const [date, v] of dailyValuesByDate) if (!Number.isNaN(v)) bySlot[dayOfYearSlot(date)].push(v);
  const thresholds = new Float64Array(366);
  for (let s = 0; s < 366; s++) {
    const pooled: number[] = [];
    for (let d = -half; d <= half; d++) pooled.push(...bySlot[(s + d + 366) % 366]);
    thresholds[s] = percentileLinear(pooled, q);
  }
  return (date: IsoDate) => thresholds[dayOfYearSlot(date)];
}
