/**
 * One variable → area means of every region, member by member and, within a member, in time chunks of about
 * MAX_CHUNK_VALUES band values (a chunk closes at the first day boundary past it, never inside a day): read the union band once per chunk,
 * convert units in place, de-accumulate when needed, reduce each cell to local days, then take the
 * weighted mean over each region's cells. Missing cells are skipped and the weights renormalised per
 * member and step. No per-value objects.
 */
import { InputError } from '../core/errors.ts';
import type { LocalClock } from '../core/local-clock.ts';
import type { Dataset } from './dataset.ts';
import type { FileCoordinates, VariableLayout } from './coordinates.ts';
import { bandCellReader, type BandCellReader } from './extract-read.ts';
import {
  clampAccumulationNoise,
  deaccumulateInPlace,
  planLocalDays,
  reduceToDays,
  type DailyMethod,
  type DayPlan,
  type StepIntervals,
} from './daily.ts';
import type { BandRegion, GridBand } from './regions-band.ts';
import { convertInPlace, type UnitPlan } from './units.ts';

/** Band values per time chunk (× 8 bytes); a chunk may exceed it by up to one local day of steps. */
export const MAX_CHUNK_VALUES = 4_000_000;

export interface ReduceRequest {
  readonly layout: VariableLayout;
  readonly band: GridBand;
  readonly regions: readonly BandRegion[];
  /** Local clock of each region, same order. */
  readonly clocks: readonly LocalClock[];
  /** Step intervals (daily.ts `stepIntervals`, null without a time axis) and whether values accumulate: extract-plan.ts `TimePlan`. */
  readonly time: { readonly intervals: StepIntervals | null; readonly accumulated: boolean };
  /** Conversion to canonical units, or null to keep the file's units. */
  readonly unitPlan: UnitPlan | null;
  /** Daily reduction, or null to keep the file's time steps. */
  readonly daily: DailyMethod | null;
  /** Band values per time chunk (default MAX_CHUNK_VALUES). */
  readonly maxChunkValues?: number;
}

export interface RegionMeans {
  /** Local days (daily), or the steps' ISO instants (no daily reduction). */
  readonly labels: readonly string[];
  /** member-major [member][label], NaN where no valid cell. */
  readonly data: Float64Array;
}

/** ISO 8601 UTC text of an instant, whole seconds ("2026-11-23T06:00:00Z"). */
export function isoInstant(ms: number): string {
  return new Date(ms).toISOString().replace('.000Z', 'Z');
}

/** Chunk start steps (last entry = steps): a cut never separates two steps of one day in any plan. */
export function chunkStarts(steps: number, valuesPerStep: number, plans: readonly DayPlan[], maxValues = MAX_CHUNK_VALUES): number[] {
  const perChunk = Math.max(1, Math.floor(maxValues / Math.max(valuesPerStep, 1)));
  const starts = [0];
  for (let t = 1; t < steps; t++) {
    const canCut = plans.every((p) => p.dayOfStep[t - 1] < 0 || p.dayOfStep[t] !== p.dayOfStep[t - 1]);
    if (canCut && t - starts[starts.length - 1] >= perChunk) starts.push(t);
  }
  starts.push(steps);
  return starts;
}

/** Weighted mean of `region` over `rows` rows of `src` ([row][usedCell]) into labels `firstLabel`… of `member`. */
function regionMeans(
  src: Float64Array,
  bandCells: number,
  rows: number,
  region: BandRegion,
  out: RegionMeans,
  member: number,
  firstLabel: number,
): void {
  const { cells, weights } = region;
  const base = member * out.labels.length + firstLabel;
  for (let d = 0; d < rows; d++) {
    const row = d * bandCells;
    let sum = 0;
    let wsum = 0;
    for (let k = 0; k < cells.length; k++) {
      const v = src[row + cells[k]];
      if (v === v) {
        sum += weights[k] * v;
        wsum += weights[k];
      }
    }
    out.data[base + d] = wsum > 0 ? sum / wsum : NaN;
  }
}

/** Range of day indices of steps [t0, t1) in `plan`, or null when none is kept. */
function dayRange(plan: DayPlan, t0: number, t1: number): { first: number; days: number } | null {
  let first = Infinity;
  let last = -1;
  for (let t = t0; t < t1; t++) {
    const d = plan.dayOfStep[t];
    if (d < 0) continue;
    first = Math.min(first, d);
    last = Math.max(last, d);
  }
  return last < 0 ? null : { first, days: last - first + 1 };
}

/**
 * The band reads of every (member, chunk), taken in member-major order with up to `depth` reads in flight, so
 * that a threaded reader (NetCDF-4) decompresses ahead while this thread reduces. A failed read throws when its
 * turn comes; reads issued after it are left to settle unobserved.
 */
function readsAhead(
  read: BandCellReader,
  members: number,
  starts: readonly number[],
  depth: number,
): { next(m: number, c: number): Promise<Float64Array> } {
  const chunks = starts.length - 1;
  const inFlight = new Map<number, Promise<Float64Array>>();
  let issued = 0;
  const issue = (): void => {
    const m = Math.floor(issued / chunks);
    const c = issued % chunks;
    const p = read(m, starts[c], starts[c + 1] - starts[c]);
    p.catch(() => undefined); // observed when its turn comes
    inFlight.set(issued++, p);
  };
  return {
    next(m, c) {
      const turn = m * chunks + c;
      while (issued < Math.min(turn + Math.max(1, depth), members * chunks)) issue();
      const p = inFlight.get(turn)!;
      inFlight.delete(turn); // a taken read's values belong to the caller from here on
      return p;
    },
  };
}

/** A running accumulation that decreases is not one: name file, variable, member, step and the fix (tested on such a file). */
function accumulationDecrease(file: string, variable: string, member: number, step: number, validAt: string, byMm: number): InputError {
  return new InputError(
    'accumulation-decrease',
    file,
    `variable '${variable}' member index ${member} step ${step} (valid ${validAt}) is ${byMm.toPrecision(3)} mm below the step before, so it is not accumulated since the start`,
    `if it holds per-step totals, say so (ncatted -a cell_methods,${variable},o,c,"time: sum" ${file}); otherwise replace the file`,
  );
}

/** Area means of every region of `req`, all members, in the order of `req.regions`. */
export async function reduceVariable(ds: Dataset, coords: FileCoordinates, req: ReduceRequest): Promise<RegionMeans[]> {
  const { layout, band, regions } = req;
  const { intervals, accumulated } = req.time;
  const steps = layout.timeAxis >= 0 ? layout.info.shape[layout.timeAxis] : 1;
  const members = layout.memberAxis >= 0 ? layout.info.shape[layout.memberAxis] : 1;
  const bandCells = band.used.length;
  const keys = req.clocks.map((c) => c.key);
  const offsets = [...new Set(keys)];
  const plans = new Map<string, DayPlan>();
  if (req.daily && intervals) for (const c of req.clocks) if (!plans.has(c.key)) plans.set(c.key, planLocalDays(intervals, c));
  const stamps = layout.timeAxis >= 0 && coords.time ? Array.from(coords.time.stampsMs, isoInstant) : [''];
  const out: RegionMeans[] = regions.map((_r, k) => {
    const labels = plans.get(keys[k])?.days ?? stamps;
    return { labels, data: new Float64Array(members * labels.length) };
  });
  const starts = chunkStarts(steps, band.nLat * band.gridLon, [...plans.values()], req.maxChunkValues);
  const carry = new Float64Array(accumulated ? bandCells : 0);
  let dayBuffer = new Float64Array(0);
  const reads = readsAhead(bandCellReader(ds, layout, band), members, starts, ds.readAhead ?? 1);
  for (let m = 0; m < members; m++) {
    carry.fill(0);
    for (let c = 0; c + 1 < starts.length; c++) {
      const t0 = starts[c];
      const values = await reads.next(m, c);
      if (req.unitPlan) convertInPlace(values, req.unitPlan);
      if (accumulated) {
        deaccumulateInPlace(values, bandCells, carry);
        const drop = clampAccumulationNoise(values, bandCells);
        if (drop) throw accumulationDecrease(ds.path, layout.info.name, m, t0 + drop.row, stamps[t0 + drop.row], drop.by);
      }
      for (const o of offsets) {
        const plan = plans.get(o);
        let src = values;
        let rows = starts[c + 1] - t0;
        let firstLabel = t0;
        if (plan && req.daily) {
          const range = dayRange(plan, t0, starts[c + 1]);
          if (!range) continue;
          if (dayBuffer.length < range.days * bandCells) dayBuffer = new Float64Array(range.days * bandCells);
          reduceToDays(values, bandCells, plan, req.daily, dayBuffer, { firstStep: t0, firstDay: range.first, days: range.days });
          [src, rows, firstLabel] = [dayBuffer, range.days, range.first];
        }
        regions.forEach((r, k) => {
          if (keys[k] === o) regionMeans(src, bandCells, rows, r, out[k], m, firstLabel);
        });
      }
    }
  }
  return out;
}
