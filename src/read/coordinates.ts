/**
 * Finds the coordinates of a CF-style file by their attributes, not their names (CF Conventions 1.x §4:
 * latitude units `degrees_north` / standard_name `latitude` / `axis: Y`, longitude `degrees_east` /
 * `longitude` / `axis: X`, time `axis: T` / `<units> since <date>`; §4.4 forecast_reference_time and
 * forecast_period; §7.1 cell boundaries through the `bounds` attribute; §7.3 `cell_methods`).
 * Names (`lat`, `step`, `number`, …) are only a last resort.
 */
import { InputError, UnitError } from '../core/errors.ts';
import type { Dataset, VariableInfo } from './dataset.ts';
import { gribSelectionHint, looksLikeGrib } from './grib-convert.ts';
import { durationUnitMs, requireIncreasingSteps, TimeMapper, type FileModelCalendar } from './coordinates-time.ts';
import { decodeTimes, type CfDateTime } from './cf-time.ts';
import { countsMonths, isMonthIndex, monthLeadAxis } from './lead-months.ts';
import { detectMonths, type MonthSteps } from './monthly.ts';
import { decodeCf } from './cf-decode.ts';

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
const LEAD_NAMES = ['step', 'forecast_period', 'lead_time', 'leadtime', 'lead'];
const REFERENCE_NAMES = ['forecast_reference_time', 'reftime', 'reference_time'];

function attr(info: VariableInfo, key: string): string | undefined {
  const v = info.attributes[key];
  return typeof v === 'string' ? v.trim() : undefined;
}

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
    `add CF attributes to the ${standard} variable (e.g. ncatted -a units,<var>,o,c,${units[0]})`,
  );
}

/** All CF-decoded values of a (small, coordinate) variable. */
async function readWhole(ds: Dataset, info: VariableInfo): Promise<Float64Array> {
  return decodeCf(
    info,
    await ds.readRaw(
      info.name,
      info.shape.map(() => 0),
      info.shape,
    ),
  ).values;
}

async function readBounds(ds: Dataset, info: VariableInfo, n: number): Promise<Float64Array | null> {
  const name = attr(info, 'bounds');
  const b = name === undefined ? undefined : ds.variable(name);
  if (!b || b.shape.length !== 2 || b.shape[0] !== n || b.shape[1] !== 2) return null;
  return readWhole(ds, b);
}

function isTimeLike(v: VariableInfo): boolean {
  return attr(v, 'axis')?.toUpperCase() === 'T' || attr(v, 'standard_name') === 'time' || / since /i.test(attr(v, 'units') ?? '');
}

function isReference(v: VariableInfo): boolean {
  return attr(v, 'standard_name') === 'forecast_reference_time' || REFERENCE_NAMES.includes(v.name.toLowerCase());
}

function isLead(v: VariableInfo): boolean {
  const units = attr(v, 'units') ?? '';
  return (
    v.dimensions.length === 1 &&
    !/ since /i.test(units) &&
    (attr(v, 'standard_name') === 'forecast_period' || LEAD_NAMES.includes(v.name.toLowerCase()))
  );
}

async function decodeTimeVariable(
  ds: Dataset,
  mapper: TimeMapper,
  info: VariableInfo,
  unitsFrom: VariableInfo = info,
): Promise<Float64Array> {
  const raw = await readWhole(ds, info);
  return mapper.toMs(raw, attr(unitsFrom, 'units') ?? '', attr(unitsFrom, 'calendar'), ds.path, info.name);
}

/**
 * A reference time given only as an ISO 8601 attribute (`forecast_reference_time` or `reference_time`) of the lead
 * variable or of the file, as some portals write it beside a `lead_time` axis (common practice, no source).
 */
function referenceAttribute(ds: Dataset): number | null {
  const lead = ds.variables.find(isLead);
  for (const key of REFERENCE_NAMES) {
    const value = (lead ? attr(lead, key) : undefined) ?? ds.attributes[key];
    const ms = typeof value === 'string' ? Date.parse(/[zZ]|[+-]\d\d:?\d\d$/.test(value) ? value : `${value.replace(' ', 'T')}Z`) : NaN;
    if (!Number.isNaN(ms)) return ms;
  }
  return null;
}

/** The forecast reference time variable of a file: its name, dimension (none when scalar) and its times (ms). */
export interface ReferenceTimes {
  readonly variable: string;
  readonly dimension: string | null;
  readonly timesMs: Float64Array;
}

/** The file's forecast reference time variable (CF 1.11 §4.4: standard_name forecast_reference_time, with time units), if any. */
export function referenceVariable(ds: Dataset): VariableInfo | undefined {
  return ds.variables.find((v) => isReference(v) && / since /i.test(attr(v, 'units') ?? ''));
}

/** The file's forecast reference times (CF 1.11 §4.4, standard_name forecast_reference_time), or null. */
export async function referenceTimesOf(ds: Dataset, mapper = new TimeMapper()): Promise<ReferenceTimes | null> {
  const ref = referenceVariable(ds);
  if (!ref) return null;
  return { variable: ref.name, dimension: ref.dimensions[0] ?? null, timesMs: await decodeTimeVariable(ds, mapper, ref) };
}

/**
 * The one-line fix for a forecast file holding several starts: one `ncks` hyperslab per start (tested on cfgrib's
 * layout). `hindcast-files` reads such a file as it is (src/pipeline/hindcast-list.ts).
 */
export function splitStartsFix(file: string, ref: ReferenceTimes): string {
  const compact = (ms: number) => new Date(ms).toISOString().slice(0, 10).replaceAll('-', '');
  const n = ref.timesMs.length;
  const stem = file.replace(/\.[^./]*$/, '');
  if (looksLikeGrib(file, Buffer.alloc(0)))
    return (
      `split it into one file per start with ecCodes: grib_copy ${file} '${stem}_[dataDate].grib2', and point forecast-files at ` +
      `${stem}_{date}.grib2 (hindcast-files reads such a file as it is; forelight extract --start K reads start K)`
    );
  return (
    `split it into one file per start, e.g. ncks -d ${ref.dimension},K,K ${file} ${stem}_YYYYMMDD.nc for each start K ` +
    `(0 = ${compact(ref.timesMs[0])} … ${n - 1} = ${compact(ref.timesMs[n - 1])}), and point forecast-files at ${stem}_{date}.nc ` +
    '(hindcast-files reads such a file as it is; forelight extract --start K reads start K)'
  );
}

async function findReference(ds: Dataset, mapper: TimeMapper): Promise<number | null> {
  const ref = await referenceTimesOf(ds, mapper);
  if (!ref) return referenceAttribute(ds);
  if (ref.timesMs.length !== 1) {
    throw new InputError(
      'reference-several',
      ds.path,
      `'${ref.variable}' holds ${ref.timesMs.length} forecast reference times (one file of several starts)`,
      splitStartsFix(ds.path, ref),
    );
  }
  return ref.timesMs[0];
}

/** Model months of an absolute time axis (monthly.ts), from its values in the file's own calendar. */
async function monthsOf(
  ds: Dataset,
  time: VariableInfo,
  boundsInfo: VariableInfo | undefined,
  referenceMs: number | null,
  stampsMs: Float64Array,
): Promise<MonthSteps | null> {
  const units = attr(time, 'units') ?? '';
  const calendar = attr(time, 'calendar');
  const stamps = decodeTimes(await readWhole(ds, time), units, calendar);
  const bounds = boundsInfo
    ? decodeTimes(await readWhole(ds, boundsInfo), attr(boundsInfo, 'units') ?? units, attr(boundsInfo, 'calendar') ?? calendar)
    : null;
  return detectMonths(stamps, bounds, referenceMs, stampsMs);
}

/**
 * The reference time as a date of its own calendar (the `calendar` of `forecast_reference_time`; the Gregorian
 * date of an ISO 8601 reference attribute), from which lead axes count model days and months.
 */
async function referenceOrigin(ds: Dataset, referenceMs: number): Promise<CfDateTime> {
  const ref = ds.variables.find((v) => isReference(v) && / since /i.test(attr(v, 'units') ?? ''));
  if (ref) return decodeTimes(await readWhole(ds, ref), attr(ref, 'units') ?? '', attr(ref, 'calendar'))[0];
  return decodeTimes([referenceMs / 1000], 'seconds since 1970-01-01 00:00:00')[0];
}

/**
 * Model months of a lead axis (forecast_period in hours or days, monthly bounds or mid-month steps): the leads
 * counted from the reference time in the reference's own calendar, then judged as for an absolute axis (monthly.ts).
 */
function leadMonthsOf(
  lead: VariableInfo,
  leads: Float64Array,
  bounds: Float64Array | null,
  origin: CfDateTime,
  referenceMs: number,
  stampsMs: Float64Array,
): MonthSteps | null {
  const since = `${attr(lead, 'units') ?? ''} since ${origin.toIsoString().replace('T', ' ')}`;
  try {
    const decode = (values: Float64Array) => decodeTimes(values, since, origin.calendar);
    return detectMonths(decode(leads), bounds && decode(bounds), referenceMs, stampsMs);
  } catch (err) {
    if (err instanceof UnitError) return null; // a lead unit CF time units do not spell (e.g. "h"): daily steps, as read before
    throw err;
  }
}

async function findTime(ds: Dataset, referenceMs: number | null, mapper: TimeMapper): Promise<TimeAxis | null> {
  const lead = ds.variables.find((v) => isLead(v) || isMonthIndex(v));
  const inMonths = lead !== undefined && (isMonthIndex(lead) || countsMonths(lead));
  if (lead && inMonths && referenceMs === null) {
    throw new InputError(
      'time-missing',
      ds.path,
      `lead '${lead.name}' counts months but the file states no forecast reference time to count them from`,
      'add a forecast_reference_time variable or a global forecast_reference_time attribute (ISO 8601)',
    );
  }
  if (lead && referenceMs !== null) {
    const origin = await referenceOrigin(ds, referenceMs);
    const bounds = await readBounds(ds, lead, lead.shape[0]);
    const leads = await readWhole(ds, lead);
    if (inMonths) return monthLeadAxis(ds.path, lead, leads, bounds, origin, referenceMs);
    const unitMs = durationUnitMs(attr(lead, 'units') ?? '', ds.path, lead.name);
    const toMs = (values: Float64Array): Float64Array => values.map((x) => Math.round(referenceMs + x * unitMs));
    const stampsMs = toMs(leads);
    return {
      dimension: lead.dimensions[0],
      variable: lead.name,
      stampsMs,
      boundsMs: bounds && toMs(bounds),
      months: leadMonthsOf(lead, leads, bounds, origin, referenceMs, stampsMs),
    };
  }
  const candidates = ds.variables.filter((v) => v.dimensions.length === 1 && isTimeLike(v) && !isReference(v) && !isLead(v));
  const time = candidates.find((v) => v.dimensions[0] === v.name) ?? candidates[0];
  if (!time) return null;
  const stampsMs = await decodeTimeVariable(ds, mapper, time);
  const boundsName = attr(time, 'bounds');
  const found = boundsName === undefined ? undefined : ds.variable(boundsName);
  const boundsInfo = found && found.shape.length === 2 && found.shape[1] === 2 ? found : undefined;
  const boundsMs = boundsInfo ? await decodeTimeVariable(ds, mapper, boundsInfo, attr(boundsInfo, 'units') ? boundsInfo : time) : null;
  const months = await monthsOf(ds, time, boundsInfo, referenceMs, stampsMs);
  return { dimension: time.dimensions[0], variable: time.name, stampsMs, boundsMs, months };
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
