/**
 * How one variable is turned into daily values: its step intervals, whether it is accumulated since the
 * start, and which daily reduction a quantity takes.
 *
 * Precipitation counts as ACCUMULATED SINCE THE REFERENCE TIME when its units are metres (CF
 * `lwe_thickness_of_precipitation_amount`, the forecast-centre encoding of total precipitation; units.ts
 * kind `accumulation`), whatever the time bounds say (a file's time axis and bounds are shared by all its
 * variables, so they cannot mark one variable as accumulated), or when it is an amount in `mm`/`kg m-2`
 * whose `time_bnds` all start at one instant. Other `mm`/`kg m-2` amounts are per step.
 */
import type { Quantity } from '../types.ts';
import { timeCellMethod, type FileCoordinates, type VariableLayout } from './coordinates.ts';
import { stepIntervals, type DailyMethod, type StepIntervals } from './daily.ts';
import type { UnitPlan } from './units.ts';

const PERIOD_METHODS = ['maximum', 'minimum', 'mean', 'sum', 'median', 'mid_range', 'standard_deviation', 'variance'];

export interface TimePlan {
  readonly intervals: StepIntervals | null;
  readonly accumulated: boolean;
}

function boundsShareStart(bounds: Float64Array): boolean {
  for (let i = 2; i < bounds.length; i += 2) if (bounds[i] !== bounds[0]) return false;
  return true;
}

/** Step intervals and accumulation of `layout`'s variable; `unitPlan` null = unknown quantity (CLI). */
export function planTime(coords: FileCoordinates, layout: VariableLayout, unitPlan: UnitPlan | null): TimePlan {
  const time = coords.time;
  if (!time || layout.timeAxis < 0) return { intervals: null, accumulated: false };
  const method = timeCellMethod(layout.info, time);
  const kind = unitPlan?.kind ?? 'state';
  const accumulated = kind === 'accumulation' || (kind === 'amount' && time.boundsMs !== null && boundsShareStart(time.boundsMs));
  const intervals = stepIntervals({
    stampsMs: time.stampsMs,
    boundsMs: time.boundsMs,
    referenceMs: coords.referenceMs,
    periodEndingAtStamp: kind !== 'state' || (method !== null && PERIOD_METHODS.includes(method)),
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

/** The file's forecast reference time: `forecast_reference_time` when present, else the start of the first step. */
export function referenceTimeMs(coords: FileCoordinates, plan: TimePlan): number | null {
  return coords.referenceMs ?? plan.intervals?.startMs[0] ?? null;
}
