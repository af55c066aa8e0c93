/**
 * Sub-daily steps → local calendar days (max, min, mean or sum per grid cell, before any area mean: the
 * order of CDO's `daymax` then `fldmean`).
 *
 * What period a step speaks for (its interval), in this order (src/read/DECISIONS.md gives the sources):
 *  1. `time_bnds` (CF 1.11 §7.1): the bounds.
 *  2. no bounds, a period variable (`cell_methods` time: maximum/minimum/mean/sum…, CF §7.3, or an amount,
 *     accumulation or rate): the period ENDING at the stamp, as GRIB-converted parameters are encoded
 *     (maximum, minimum, mean or total over the period before the step). Its length is the `cell_methods`
 *     `(interval: …)` when that is not shorter than the axis spacing, else the spacing since the previous stamp.
 *     With a reference time R (forecast_reference_time, or the forecast date the file was found under), no
 *     period starts before R: a stamp AT R is step 0 (zero length, no day of its own), a first stamp less than
 *     one period after R covers (R, stamp]. Without any reference time (observations), sub-daily periods end at
 *     their stamps and a daily (or coarser) value belongs to its stamp's date (observation archives stamp the
 *     start of the day: common practice, no source).
 *  3. otherwise an instantaneous sample at the stamp, standing for one nominal spacing (median step).
 *  Accumulated-since-start fields: step i covers (stamp[i-1], stamp[i]], the first (R or bounds start, stamp[0]].
 * A step belongs to the local day (UTC + the region clock's offset at that instant: a fixed offset, or an IANA
 * zone following daylight saving) holding its interval MIDPOINT, never its stamp alone.
 * A local day is kept only when its steps cover 24 h, or the whole day when it is shorter (23 h on a
 * spring-forward day; a 25 h autumn day needs 24 h, as steps of 3 or 6 h cannot fill 25 h) (sum of interval
 * lengths; samples count one spacing each). Incomplete first/last days are DROPPED, so lead day 1 is the first
 * complete local day.
 * A cell's daily value is NaN when any of its steps in that day is missing.
 * Daily (or coarser) input passes through: one step per day, dated by the UTC date of its interval's
 * midpoint (so an end-stamped daily maximum gets the day before its stamp); no local shift, as a daily value
 * cannot be re-cut into local days.
 */
import { localDayLengthMs, localDayNumber, type LocalClock } from '../core/local-clock.ts';
import type { IsoDate } from '../types.ts';

export type DailyMethod = 'max' | 'min' | 'mean' | 'sum';

export interface StepIntervals {
  readonly startMs: Float64Array;
  readonly endMs: Float64Array;
  /** True when every step is an instantaneous sample. */
  readonly instantaneous: boolean;
}

export interface DayPlan {
  readonly days: readonly IsoDate[];
  /** Day index of each step, -1 when the step is dropped (incomplete day, zero-length interval). */
  readonly dayOfStep: Int32Array;
  /** Weight of each step within its day: interval length in hours (one nominal spacing for samples). */
  readonly stepWeight: Float64Array;
}

const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;
const COVERAGE_SLACK_MS = 1000;

export interface IntervalInput {
  readonly stampsMs: Float64Array;
  readonly boundsMs: Float64Array | null;
  /** forecast_reference_time (or the forecast date the file was found under), or null. */
  readonly referenceMs: number | null;
  /** Steps are means/extremes/sums over the period before the stamp. */
  readonly periodEndingAtStamp: boolean;
  /** Period length from `cell_methods` `(interval: …)`, ms, or null when unstated. */
  readonly periodMs?: number | null;
  /** Values are accumulated from the reference time (bounds, when present, all start at one instant). */
  readonly accumulated: boolean;
}

function medianSpacing(stamps: Float64Array): number {
  const d: number[] = [];
  for (let i = 1; i < stamps.length; i++) d.push(stamps[i] - stamps[i - 1]);
  if (d.length === 0) return DAY_MS;
  d.sort((a, b) => a - b);
  return d[Math.floor(d.length / 2)];
}

/** Median spacing of the stamps, or `fallback` for a single step. */
export function axisSpacing(stamps: Float64Array, fallback = DAY_MS): number {
  return stamps.length > 1 ? medianSpacing(stamps) : fallback;
}

/** The interval each step speaks for (rules in the module comment). */
export function stepIntervals(input: IntervalInput): StepIntervals {
  const { stampsMs, boundsMs, referenceMs } = input;
  const n = stampsMs.length;
  const startMs = new Float64Array(n);
  const endMs = new Float64Array(n);
  const spacing = axisSpacing(stampsMs, input.periodMs ?? DAY_MS);
  const length = input.periodMs != null && input.periodMs >= spacing - COVERAGE_SLACK_MS ? input.periodMs : spacing;
  const firstStart = (): number => {
    if (referenceMs === null || referenceMs > stampsMs[0]) return stampsMs[0] - length;
    return input.accumulated ? referenceMs : Math.max(referenceMs, stampsMs[0] - length);
  };
  if (boundsMs) {
    for (let i = 0; i < n; i++) {
      endMs[i] = boundsMs[2 * i + 1];
      startMs[i] = !input.accumulated ? boundsMs[2 * i] : i > 0 ? endMs[i - 1] : boundsMs[0];
    }
    return { startMs, endMs, instantaneous: false };
  }
  const daily = spacing >= DAY_MS - COVERAGE_SLACK_MS;
  const periodEnding = input.accumulated || (input.periodEndingAtStamp && (referenceMs !== null || !daily));
  for (let i = 0; i < n; i++) {
    endMs[i] = stampsMs[i];
    const previous = input.accumulated || input.periodMs == null ? stampsMs[i - 1] : Math.max(stampsMs[i - 1], stampsMs[i] - length);
    startMs[i] = !periodEnding ? stampsMs[i] : i > 0 ? previous : firstStart();
  }
  return { startMs, endMs, instantaneous: !periodEnding };
}

function isoDate(dayNumber: number): IsoDate {
  return new Date(dayNumber * DAY_MS).toISOString().slice(0, 10);
}

/** Assigns steps to complete local days (see module comment). */
export function planLocalDays(intervals: StepIntervals, clock: LocalClock): DayPlan {
  const { startMs, endMs, instantaneous } = intervals;
  const n = startMs.length;
  const spacing = instantaneous ? medianSpacing(startMs) : medianSpacing(endMs);
  const dayOfStep = new Int32Array(n).fill(-1);
  const stepWeight = new Float64Array(n);
  if (spacing >= DAY_MS - COVERAGE_SLACK_MS) {
    const days: IsoDate[] = [];
    for (let i = 0; i < n; i++) {
      if (!instantaneous && endMs[i] <= startMs[i]) continue;
      dayOfStep[i] = days.length;
      stepWeight[i] = 1;
      days.push(isoDate(Math.floor((startMs[i] + endMs[i]) / 2 / DAY_MS)));
    }
    return { days, dayOfStep, stepWeight };
  }
  const dayNumber = new Float64Array(n);
  const coverage = new Map<number, number>();
  for (let i = 0; i < n; i++) {
    const length = instantaneous ? spacing : endMs[i] - startMs[i];
    dayNumber[i] = localDayNumber(clock, (startMs[i] + endMs[i]) / 2);
    stepWeight[i] = length / HOUR_MS;
    if (length > 0) coverage.set(dayNumber[i], (coverage.get(dayNumber[i]) ?? 0) + length);
  }
  const complete = [...coverage.entries()]
    .filter(([d, ms]) => ms >= Math.min(DAY_MS, localDayLengthMs(clock, d)) - COVERAGE_SLACK_MS)
    .map(([d]) => d)
    .sort((a, b) => a - b);
  const index = new Map(complete.map((d, k) => [d, k]));
  for (let i = 0; i < n; i++) dayOfStep[i] = stepWeight[i] > 0 ? (index.get(dayNumber[i]) ?? -1) : -1;
  return { days: complete.map(isoDate), dayOfStep, stepWeight };
}

/**
 * Turns values accumulated since the reference time into per-step amounts, in place, per cell:
 * amount[i] = acc[i] - acc[i-1]. `values` is `[step][cell]`, one time chunk; `carry` holds, per cell, the
 * accumulation before the chunk (zeros before the first chunk: acc(t0) = 0) and is updated to the chunk's last.
 */
export function deaccumulateInPlace(values: Float64Array, cells: number, carry: Float64Array): void {
  const steps = values.length / cells;
  if (steps === 0) return;
  const last = (steps - 1) * cells;
  for (let c = 0; c < cells; c++) {
    const acc = values[last + c];
    for (let row = last; row > 0; row -= cells) values[row + c] -= values[row - cells + c];
    values[c] -= carry[c];
    carry[c] = acc;
  }
}

/** Decreases of an accumulation up to this (mm) are packing noise of GRIB-converted fields, set to 0 (common practice, no source). */
export const ACCUMULATION_NOISE_MM = 1e-3;

/**
 * After `deaccumulateInPlace` (values in mm): sets amounts in [-ACCUMULATION_NOISE_MM, 0) to 0 and returns the
 * first larger decrease as { row, by } (row = step within the chunk, by = mm), or null. NaN is left alone.
 */
export function clampAccumulationNoise(values: Float64Array, cells: number): { row: number; by: number } | null {
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!(v < 0)) continue;
    if (v < -ACCUMULATION_NOISE_MM) return { row: Math.floor(i / cells), by: -v };
    values[i] = 0;
  }
  return null;
}

/** Which part of the whole series a chunk of `[step][cell]` values holds, and where its days go in `out`. */
export interface ChunkWindow {
  readonly firstStep: number;
  /** Day index stored in row 0 of `out`. */
  readonly firstDay: number;
  /** Number of day rows `out` receives. */
  readonly days: number;
}

/**
 * Reduces one time chunk of `[step][cell]` values to `[day][cell]` rows of `out` by `method` using `plan`.
 * Every day touched by the chunk must lie wholly inside it. `mean` weights steps by `plan.stepWeight`;
 * NaN in any step of a day makes that cell-day NaN.
 */
export function reduceToDays(
  values: Float64Array,
  cells: number,
  plan: DayPlan,
  method: DailyMethod,
  out: Float64Array,
  window: ChunkWindow,
): void {
  const init = method === 'max' ? -Infinity : method === 'min' ? Infinity : 0;
  out.fill(init, 0, window.days * cells);
  const weightSum = new Float64Array(window.days);
  const steps = values.length / cells;
  for (let t = 0; t < steps; t++) {
    const d = plan.dayOfStep[window.firstStep + t] - window.firstDay;
    if (d < 0 || d >= window.days) continue;
    const src = t * cells;
    const dst = d * cells;
    const w = plan.stepWeight[window.firstStep + t];
    weightSum[d] += w;
    if (method === 'max') for (let c = 0; c < cells; c++) out[dst + c] = Math.max(out[dst + c], values[src + c]);
    else if (method === 'min') for (let c = 0; c < cells; c++) out[dst + c] = Math.min(out[dst + c], values[src + c]);
    else if (method === 'sum') for (let c = 0; c < cells; c++) out[dst + c] += values[src + c];
    else for (let c = 0; c < cells; c++) out[dst + c] += w * values[src + c];
  }
  if (method !== 'mean') return;
  for (let d = 0; d < window.days; d++) {
    const inv = 1 / weightSum[d];
    for (let c = d * cells; c < (d + 1) * cells; c++) out[c] *= inv;
  }
}
