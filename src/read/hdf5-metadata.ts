/**
 * netCDF-C's view of a NetCDF-4 (HDF5) file's root group: dimensions are the HDF5 dimension scales attached to
 * each variable (ordered by `_Netcdf4Dimid`; an axis without a scale gets a `phony_dim_N` per size, as netCDF-C
 * does), variables are the root datasets that are not dimension-only scales, and netCDF-C's bookkeeping
 * attributes are hidden as ncdump hides them. Variables in sub-groups are not listed.
 */
import type { Dataset as H5Dataset, File as H5File } from 'h5wasm/node';
import type { AttributeValue, DimensionInfo, StorageType, VariableInfo } from './dataset.ts';

/** Attributes netCDF-C uses for its own bookkeeping; ncdump does not show them. */
const HIDDEN_ATTRIBUTES = new Set([
  '_Netcdf4Coordinates',
  '_Netcdf4Dimid',
  'CLASS',
  'NAME',
  'REFERENCE_LIST',
  'DIMENSION_LIST',
  '_NCProperties',
  '_nc3_strict',
  '_IsNetcdf4',
  '_SuperblockVersion',
]);
const DIMENSION_ONLY = 'This is a netCDF dimension but not a netCDF variable';
/** HDF5 reports H5S_UNLIMITED (2^64-1) as a maxshape entry. */
const UNLIMITED_AT_LEAST = 2 ** 53;

function toAttributeValue(value: unknown): AttributeValue {
  if (typeof value === 'string') return value;
  if (typeof value === 'number' || typeof value === 'bigint' || typeof value === 'boolean') return Number(value);
  if (ArrayBuffer.isView(value)) {
    const numbers = Array.from(value as unknown as ArrayLike<number | bigint>, Number);
    return numbers.length === 1 ? numbers[0] : numbers;
  }
  if (Array.isArray(value)) return value.map(String).join('\n');
  return String(value);
}

function storageType(ds: H5Dataset): StorageType | undefined {
  const m = ds.metadata;
  if (m.type === 1) return m.size === 4 ? 'float' : m.size === 8 ? 'double' : undefined;
  if (m.type === 0) {
    const ints: Record<number, [StorageType, StorageType]> = {
      1: ['byte', 'ubyte'],
      2: ['short', 'ushort'],
      4: ['int', 'uint'],
      8: ['int64', 'uint64'],
    };
    const pair = ints[m.size];
    return pair ? pair[m.signed ? 0 : 1] : undefined;
  }
  if (m.type === 3 && !m.vlen && m.size === 1) return 'char';
  return undefined;
}

export interface Hdf5Variable extends VariableInfo {
  readonly numeric: boolean;
}

function readAttributes(entity: H5Dataset | H5File): Record<string, AttributeValue> {
  const out: Record<string, AttributeValue> = {};
  for (const [key, attr] of Object.entries(entity.attrs)) {
    if (!HIDDEN_ATTRIBUTES.has(key)) out[key] = toAttributeValue(attr.value);
  }
  return out;
}

/** The root group's dimensions, global attributes and variables, in netCDF-C's order. */
export function netcdfMetadata(
  h5: H5File,
  isDataset: (entity: unknown) => entity is H5Dataset,
): { dimensions: DimensionInfo[]; attributes: Record<string, AttributeValue>; variables: Hdf5Variable[] } {
  const datasets: [string, H5Dataset][] = [];
  for (const key of h5.keys()) {
    const e = h5.get(key);
    if (isDataset(e)) datasets.push([key, e]);
  }
  const dims: (DimensionInfo & { order: number })[] = [];
  const dimensionOnly = new Set<string>();
  for (const [key, ds] of datasets) {
    const attrs = ds.attrs;
    if (!attrs.CLASS || attrs.CLASS.value !== 'DIMENSION_SCALE') continue;
    const shape = ds.metadata.shape ?? [0];
    const maxshape = ds.metadata.maxshape ?? shape;
    const order = attrs._Netcdf4Dimid ? Number(attrs._Netcdf4Dimid.value) : dims.length;
    dims.push({ name: key, size: shape[0] ?? 0, unlimited: (maxshape[0] ?? 0) >= UNLIMITED_AT_LEAST, order });
    if (String(attrs.NAME?.value ?? '').startsWith(DIMENSION_ONLY)) dimensionOnly.add(key);
  }
  dims.sort((a, b) => a.order - b.order);
  const phony = new Map<number, string>();
  const variables: Hdf5Variable[] = [];
  for (const [key, ds] of datasets) {
    if (dimensionOnly.has(key)) continue;
    const shape = ds.shape ?? [];
    const isScale = dims.some((d) => d.name === key);
    const coordIds = ds.attrs._Netcdf4Coordinates ? toAttributeValue(ds.attrs._Netcdf4Coordinates.value) : undefined;
    const dimensions = shape.map((size, axis) => {
      const scale = isScale ? undefined : ds.get_attached_scales(axis)[0];
      if (scale) return scale.slice(scale.lastIndexOf('/') + 1);
      const id = Array.isArray(coordIds) ? coordIds[axis] : coordIds;
      const byId = dims.find((d) => d.order === id);
      if (byId && byId.size === size) return byId.name;
      if (isScale && axis === 0) return key;
      let name = phony.get(size);
      if (!name) {
        name = `phony_dim_${phony.size}`;
        phony.set(size, name);
        dims.push({ name, size, unlimited: false, order: -1 });
      }
      return name;
    });
    const type = storageType(ds);
    variables.push({
      name: key,
      dimensions,
      shape,
      type: type ?? 'char',
      attributes: readAttributes(ds),
      numeric: type !== undefined && type !== 'char',
    });
  }
  const dimensions = dims.map(({ name, size, unlimited }) => ({ name, size, unlimited }));
  return { dimensions, attributes: readAttributes(h5), variables };
}
