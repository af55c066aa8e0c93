/** What a file's time axis is once read (time-axis.ts; months leads: lead-months.ts). */
import type { MonthSteps } from './monthly.ts';

export interface TimeAxis {
  /** The dimension that data variables use for time (absolute time or forecast lead). */
  readonly dimension: string;
  /** The coordinate variable read (e.g. `time`, `step`). */
  readonly variable: string;
  /** Valid time of each step, ms since 1970-01-01T00:00Z. */
  readonly stampsMs: Float64Array;
  /** `[n][2]` valid-time bounds in ms, or null. */
  readonly boundsMs: Float64Array | null;
  /** The model month of each step when the file holds one value per month (monthly.ts), else null. */
  readonly months: MonthSteps | null;
}
