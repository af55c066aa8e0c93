/**
 * How one variable is turned into daily values: its step intervals, whether it is accumulated since the
 * start, and which daily reduction a quantity takes.
 *
 * Precipitation amounts (`m`, `mm`, `kg m-2`) count as ACCUMULATED SINCE THE REFERENCE TIME when their
 * `time_bnds` all start at one instant, or, without bounds, unless `cell_methods` says `time: sum`
 * (then each step is the amount since the previous step). This follows the usual forecast-centre encoding
 * of total precipitation; a file of per-step amounts must carry bounds or `time: sum`.
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
  const accumulated = kind === 'amount' && (time.boundsMs ? boundsShareStart(time.boundsMs) : method !== 'sum');
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
  return unitPlan.kind === 'amount' ? 'sum' : 'mean';
}

/** The file's forecast reference time: `forecast_reference_time` when present, else the start of the first step. */
export function referenceTimeMs(coords: FileCoordinates, plan: TimePlan): number | null {
  return coords.referenceMs ?? plan.intervals?.startMs[0] ?? null;
}
