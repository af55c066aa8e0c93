/**
 * Finds the coordinates of a CF-style file by their attributes, not their names (CF Conventions 1.x §4:
 * latitude units `degrees_north` / standard_name `latitude` / `axis: Y`, longitude `degrees_east` /
 * `longitude` / `axis: X`, time `axis: T` / `<units> since <date>`; §4.4 forecast_reference_time and
 * forecast_period; §7.1 cell boundaries through the `bounds` attribute; §7.3 `cell_methods`).
 * Names (`lat`, `step`, `number`, …) are only a last resort. The time axis and reference time: time-axis.ts.
 */
import { InputError } from '../core/errors.ts';
import { shellWord } from '../core/shell-command.ts';
import { attr, readBounds, readWhole } from './cf-variable.ts';
import type { Dataset, VariableInfo } from './dataset.ts';
import { gribSelectionHint, looksLikeGrib } from './grib-convert.ts';
import { requireIncreasingSteps, TimeMapper, type FileModelCalendar } from './coordinates-time.ts';
import { findReference, findTime } from './time-axis.ts';
import type { TimeAxis } from './time-axis-shape.ts';

export interface LatLonGrid {
  readonly latName: string;
  readonly lonName: string;
  /** Cell centres in degrees as stored (latitude ascending or descending, longitude 0..360 or -180..180). */
  readonly lat: Float64Array;
  readonly lon: Float64Array;
  /** `[n][2]` cell bounds in degrees from the `bounds` attribute, or null when the file has none. */
  readonly latBounds: Float64Array | null;
  readonly lonBounds: Float64Array | null;
}

export interface FileCoordinates {
  readonly file: string;
  readonly grid: LatLonGrid;
  readonly time: TimeAxis | null;
  /** forecast_reference_time (ms) when the file states it. */
  readonly referenceMs: number | null;
  readonly member: { readonly dimension: string; readonly size: number } | null;
  /** How model-calendar times were placed on real dates (coordinates-time.ts), or null for Gregorian files. */
  readonly calendarNote: string | null;
  /** The model calendar and the model date of a real local day (coordinates-time.ts), or null for Gregorian files. */
  readonly modelCalendar: FileModelCalendar | null;
}

/** Where each coordinate sits among a data variable's dimensions (-1 = absent). */
export interface VariableLayout {
  readonly info: VariableInfo;
  readonly latAxis: number;
  readonly lonAxis: number;
  readonly timeAxis: number;
  readonly memberAxis: number;
}

const MEMBER_NAMES = ['number', 'realization', 'realisation', 'member', 'members', 'ensemble', 'ens', 'member_id', 'ensemble_member'];
function hasUnits(info: VariableInfo, accepted: readonly string[]): boolean {
  const u = attr(info, 'units')?.toLowerCase();
  return u !== undefined && accepted.includes(u);
}

const LAT_UNITS = ['degrees_north', 'degree_north', 'degree_n', 'degrees_n', 'degreen', 'degreesn'];
const LON_UNITS = ['degrees_east', 'degree_east', 'degree_e', 'degrees_e', 'degreee', 'degreese'];

/** First variable passing the tests in priority order (attribute tests before name tests). */
function pick(ds: Dataset, tests: readonly ((v: VariableInfo) => boolean)[]): VariableInfo | undefined {
  for (const test of tests) {
    const found = ds.variables.find(test);
    if (found) return found;
  }
  return undefined;
}

function findAxisVariable(ds: Dataset, axis: 'X' | 'Y'): VariableInfo {
  const standard = axis === 'Y' ? 'latitude' : 'longitude';
  const units = axis === 'Y' ? LAT_UNITS : LON_UNITS;
  const names = axis === 'Y' ? ['lat', 'latitude', 'y'] : ['lon', 'longitude', 'x'];
  const tests = [
    (v: VariableInfo) => attr(v, 'standard_name') === standard,
    (v: VariableInfo) => hasUnits(v, units),
    (v: VariableInfo) => attr(v, 'axis')?.toUpperCase() === axis,
    (v: VariableInfo) => names.includes(v.name.toLowerCase()),
  ];
  // 1-D coordinates first, so that e.g. a `lat_bnds` carrying units degrees_north is never taken for them.
  const found = pick(
    ds,
    tests.map((t) => (v: VariableInfo) => v.dimensions.length === 1 && t(v)),
  );
  if (found) return found;
  const curvilinear = pick(
    ds,
    tests.slice(0, 2).map((t) => (v: VariableInfo) => v.dimensions.length === 2 && t(v)),
  );
  if (curvilinear) {
    throw new InputError(
      'grid-unsupported',
      ds.path,
      `${standard} variable '${curvilinear.name}' has 2 dimensions (curvilinear grid)`,
      `regrid it to a regular latitude-longitude grid first (e.g. cdo remapbil,r360x180 ${ds.path} regular.nc for 1°; pick the resolution of the source)`,
    );
  }
  throw new InputError(
    'no-coordinate',
    ds.path,
    `no ${standard} coordinate (standard_name ${standard} or units ${units[0]})`,
    `add CF attributes to the ${standard} variable, naming it for <var> (e.g. ncatted -a units,<var>,o,c,${units[0]} ${shellWord(ds.path)})`,
  );
}

function findMember(ds: Dataset): FileCoordinates['member'] {
  const byStandard = ds.variables.find((v) => attr(v, 'standard_name') === 'realization' && v.dimensions.length === 1);
  const dimName = byStandard?.dimensions[0] ?? ds.dimensions.find((d) => MEMBER_NAMES.includes(d.name.toLowerCase()))?.name;
  const dim = ds.dimensions.find((d) => d.name === dimName);
  return dim ? { dimension: dim.name, size: dim.size } : null;
}

/** Reads the grid, time axis, reference time and ensemble dimension of an opened file. */
export async function findCoordinates(ds: Dataset): Promise<FileCoordinates> {
  const latInfo = findAxisVariable(ds, 'Y');
  const lonInfo = findAxisVariable(ds, 'X');
  const lat = await readWhole(ds, latInfo);
  const lon = await readWhole(ds, lonInfo);
  const grid: LatLonGrid = {
    latName: latInfo.dimensions[0],
    lonName: lonInfo.dimensions[0],
    lat,
    lon,
    latBounds: await readBounds(ds, latInfo, lat.length),
    lonBounds: await readBounds(ds, lonInfo, lon.length),
  };
  const mapper = new TimeMapper();
  const referenceMs = await findReference(ds, mapper);
  const time = await findTime(ds, referenceMs, mapper);
  if (time) requireIncreasingSteps(ds.path, time, / since /i.test(attr(ds.variable(time.variable)!, 'units') ?? ''));
  return {
    file: ds.path,
    grid,
    time,
    referenceMs,
    member: findMember(ds),
    calendarNote: mapper.note(),
    modelCalendar: mapper.modelCalendar(),
  };
}

/**
 * Locates the coordinates among `name`'s dimensions. Any other dimension must have size 1.
 * @throws InputError when the variable is absent, lacks latitude/longitude, or has a larger extra dimension.
 */
export function layoutVariable(ds: Dataset, coords: FileCoordinates, name: string): VariableLayout {
  const info = ds.variable(name);
  if (!info) {
    const names = ds.variables
      .filter((v) => v.dimensions.includes(coords.grid.latName) && v.dimensions.includes(coords.grid.lonName))
      .map((v) => v.name)
      .join(', ');
    throw new InputError('variable-missing', ds.path, `no variable '${name}'`, `map the quantity to one of: ${names}`);
  }
  const dims = info.dimensions;
  const layout: VariableLayout = {
    info,
    latAxis: dims.indexOf(coords.grid.latName),
    lonAxis: dims.indexOf(coords.grid.lonName),
    timeAxis: coords.time ? dims.indexOf(coords.time.dimension) : -1,
    memberAxis: coords.member ? dims.indexOf(coords.member.dimension) : -1,
  };
  if (layout.latAxis < 0 || layout.lonAxis < 0) {
    throw new InputError(
      'variable-not-gridded',
      ds.path,
      `variable '${name}' (${dims.join(', ')}) is not on the latitude-longitude grid`,
      'map the quantity to a gridded variable',
    );
  }
  const known = new Set([layout.latAxis, layout.lonAxis, layout.timeAxis, layout.memberAxis]);
  dims.forEach((d, k) => {
    if (!known.has(k) && info.shape[k] !== 1) {
      throw new InputError(
        'variable-extra-dimension',
        ds.path,
        `variable '${name}' has extra dimension '${d}' of size ${info.shape[k]}`,
        looksLikeGrib(ds.path, Buffer.alloc(0))
          ? gribSelectionHint(ds.path, d)
          : `select one ${d} first (ncks -d ${d},0 ${ds.path} out.nc keeps the first; cdo cannot select it in an ensemble file)`,
      );
    }
  });
  return layout;
}
