/**
 * The read stage: one opened file → per-region daily ensemble series in canonical units, in ONE pass
 * (each variable's union band is read once per member and serves every region). A bad region or variable
 * goes to `problems`; the others are still computed. A file whose forecast reference time differs from the
 * requested one is refused as a whole.
 */
import type { CellRule, PopulationConfig, RegionConfig } from '../config/types.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import { regionClock } from '../core/local-clock.ts';
import type { Quantity, RegionSeries, Tier } from '../types.ts';
import { findCoordinates, layoutVariable } from './coordinates.ts';
import type { Dataset } from './dataset.ts';
import type { DailyMethod } from './daily.ts';
import { accumulationNote } from './accumulation-probe.ts';
import { dailyMethodFor, planVariableTime, requestedMs } from './extract-plan.ts';
import { isoInstant, reduceVariable } from './extract-reduce.ts';
import { monthlyNote, requireMonthTier, spreadMeansToDays } from './monthly.ts';
import { withDataset } from './open-dataset.ts';
import { planBand } from './regions-band.ts';
import { rawRegionMeans } from './extract-raw.ts';
import { cellSeriesOf, regionSelection } from './weighted-selection.ts';
import { describeShape } from './regions.ts';
import { planUnits } from './units.ts';
import { entriesOf } from '../core/typed-entries.ts';
import { oneStart, requireStartsDimension } from './start-slice.ts';

export interface ExtractRequest {
  /** Canonical quantity → variable name in the file. */
  readonly quantities: Partial<Record<Quantity, string>>;
  readonly regions: readonly RegionConfig[];
  /** Expected forecast reference time (ISO 8601, e.g. from the file name); checked against the file. */
  readonly referenceTime?: string;
  /** Folder of the region-weights cache (region-weights.ts); absent = computed in this process only. */
  readonly weightsCacheDir?: string;
  /** The source's tier: a file of monthly values feeds only `months`. */
  readonly tier?: Tier;
  /** Files holding the next members of the same forecast, in member order (one file per member or member group). */
  readonly moreMembers?: readonly string[];
  /** The population raster, for regions whose `weighting` is `population`. */
  readonly population?: PopulationConfig | null;
  /** In a file holding several starts along a reference-time dimension: the index of the start to read (start-slice.ts). */
  readonly startIndex?: number;
}

export interface ExtractResult {
  readonly series: RegionSeries[];
  readonly problems: ForelightError[];
  /** How the file's times were read where a convention decided it (model calendar, monthly values), for run.json. */
  readonly notes: string[];
}

function keepOrRethrow(err: unknown, problems: ForelightError[]): void {
  if (err instanceof ForelightError) problems.push(err);
  else throw err;
}

/** Reads every requested quantity for every region from an opened dataset (see `extractRegionSeries`). */
export async function extractFromDataset(file: Dataset, request: ExtractRequest): Promise<ExtractResult> {
  const ds = request.startIndex === undefined ? file : oneStart(file, request.startIndex);
  const problems: ForelightError[] = [];
  const series: RegionSeries[] = [];
  const coords = await findCoordinates(ds);
  const wanted = requestedMs(ds.path, request.referenceTime);
  const notes = coords.calendarNote ? [`${ds.path}: ${coords.calendarNote}`] : [];
  const model = coords.modelCalendar;
  const {
    selected,
    cellRegions,
    problems: weightProblems,
  } = await regionSelection(coords.grid, request.regions, {
    population: request.population ?? null,
    cacheDir: request.weightsCacheDir ?? null,
    file: ds.path,
  });
  problems.push(...weightProblems);
  const { band, regions } = planBand(
    [...selected.map((s) => s.cells), ...cellRegions.map((c) => c.cells)],
    coords.grid.lat.length,
    coords.grid.lon.length,
  );
  if (regions.length === 0) return { series, problems, notes };
  for (const [quantity, variable] of entriesOf(request.quantities)) {
    try {
      const layout = layoutVariable(ds, coords, variable);
      if (request.startIndex !== undefined) requireStartsDimension(ds, layout.info);
      const units = layout.info.attributes.units;
      const unitPlan = planUnits(quantity, typeof units === 'string' ? units : undefined, ds.path, variable);
      const { time, byValues, referenceMs: refMs } = await planVariableTime(ds, coords, layout, unitPlan, wanted);
      if (byValues) notes.push(`${ds.path}: ${accumulationNote(variable)}`);
      if (refMs === null) {
        throw new InputError(
          'time-missing',
          ds.path,
          `variable '${variable}' has no time axis`,
          'map the quantity to a variable with a CF time coordinate',
        );
      }
      const months = coords.time?.months ?? null;
      if (months) requireMonthTier(ds.path, variable, request.tier);
      const reduced = await reduceVariable(ds, coords, {
        layout,
        band,
        regions,
        time,
        unitPlan,
        clocks: [...selected, ...cellRegions].map((s) => regionClock(s.region)),
        daily: months ? null : dailyMethodFor(quantity, unitPlan),
      });
      const all = months ? spreadMeansToDays(ds.path, variable, months, unitPlan.kind, reduced) : reduced;
      const means = all.slice(0, selected.length);
      if (months) notes.push(`${ds.path}: ${monthlyNote(variable, months, unitPlan.kind)}`);
      means.forEach((mean, k) => {
        const { region, cells } = selected[k];
        if (!mean.data.some((v) => v === v)) {
          problems.push(
            new InputError(
              'region-all-missing',
              ds.path,
              `every cell of region '${region.id}' (${describeShape(region.shape)}) is missing for '${variable}' (${quantity})`,
              'check the _FillValue/valid_range of the variable or the region box',
            ),
          );
          return;
        }
        const members = layout.memberAxis >= 0 ? layout.info.shape[layout.memberAxis] : 1;
        series.push({
          region: region.id,
          quantity,
          units: unitPlan.units,
          days: mean.labels,
          members,
          data: mean.data,
          cells: cells.weights.length,
          provenance: { file: ds.path, variable, referenceTime: isoInstant(refMs) },
          ...(region.weighting === 'population' ? { weighting: 'population' as const } : {}),
          ...(model && !months ? { modelCalendar: { calendar: model.calendar, days: mean.labels.map(model.dayOf) } } : {}),
          ...(region.keepCells ? { perCell: cellSeriesOf(cells.weights, all, selected.length, cellRegions, k) } : {}),
        });
      });
    } catch (err) {
      if (err instanceof InputError && err.code === 'reference-mismatch') throw err;
      keepOrRethrow(err, problems);
    }
  }
  return { series, problems, notes: [...new Set(notes)] };
}

/**
 * Reads one file for a set of regions: `extractRegionSeries` in this process, or a cluster's workers
 * (src/cluster/). `parallel`: how many calls the read stage may keep in flight (1 when absent).
 */
export interface Extractor {
  (path: string, request: ExtractRequest): Promise<ExtractResult>;
  readonly parallel?: number;
}

/**
 * Opens `path` and extracts per-region daily ensemble series for `request.quantities` (canonical units,
 * local days of each region). Bad regions/variables are returned in `problems`, the rest still computed.
 * @throws InputError when the file cannot be read, has no grid, or its reference time differs from `referenceTime`.
 */
export function extractRegionSeries(path: string, request: ExtractRequest): Promise<ExtractResult> {
  return withDataset(path, (ds) => extractFromDataset(ds, request), request.moreMembers);
}

export interface BoxExtractOptions {
  readonly variable: string;
  readonly box: { readonly south: number; readonly north: number; readonly west: number; readonly east: number };
  readonly daily?: DailyMethod;
  readonly utcOffsetHours?: number;
  /** IANA zone of local days (wins over utcOffsetHours). */
  readonly timeZone?: string;
  /** Default `centre` (the cells `cdo sellonlatbox` takes). */
  readonly cellRule?: CellRule;
  /** The forecast's reference time (ISO date or instant), as `run` takes it from the file name; checked against the file. */
  readonly referenceTime?: string;
  /** In a file holding several starts along a reference-time dimension: the index of the start to read (start-slice.ts). */
  readonly startIndex?: number;
}

/** What `forelight extract … --json` prints: values in the file's own units, members in file order. */
export interface BoxExtractJson {
  readonly units: string;
  /** ISO instants of the steps, local dates with `daily`, or months `YYYY-MM` of a monthly-mean file. */
  readonly times: string[];
  /** [member][time], null where the member has no valid cell. */
  readonly members: (number | null)[][];
  readonly cells: number;
}

/** Area-weighted box mean of one variable of an opened dataset, per member and step (or local day). */
export async function extractBoxFromDataset(ds: Dataset, opts: BoxExtractOptions): Promise<BoxExtractJson> {
  const region: RegionConfig = {
    id: 'box',
    name: 'box',
    shape: { kind: 'box', ...opts.box },
    utcOffsetHours: opts.utcOffsetHours ?? 0,
    ...(opts.timeZone ? { timeZone: opts.timeZone } : {}),
    teams: [],
    cellRule: opts.cellRule ?? 'centre',
  };
  const means = await rawRegionMeans(ds, opts.variable, [region], opts.daily ?? null, null, null, opts.referenceTime);
  if (means.problems.length > 0) throw means.problems[0];
  const [r] = means.regions;
  return { units: means.units, times: r.times, members: r.members, cells: r.cells };
}

/** `forelight extract <file> --var … --box S,N,W,E [--daily m] [--utc-offset h] --json`: opens, extracts, closes. */
export function extractBoxJson(path: string, opts: BoxExtractOptions): Promise<BoxExtractJson> {
  return withDataset(path, (ds) =>
    extractBoxFromDataset(opts.startIndex === undefined ? ds : oneStart(ds, opts.startIndex, opts.variable), opts),
  );
}
