/**
 * Writes CF-1.8 gridded daily files (CF Conventions 1.8, Eaton et al. 2020: coordinate variables §4,
 * time §4.4, cell boundaries §7.1, cell methods §7.3, packed data §8.1, ensemble `realization` axis §4.5 /
 * standard-name table; the variables' metadata and packing in cf-variables.ts) through the streaming classic
 * writer. Two shapes:
 *  - ensemble forecast: (time, number, lat, lon) — time first, as CDO requires — fixed time axis, scalar
 *    `forecast_reference_time`;
 *  - observed: (time, lat, lon) with an unlimited time axis.
 * Daily values are stamped either at mid-day (hours 12, 36, …) with `time_bnds` giving the 00–24 UTC day, or
 * (`stamps: 'day-end'`, the usual forecast-centre encoding) at the end of each day (24, 48, …) without bounds.
 */
import { rename, rm } from 'node:fs/promises';
import { coordinateSpecs, toStored, variableSpec, type CfVariableDef } from './cf-variables.ts';
import { createNetcdfClassic, type NcFormat, type NcVariableSpec, type NetcdfClassicWriter } from './netcdf-classic-writer.ts';

export interface GridSpec {
  /** Cell-centre latitudes (degrees_north), in file order. */
  readonly lats: Float64Array;
  /** Cell-centre longitudes (degrees_east), in file order. */
  readonly lons: Float64Array;
}

/** Degrees from `first` in `n` steps of `step` (negative step = descending). */
export function axis(first: number, step: number, n: number): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => Math.round((first + i * step) * 1e6) / 1e6);
}

export interface CfFileDef {
  readonly format: NcFormat;
  readonly grid: GridSpec;
  /** UTC midnight of the first day (and the forecast reference time for an ensemble). */
  readonly start: Date;
  readonly days: number;
  /** Time stamps: mid-day with time_bnds (default), or end of each day without bounds. */
  readonly stamps?: 'midday-bounds' | 'day-end';
  readonly variables: readonly CfVariableDef[];
  readonly globalAttributes: Readonly<Record<string, string>>;
}

const isoUtc = (d: Date): string => d.toISOString().replace('T', ' ').replace('.000Z', '');

interface OpenCfFile {
  readonly writer: NetcdfClassicWriter;
  readonly cells: number;
  finish(): Promise<number>;
  abandon(): Promise<void>;
}

/** Creates `path.part` with header and coordinates written; `finish` closes it and renames it to `path`, `abandon` closes and deletes it. */
async function openCfFile(path: string, def: CfFileDef, members: number | undefined): Promise<OpenCfFile> {
  const ensemble = members !== undefined;
  const timeUnits = `hours since ${isoUtc(def.start)}`;
  const cells = def.grid.lats.length * def.grid.lons.length;
  const fieldDims = ensemble ? ['time', 'number', 'lat', 'lon'] : ['time', 'lat', 'lon'];
  const withBounds = (def.stamps ?? 'midday-bounds') === 'midday-bounds';
  const variables: NcVariableSpec[] = [...coordinateSpecs(timeUnits, withBounds), ...def.variables.map((v) => variableSpec(v, fieldDims))];
  if (ensemble) {
    variables.push(
      {
        name: 'number',
        type: 'int',
        dimensions: ['number'],
        attributes: { standard_name: 'realization', long_name: 'ensemble member number' },
      },
      {
        name: 'forecast_reference_time',
        type: 'double',
        dimensions: [],
        attributes: {
          standard_name: 'forecast_reference_time',
          long_name: 'forecast reference time',
          units: timeUnits,
          calendar: 'standard',
        },
      },
    );
  }
  const dimensions = [
    ...(ensemble ? [{ name: 'number', size: members }] : []),
    { name: 'time', size: def.days, unlimited: !ensemble },
    { name: 'lat', size: def.grid.lats.length },
    { name: 'lon', size: def.grid.lons.length },
    ...(withBounds ? [{ name: 'bnds', size: 2 }] : []),
  ];
  const part = `${path}.part`;
  const writer = await createNetcdfClassic(part, {
    format: def.format,
    dimensions,
    attributes: { Conventions: 'CF-1.8', ...def.globalAttributes },
    variables,
  });
  const time = new Float64Array(def.days);
  const bnds = new Float64Array(2 * def.days);
  for (let i = 0; i < def.days; i++) {
    time[i] = withBounds ? 24 * i + 12 : 24 * i + 24;
    bnds[2 * i] = 24 * i;
    bnds[2 * i + 1] = 24 * i + 24;
  }
  await writer.write('time', 0, time);
  if (withBounds) await writer.write('time_bnds', 0, bnds);
  await writer.write('lat', 0, def.grid.lats);
  await writer.write('lon', 0, def.grid.lons);
  if (ensemble) {
    await writer.write(
      'number',
      0,
      Array.from({ length: members }, (_, m) => m),
    );
    await writer.write('forecast_reference_time', 0, [0]);
  }
  return {
    writer,
    cells,
    async finish() {
      await writer.close();
      await rename(part, path);
      return writer.totalBytes;
    },
    async abandon() {
      await writer.close();
      await rm(part, { force: true });
    },
  };
}

/**
 * Writes an ensemble file (time, number, lat, lon) one day at a time: `fill(t, out)` gives every variable's
 * members × lat × lon field of day `t` (`out[v]`, NaN = missing). Returns the byte size.
 */
export async function writeEnsembleFile(
  path: string,
  def: CfFileDef,
  members: number,
  fill: (t: number, out: readonly Float32Array[]) => void,
): Promise<number> {
  const f = await openCfFile(path, def, members);
  try {
    const fields = def.variables.map(() => new Float32Array(members * f.cells));
    for (let t = 0; t < def.days; t++) {
      fill(t, fields);
      for (let v = 0; v < def.variables.length; v++)
        await f.writer.write(def.variables[v].name, t * fields[v].length, toStored(def.variables[v], fields[v]));
    }
  } catch (err) {
    await f.abandon();
    throw err;
  }
  return f.finish();
}

/** Writes an observed file (time unlimited, lat, lon); `fill(day, out)` gives every variable's field of one day. */
export async function writeObservedFile(
  path: string,
  def: CfFileDef,
  fill: (day: number, out: readonly Float32Array[]) => void,
): Promise<number> {
  const f = await openCfFile(path, def, undefined);
  try {
    const fields = def.variables.map(() => new Float32Array(f.cells));
    for (let t = 0; t < def.days; t++) {
      fill(t, fields);
      for (let v = 0; v < def.variables.length; v++)
        await f.writer.write(def.variables[v].name, t * f.cells, toStored(def.variables[v], fields[v]));
    }
  } catch (err) {
    await f.abandon();
    throw err;
  }
  return f.finish();
}
