/**
 * Input checks for the series-level indicators: canonical units, physically impossible values, alignment of the
 * quantities an indicator combines, and the flag counts of a result. Errors name region and quantity; InputError
 * carries the source file from the series provenance.
 */
import { ForelightError, InputError, UnitError } from '../core/errors.ts';
import { CANONICAL_UNITS, type Quantity, type RegionSeries } from '../types.ts';

/** Physically possible range per quantity (canonical units), used to catch wrong units or scaling. */
export const IMPOSSIBLE_BOUNDS: Readonly<Record<Quantity, readonly [number, number]>> = {
  tmax: [-90, 60],
  tmin: [-90, 60],
  tmean: [-90, 60],
  dewpoint: [-90, 60],
  /** 0.5 % tolerance either side; values within it are clamped to 0..100 where used. */
  rh: [-0.5, 100.5],
  /** 0.06 kg/kg lies above any surface value observed (about 0.035); common practice, no source. */
  'specific-humidity': [0, 0.06],
  /** Surface pressure from the highest inhabited places (about 500 hPa) to sea-level extremes; common practice, no source. */
  'surface-pressure': [300, 1100],
  /** Packing noise down to −0.1 mm/day is treated as 0 where used (common practice, no source). */
  precip: [-0.1, 2000],
  wind: [0, 75],
};

/** Throws UnitError / InputError when the series is not in canonical units or holds an impossible value. */
export function checkSeries(s: RegionSeries): void {
  const units = CANONICAL_UNITS[s.quantity];
  if (s.units !== units) {
    throw new UnitError(
      `region ${s.region}, quantity ${s.quantity}: units "${s.units}" reached the indicators stage, expected "${units}"`,
      'convert to canonical units in the read stage',
    );
  }
  if (s.data.length !== s.members * s.days.length) {
    throw new InputError(
      'series-shape',
      s.provenance.file,
      `region ${s.region}, quantity ${s.quantity}: ${s.data.length} values for ${s.members} members × ${s.days.length} days`,
      'report this as a read-stage bug',
    );
  }
  const [lo, hi] = IMPOSSIBLE_BOUNDS[s.quantity];
  let bad = 0;
  let first = -1;
  for (let i = 0; i < s.data.length; i++) {
    const v = s.data[i];
    if (v < lo || v > hi) {
      if (first < 0) first = i;
      bad++;
    }
  }
  if (bad > 0) {
    const steps = s.days.length;
    throw new InputError(
      'impossible-value',
      s.provenance.file,
      `region ${s.region}, quantity ${s.quantity} (variable ${s.provenance.variable}): ${s.data[first]} ${units} on ${s.days[first % steps]} member ${Math.floor(first / steps) + 1} is outside the possible range ${lo}..${hi} ${units} (${bad} such values)`,
      'check the variable mapping, its units attribute and scale_factor/add_offset',
    );
  }
}

/** The series of `q`, checked; throws naming the missing quantity and what needs it. */
export function requireQuantity(inputs: ReadonlyMap<Quantity, RegionSeries>, q: Quantity, indicatorId: string, why: string): RegionSeries {
  const s = inputs.get(q);
  if (!s) {
    throw new ForelightError(
      'indicators',
      'missing-quantity',
      `indicator "${indicatorId}" needs quantity "${q}" (${why}) but the source provides none`,
      `map "${q}" to a variable in the source's variables, or remove the indicator from this tier`,
    );
  }
  checkSeries(s);
  return s;
}

/** Throws unless every series has the same days and members as the first. */
export function checkAligned(series: readonly RegionSeries[]): void {
  const [a, ...rest] = series;
  for (const b of rest) {
    if (b.members !== a.members || b.days.length !== a.days.length || b.days[0] !== a.days[0]) {
      throw new InputError(
        'misaligned',
        b.provenance.file,
        `region ${b.region}: quantity ${b.quantity} has ${b.members} members from ${b.days[0]} (${b.days.length} days) but ${a.quantity} has ${a.members} members from ${a.days[0]} (${a.days.length} days)`,
        'read all quantities of a source on the same members and days',
      );
    }
  }
}

/** Number of NaN values. */
export function countNaN(a: Float64Array): number {
  let n = 0;
  for (let i = 0; i < a.length; i++) if (Number.isNaN(a[i])) n++;
  return n;
}

/** NaN results whose raw inputs at the same position were all present: the formula's valid range was left. */
export function countOutOfRange(out: Float64Array, rawInputs: readonly Float64Array[]): number {
  let n = 0;
  for (let i = 0; i < out.length; i++) {
    if (!Number.isNaN(out[i])) continue;
    let present = true;
    for (const r of rawInputs) if (Number.isNaN(r[i])) present = false;
    if (present) n++;
  }
  return n;
}
