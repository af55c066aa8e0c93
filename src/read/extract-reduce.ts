/**
 * One variable → area means of every region, member by member: read the union band once per member (all
 * time steps), convert units in place, de-accumulate when needed, reduce each cell to local days, then
 * take the weighted mean over each region's cells. Missing cells are skipped and the weights renormalised
 * per member and step. Buffers are reused across members; no per-value objects.
 */
import type { Dataset } from './dataset.ts';
import type { FileCoordinates, VariableLayout } from './coordinates.ts';
import { readBandSlab } from './extract-read.ts';
import { deaccumulateInPlace, planLocalDays, reduceToDays, type DailyMethod, type DayPlan, type StepIntervals } from './daily.ts';
import type { BandRegion, GridBand } from './regions-band.ts';
import { convertInPlace, type UnitPlan } from './units.ts';

export interface ReduceRequest {
  readonly layout: VariableLayout;
  readonly band: GridBand;
  readonly regions: readonly BandRegion[];
  /** utcOffsetHours of each region, same order. */
  readonly utcOffsets: readonly number[];
  /** Step intervals (daily.ts `stepIntervals`), or null when the variable has no time axis. */
  readonly intervals: StepIntervals | null;
  /** Conversion to canonical units, or null to keep the file's units. */
  readonly unitPlan: UnitPlan | null;
  readonly accumulated: boolean;
  /** Daily reduction, or null to keep the file's time steps. */
  readonly daily: DailyMethod | null;
}

export interface RegionMeans {
  /** Local days (daily) or step stamps in ms as ISO strings (no daily reduction), per region. */
  readonly labels: readonly string[];
  /** member-major [member][label], NaN where no valid cell. */
  readonly data: Float64Array;
}

/** ISO 8601 UTC text of an instant, whole seconds ("2026-11-23T06:00:00Z"). */
export function isoInstant(ms: number): string {
  return new Date(ms).toISOString().replace('.000Z', 'Z');
}

/** Weighted mean of each region over `src` ([label][bandCell]) into `out[member * labels + label]`. */
function regionMeans(src: Float64Array, bandCells: number, labels: number, region: BandRegion, out: Float64Array, member: number): void {
  const { cells, weights } = region;
  for (let d = 0; d < labels; d++) {
    const base = d * bandCells;
    let sum = 0;
    let wsum = 0;
    for (let k = 0; k < cells.length; k++) {
      const v = src[base + cells[k]];
      if (v === v) {
        sum += weights[k] * v;
        wsum += weights[k];
      }
    }
    out[member * labels + d] = wsum > 0 ? sum / wsum : NaN;
  }
}

/** Area means of every region of `req`, all members, in the order of `req.regions`. */
export async function reduceVariable(ds: Dataset, coords: FileCoordinates, req: ReduceRequest): Promise<RegionMeans[]> {
  const { layout, band, regions, intervals } = req;
  const steps = layout.timeAxis >= 0 ? layout.info.shape[layout.timeAxis] : 1;
  const members = layout.memberAxis >= 0 ? layout.info.shape[layout.memberAxis] : 1;
  const bandCells = band.nLat * band.nLon;
  const offsets = [...new Set(req.utcOffsets)];
  const plans = new Map<number, DayPlan>();
  if (req.daily && intervals) for (const o of offsets) plans.set(o, planLocalDays(intervals, o));
  const stamps = layout.timeAxis >= 0 && coords.time ? Array.from(coords.time.stampsMs, isoInstant) : [''];
  const labelsOf = (o: number): readonly string[] => plans.get(o)?.days ?? stamps;
  const out = regions.map((_r, k) => {
    const labels = labelsOf(req.utcOffsets[k]);
    return { labels, data: new Float64Array(members * labels.length) };
  });
  const dayBuffers = new Map<number, Float64Array>();
  for (const [o, plan] of plans) dayBuffers.set(o, new Float64Array(plan.days.length * bandCells));
  for (let m = 0; m < members; m++) {
    const values = await readBandSlab(ds, layout, band, m, steps);
    if (req.unitPlan) convertInPlace(values, req.unitPlan);
    if (req.accumulated) deaccumulateInPlace(values, steps, bandCells);
    for (const o of offsets) {
      const plan = plans.get(o);
      const buffer = dayBuffers.get(o);
      let src = values;
      if (plan && buffer && req.daily) {
        reduceToDays(values, bandCells, plan, req.daily, buffer);
        src = buffer;
      }
      regions.forEach((r, k) => {
        if (req.utcOffsets[k] === o) regionMeans(src, bandCells, out[k].labels.length, r, out[k].data, m);
      });
    }
  }
  return out;
}
