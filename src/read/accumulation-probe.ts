/**
 * Precipitation in mm or kg m-2 that states neither time bounds, a `cell_methods` time method nor cfgrib's
 * `GRIB_stepType`: per-period totals or a running accumulation since the start? Decided by the values, as issue
 * rule "monotone non-decreasing with a step-0 or implied zero" puts it (src/read/DECISIONS.md §2, rule 4): an
 * accumulation when, over the whole grid and every member, no value falls below the step before (beyond the
 * packing noise of daily.ts), the step-0 field (a stamp at the reference time) is zero, at least one value rises,
 * and at least 3 steps follow the reference. Otherwise totals. Common practice, no source.
 */
import { timeCellMethod } from './cell-methods.ts';
import { decodeCf } from './cf-decode.ts';
import type { FileCoordinates, VariableLayout } from './coordinates.ts';
import { ACCUMULATION_NOISE_MM } from './daily.ts';
import type { Dataset } from './dataset.ts';
import type { UnitPlan } from './units.ts';

/** Fewer steps after the reference than this say too little: read as totals. */
export const MIN_STEPS_TO_JUDGE = 3;

/** Whether the variable is an unlabelled amount whose period semantics only its values can tell. */
export function isUnlabelledAmount(coords: FileCoordinates, layout: VariableLayout, unitPlan: UnitPlan | null): boolean {
  const time = coords.time;
  if (unitPlan?.kind !== 'amount' || !time || layout.timeAxis < 0 || time.boundsMs) return false;
  return timeCellMethod(layout.info, time) === null && layout.info.attributes.GRIB_stepType === undefined;
}

/** True when the unlabelled amount never decreases from a zero start (module comment); reads one step at a time. */
export async function valuesAccumulate(
  ds: Dataset,
  coords: FileCoordinates,
  layout: VariableLayout,
  unitPlan: UnitPlan | null,
  referenceHintMs: number | null,
): Promise<boolean> {
  if (!isUnlabelledAmount(coords, layout, unitPlan)) return false;
  const stamps = coords.time!.stampsMs;
  const referenceMs = coords.referenceMs ?? referenceHintMs;
  const stepZero = referenceMs !== null && stamps[0] === referenceMs;
  if (stamps.length - (stepZero ? 1 : 0) < MIN_STEPS_TO_JUDGE) return false;
  const { info } = layout;
  const members = layout.memberAxis >= 0 ? info.shape[layout.memberAxis] : 1;
  const count = info.shape.map((n, k) => (k === layout.timeAxis || k === layout.memberAxis ? 1 : n));
  const scale = unitPlan!.scale;
  let rises = false;
  for (let m = 0; m < members; m++) {
    let previous: Float64Array | null = null;
    for (let t = 0; t < stamps.length; t++) {
      const start = info.shape.map((_n, k) => (k === layout.timeAxis ? t : k === layout.memberAxis ? m : 0));
      const values = decodeCf(info, await ds.readRaw(info.name, start, count)).values;
      for (let i = 0; i < values.length; i++) {
        const v = values[i] * scale;
        if (v !== v) continue;
        const before = previous ? previous[i] * scale : 0;
        if (t === 0 && stepZero ? Math.abs(v) > ACCUMULATION_NOISE_MM : v < before - ACCUMULATION_NOISE_MM) return false;
        if (before === before && v > before + ACCUMULATION_NOISE_MM) rises = true;
      }
      if (previous) for (let i = 0; i < values.length; i++) if (values[i] !== values[i]) values[i] = previous[i];
      previous = values;
    }
  }
  return rises;
}

/** The run.json note for a variable read as accumulated by its values. */
export function accumulationNote(variable: string): string {
  return `'${variable}' states no period (no time bounds, cell_methods or GRIB_stepType) and never decreases from a zero start: read as accumulated since the start and differenced step by step`;
}
