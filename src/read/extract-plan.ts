/**
 * How one variable is turned into daily values: its step intervals, whether it is accumulated since the
 * start, and which daily reduction a quantity takes (conventions and their sources: src/read/DECISIONS.md).
 *
 * Precipitation amounts (units kinds `amount` and `accumulation` of units.ts) are either per-period TOTALS
 * (summed per day) or ACCUMULATIONS SINCE THE START (differenced step by step first), decided in this order:
 *  1. `time_bnds` (CF 1.11 §7.1): all bounds starting at one instant = accumulation; otherwise totals.
 *  2. `cell_methods` `time: sum` without bounds (CF §7.3): totals over the period before each stamp.
 *  3. units: metres (`lwe_thickness_of_precipitation_amount`, the GRIB total-precipitation encoding) =
 *     accumulation since the reference time (zero at the reference time when the file has no step 0);
 *     `mm`/`kg m-2` = totals,
 *  4. unless such an unlabelled amount never decreases from a zero start (accumulation-probe.ts): accumulation.
 */
import { InputError } from '../core/errors.ts';
import type { Quantity } from '../types.ts';
import { timeCellIntervalMs, timeCellMethod } from './cell-methods.ts';
import { valuesAccumulate } from './accumulation-probe.ts';
import type { FileCoordinates, VariableLayout } from './coordinates.ts';
import type { Dataset } from './dataset.ts';
import { axisSpacing, stepIntervals, type DailyMethod, type StepIntervals } from './daily.ts';
import { isoInstant } from './extract-reduce.ts';
import type { UnitPlan } from './units.ts';

const PERIOD_METHODS = ['maximum', 'minimum', 'mean', 'sum', 'median', 'mid_range', 'standard_deviation', 'variance'];
const SLACK_MS = 1000;

export interface TimePlan {
  readonly intervals: StepIntervals | null;
  readonly accumulated: boolean;
}

function boundsShareStart(bounds: Float64Array): boolean {
  for (let i = 2; i < bounds.length; i += 2) if (bounds[i] !== bounds[0]) return false;
  return true;
}

/** Accumulated since the start (true) or per-period totals (false), by the rules of the module comment. */
function isAccumulation(unitPlan: UnitPlan | null, boundsMs: Float64Array | null, method: string | null): boolean {
  const kind = unitPlan?.kind;
  if (kind !== 'amount' && kind !== 'accumulation') return false;
  if (boundsMs) return boundsMs.length > 2 && boundsShareStart(boundsMs);
  if (method === 'sum') return false;
  return kind === 'accumulation';
}

/**
 * Whether values speak for the period before their stamp rather than the instant: an amount, accumulation or
 * rate; a `cell_methods` time method other than `point`; cfgrib's `GRIB_stepType` (ecCodes key `stepType`)
 * other than `instant`; or, with none of these stated, a variable read as tmax/tmin (a maximum or minimum is
 * over a period by definition).
 */
function isPeriodVariable(layout: VariableLayout, method: string | null, unitPlan: UnitPlan | null): boolean {
  if (unitPlan && unitPlan.kind !== 'state') return true;
  if (method !== null) return PERIOD_METHODS.includes(method);
  const stepType = layout.info.attributes.GRIB_stepType;
  if (typeof stepType === 'string') return stepType !== 'instant';
  return unitPlan?.quantity === 'tmax' || unitPlan?.quantity === 'tmin';
}

/**
 * Step intervals and accumulation of `layout`'s variable; `unitPlan` null = unknown quantity (CLI).
 * `referenceHintMs`: the forecast date the file was found under, used when the file states no forecast_reference_time.
 * `valuesAccumulate`: the values of an unlabelled amount showed a running accumulation (accumulation-probe.ts).
 * @throws InputError when `cell_methods` gives periods longer than the time spacing (overlapping running periods).
 */
export function planTime(
  coords: FileCoordinates,
  layout: VariableLayout,
  unitPlan: UnitPlan | null,
  referenceHintMs: number | null = null,
  valuesAccumulate = false,
): TimePlan {
  const time = coords.time;
  if (!time || layout.timeAxis < 0) return { intervals: null, accumulated: false };
  const method = timeCellMethod(layout.info, time);
  const periodMs = timeCellIntervalMs(layout.info, time);
  const accumulated = valuesAccumulate || isAccumulation(unitPlan, time.boundsMs, method);
  const period = isPeriodVariable(layout, method, unitPlan);
  if (period && !time.boundsMs && periodMs !== null && time.stampsMs.length > 1 && periodMs > axisSpacing(time.stampsMs) + SLACK_MS) {
    const every = Math.round(periodMs / axisSpacing(time.stampsMs));
    throw new InputError(
      'time-overlap',
      coords.file,
      `variable '${layout.info.name}': cell_methods gives ${periodMs / 3_600_000}-hour periods but the steps are ${axisSpacing(time.stampsMs) / 3_600_000} hours apart (overlapping running periods)`,
      `keep every ${every}th step (e.g. ncks -d ${time.dimension},${every - 1},,${every} in.nc out.nc) or add time_bnds`,
    );
  }
  const intervals = stepIntervals({
    stampsMs: time.stampsMs,
    boundsMs: time.boundsMs,
    referenceMs: coords.referenceMs ?? referenceHintMs,
    periodEndingAtStamp: period,
    periodMs,
    accumulated,
  });
  return { intervals, accumulated };
}

/** Daily reduction a quantity takes: daily maximum/minimum for tmax/tmin, total for amounts, mean otherwise. */
export function dailyMethodFor(quantity: Quantity, unitPlan: UnitPlan): DailyMethod {
  if (quantity === 'tmax') return 'max';
  if (quantity === 'tmin') return 'min';
  return unitPlan.kind === 'amount' || unitPlan.kind === 'accumulation' ? 'sum' : 'mean';
}

/**
 * The forecast reference times a file's variable is consistent with, [earliest, latest] in ms:
 * `forecast_reference_time` when stated; else the start of the first period (never a stamp at the end of it);
 * for instantaneous samples, anywhere from one spacing before the first sample up to it.
 */
export function referenceWindowMs(coords: FileCoordinates, plan: TimePlan): { earliest: number; latest: number } | null {
  if (coords.referenceMs !== null) return { earliest: coords.referenceMs, latest: coords.referenceMs };
  const iv = plan.intervals;
  if (!iv) return null;
  if (!iv.instantaneous) return { earliest: iv.startMs[0], latest: iv.startMs[0] };
  return { earliest: iv.startMs[0] - axisSpacing(iv.startMs), latest: iv.startMs[0] };
}

/** The requested reference time in ms (ISO date or instant), or null when none was requested. */
export function requestedMs(file: string, requested: string | undefined): number | null {
  if (requested === undefined) return null;
  const wanted = Date.parse(/^\d{4}-\d{2}-\d{2}$/.test(requested) ? `${requested}T00:00:00Z` : requested);
  if (Number.isNaN(wanted)) {
    throw new InputError(
      'reference-invalid',
      file,
      `requested reference time '${requested}' is not an ISO 8601 date`,
      'pass YYYY-MM-DD or YYYY-MM-DDThh:mmZ',
    );
  }
  return wanted;
}

/** The reference time of the series: the requested one when the file is consistent with it; throws otherwise. */
export function checkReference(file: string, window: { earliest: number; latest: number }, wanted: number | null): number {
  if (wanted === null) return window.latest;
  if (wanted >= window.earliest && wanted <= window.latest) return wanted;
  throw new InputError(
    'reference-mismatch',
    file,
    `the file holds the forecast of ${isoInstant(window.latest)} but ${isoInstant(wanted)} was requested`,
    'the file name and its contents disagree: check the source path pattern or replace the file',
  );
}

/**
 * The time plan of `layout`'s variable (accumulation judged from its attributes, else from its values) and the
 * reference instant the file holds, checked against `wanted`; `referenceMs` is null when the file has none.
 */
export async function planVariableTime(
  ds: Dataset,
  coords: FileCoordinates,
  layout: VariableLayout,
  unitPlan: UnitPlan | null,
  wanted: number | null,
): Promise<{ readonly time: TimePlan; readonly byValues: boolean; readonly referenceMs: number | null }> {
  const byValues = await valuesAccumulate(ds, coords, layout, unitPlan, wanted);
  const time = planTime(coords, layout, unitPlan, wanted, byValues);
  const window = referenceWindowMs(coords, time);
  return { time, byValues, referenceMs: window && checkReference(ds.path, window, wanted) };
}
