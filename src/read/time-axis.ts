/**
 * The time axis and forecast reference time of a CF-style file (CF Conventions 1.11 §4.4: time `axis: T` or
 * `<units> since <date>`, forecast_reference_time and forecast_period; §7.1 bounds), in ms on the file's own
 * calendar (coordinates-time.ts), with the model months of a monthly file (monthly.ts, lead-months.ts).
 */
import { InputError, UnitError } from '../core/errors.ts';
import { attr, readBounds, readWhole } from './cf-variable.ts';
import { decodeTimes, type CfDateTime } from './cf-time.ts';
import { looksLikeGrib } from './grib-convert.ts';
import { durationUnitMs, TimeMapper } from './coordinates-time.ts';
import type { Dataset, VariableInfo } from './dataset.ts';
import { countsMonths, isMonthIndex, monthLeadAxis } from './lead-months.ts';
import { detectMonths, type MonthSteps } from './monthly.ts';
import type { TimeAxis } from './time-axis-shape.ts';

const LEAD_NAMES = ['step', 'forecast_period', 'lead_time', 'leadtime', 'lead'];
const REFERENCE_NAMES = ['forecast_reference_time', 'reftime', 'reference_time'];

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

export async function findReference(ds: Dataset, mapper: TimeMapper): Promise<number | null> {
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
  const ref = referenceVariable(ds);
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

export async function findTime(ds: Dataset, referenceMs: number | null, mapper: TimeMapper): Promise<TimeAxis | null> {
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
