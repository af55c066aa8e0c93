/**
 * What `forelight extract … --json` prints: area-weighted means of ONE variable per region, member and step (or
 * local day), in canonical units when the variable is recognisably a temperature, humidity, precipitation or
 * wind (else in the file's own units), members in file order. Regions from `--box` or a boundary file.
 */
import type { PopulationConfig, RegionConfig } from '../config/types.ts';
import { ForelightError, InputError } from '../core/errors.ts';
import { regionClock } from '../core/local-clock.ts';
import { findCoordinates, layoutVariable } from './coordinates.ts';
import type { DailyMethod } from './daily.ts';
import type { Dataset, VariableInfo } from './dataset.ts';
import { planVariableTime, requestedMs } from './extract-plan.ts';
import { reduceVariable } from './extract-reduce.ts';
import { withDataset } from './open-dataset.ts';
import { oneStart } from './start-slice.ts';
import { planBand } from './regions-band.ts';
import { missingUnitsError, planUnits, type UnitPlan } from './units.ts';
import { regionSelection } from './weighted-selection.ts';

export interface RawRegionMeans {
  readonly units: string;
  readonly regions: { readonly id: string; readonly times: string[]; readonly members: (number | null)[][]; readonly cells: number }[];
  /** Regions without a cell on this grid (the others are computed). */
  readonly problems: ForelightError[];
}

/**
 * Means of `variable` over each region with cells (see module comment); `cacheDir` for the weights cache,
 * `population` for regions weighted by people.
 */
export async function rawRegionMeans(
  ds: Dataset,
  variable: string,
  regionList: readonly RegionConfig[],
  daily: DailyMethod | null,
  cacheDir: string | null,
  population: PopulationConfig | null = null,
  referenceTime?: string,
): Promise<RawRegionMeans> {
  const coords = await findCoordinates(ds);
  const { selected, problems } = await regionSelection(coords.grid, regionList, { population, cacheDir, file: ds.path });
  const layout = layoutVariable(ds, coords, variable);
  const unitPlan = canonicalUnitPlan(layout.info, ds.path);
  const { time } = await planVariableTime(ds, coords, layout, unitPlan, requestedMs(ds.path, referenceTime));
  const months = coords.time?.months ?? null;
  if (daily && !time.intervals) {
    throw new InputError(
      'time-missing',
      ds.path,
      `variable '${variable}' has no time axis`,
      'drop --daily or choose a variable with a CF time coordinate',
    );
  }
  const units = unitPlan?.units ?? layout.info.attributes.units;
  if (selected.length === 0) return { units: typeof units === 'string' ? units : '', regions: [], problems };
  const { band, regions } = planBand(
    selected.map((s) => s.cells),
    coords.grid.lat.length,
    coords.grid.lon.length,
  );
  const means = await reduceVariable(ds, coords, {
    layout,
    band,
    regions,
    time,
    unitPlan,
    clocks: selected.map((s) => regionClock(s.region)),
    daily: months ? null : daily,
  });
  return {
    units: typeof units === 'string' ? units : '',
    regions: means.map((mean, k) => {
      const steps = mean.labels.length;
      const members: (number | null)[][] = [];
      for (let m = 0; m < mean.data.length / steps; m++)
        members.push(Array.from(mean.data.subarray(m * steps, (m + 1) * steps), (v) => (v === v ? v : null)));
      const times = months ? months.months : mean.labels;
      return { id: selected[k].region.id, times: [...times], members, cells: selected[k].cells.weights.length };
    }),
    problems,
  };
}

/** `forelight extract FILE --var V --regions B.geojson --json`: one series set per region, same clock for all. */
export interface RegionsExtractJson {
  readonly units: string;
  readonly times: string[];
  readonly regions: Record<string, { readonly members: (number | null)[][]; readonly cells: number }>;
  /** One line per region left out (e.g. no grid cell); never silently dropped. */
  readonly problems: string[];
}

export function extractRegionsJson(
  path: string,
  variable: string,
  regions: readonly RegionConfig[],
  daily: DailyMethod | null,
  options: { readonly population?: PopulationConfig | null; readonly referenceTime?: string; readonly startIndex?: number } = {},
): Promise<RegionsExtractJson> {
  const { population = null, referenceTime, startIndex } = options;
  return withDataset(path, async (file) => {
    const ds = startIndex === undefined ? file : oneStart(file, startIndex, variable);
    const means = await rawRegionMeans(ds, variable, regions, daily, null, population, referenceTime);
    return {
      units: means.units,
      times: means.regions[0]?.times ?? [],
      regions: Object.fromEntries(means.regions.map((r) => [r.id, { members: r.members, cells: r.cells }])),
      problems: means.problems.map((p) => p.message),
    };
  });
}

/** Quantities tried, in order, to find a variable's canonical units for `extract` (standard_name breaks ties). */
const GUESS_ORDER = ['tmean', 'rh', 'precip', 'wind'] as const;

const NAME_PATTERNS: Readonly<Record<'tmean' | 'rh' | 'precip' | 'wind', RegExp>> = {
  tmean: /temperature/,
  rh: /relative_humidity/,
  precip: /precipitation|rain/,
  wind: /wind/,
};

/**
 * The conversion of a variable to canonical units (°C, %, mm/day, m/s) judged from its units and standard_name,
 * or null when it is none of those quantities (values are then printed in the file's own units).
 * @throws UnitError (the same line as `run` gives) when the variable has no units at all.
 */
export function canonicalUnitPlan(info: VariableInfo, file: string): UnitPlan | null {
  const units = info.attributes.units;
  const standardName = String(info.attributes.standard_name ?? '');
  if (typeof units !== 'string' || units.trim() === '') {
    const guess = GUESS_ORDER.find((q) => NAME_PATTERNS[q as keyof typeof NAME_PATTERNS].test(standardName)) ?? null;
    throw missingUnitsError(file, info.name, guess);
  }
  const fits = GUESS_ORDER.flatMap((q) => {
    try {
      return [planUnits(q, units, file, info.name)];
    } catch {
      return [];
    }
  });
  if (fits.length <= 1) return fits[0] ?? null;
  const byName = fits.find((p) => NAME_PATTERNS[p.quantity as keyof typeof NAME_PATTERNS].test(standardName));
  return byName ?? null;
}
