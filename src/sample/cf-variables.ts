/**
 * The CF-1.8 variables of a gridded daily file (CF Conventions 1.8, Eaton et al. 2020): the time, latitude and
 * longitude coordinates (§4, §4.4; `time_bnds` §7.1), and each field with its standard name, cell methods (§7.3)
 * and packing into shorts (§8.1) or float32 with a _FillValue. Written by `cf-gridded-file.ts`.
 */
import type { NcAttribute, NcVariableSpec } from './netcdf-classic-writer.ts';

/** Linear packing into shorts: stored = round((value - addOffset) / scaleFactor). */
export interface ShortPacking {
  readonly scaleFactor: number;
  readonly addOffset: number;
}

export interface CfVariableDef {
  readonly name: string;
  readonly standardName: string;
  readonly longName: string;
  readonly units: string;
  /** Omitted for an amount accumulated since the reference time (no per-step cell method applies). */
  readonly cellMethods?: string;
  /** Present: stored as short with scale_factor/add_offset; absent: float32. */
  readonly packing?: ShortPacking;
  /** Extra attributes (e.g. a comment on accumulation). */
  readonly extra?: Readonly<Record<string, string>>;
}

const SHORT_FILL = -32767;
const FLOAT_FILL = 1.0e20;

export function variableSpec(def: CfVariableDef, dims: readonly string[]): NcVariableSpec {
  const attributes: Record<string, NcAttribute> = {
    standard_name: def.standardName,
    long_name: def.longName,
    units: def.units,
    ...(def.cellMethods ? { cell_methods: def.cellMethods } : {}),
    ...def.extra,
  };
  if (def.packing) {
    attributes.scale_factor = { type: 'float', values: [def.packing.scaleFactor] };
    attributes.add_offset = { type: 'float', values: [def.packing.addOffset] };
    attributes._FillValue = { type: 'short', values: [SHORT_FILL] };
  } else {
    attributes._FillValue = { type: 'float', values: [FLOAT_FILL] };
  }
  return { name: def.name, type: def.packing ? 'short' : 'float', dimensions: dims, attributes };
}

/** Packs floats to stored values: NaN → _FillValue. */
export function toStored(def: CfVariableDef, values: Float32Array): Int16Array | Float32Array {
  const p = def.packing;
  if (!p) {
    const out = new Float32Array(values.length);
    for (let i = 0; i < values.length; i++) out[i] = Number.isNaN(values[i]) ? FLOAT_FILL : values[i];
    return out;
  }
  const out = new Int16Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    out[i] = Number.isNaN(v) ? SHORT_FILL : Math.max(-32766, Math.min(32767, Math.round((v - p.addOffset) / p.scaleFactor)));
  }
  return out;
}

export function coordinateSpecs(timeUnits: string, withBounds: boolean): NcVariableSpec[] {
  const time: NcVariableSpec = {
    name: 'time',
    type: 'double',
    dimensions: ['time'],
    attributes: {
      standard_name: 'time',
      long_name: 'time',
      units: timeUnits,
      calendar: 'standard',
      axis: 'T',
      ...(withBounds ? { bounds: 'time_bnds' } : {}),
    },
  };
  return [
    time,
    ...(withBounds ? [{ name: 'time_bnds', type: 'double' as const, dimensions: ['time', 'bnds'], attributes: {} }] : []),
    {
      name: 'lat',
      type: 'double',
      dimensions: ['lat'],
      attributes: { standard_name: 'latitude', long_name: 'latitude', units: 'degrees_north', axis: 'Y' },
    },
    {
      name: 'lon',
      type: 'double',
      dimensions: ['lon'],
      attributes: { standard_name: 'longitude', long_name: 'longitude', units: 'degrees_east', axis: 'X' },
    },
  ];
}
