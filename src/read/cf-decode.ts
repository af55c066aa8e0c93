/**
 * CF decoding of stored values: masking then unpacking, after Eaton et al., "NetCDF Climate and Forecast
 * (CF) Metadata Conventions" 1.x, §2.5.1 (missing data: _FillValue, missing_value, valid_min, valid_max,
 * valid_range) and §8.1 (packed data: unpacked = packed * scale_factor + add_offset). Validity is tested
 * on the packed (stored) values, as §2.5.1 prescribes for packed data.
 * When _FillValue is absent, netCDF-C's default fill value of the storage type masks values (Unidata,
 * "NetCDF Users Guide", Attribute Conventions, _FillValue; netcdf.h NC_FILL_*), except for byte/ubyte/char:
 * the NUG says generic utilities should not assume a default fill for bytes (ncdump prints -127), so
 * define _FillValue explicitly for byte data. The NUG rule that values on the "wrong side" of _FillValue
 * are invalid is not applied (as in xarray).
 */
import type { AttributeValue, StorageType, VariableInfo } from './dataset.ts';

/** netCDF-C default fill values (netcdf.h). */
export const NETCDF_DEFAULT_FILL: Readonly<Partial<Record<StorageType, number>>> = {
  short: -32767,
  int: -2147483647,
  float: Math.fround(9.969209968386869e36),
  double: 9.969209968386869e36,
  ushort: 65535,
  uint: 4294967295,
  int64: -9223372036854775806,
  uint64: 18446744073709551614,
};

export interface DecodedValues {
  /** Physical values; masked entries are NaN. Same array as the raw input (decoded in place). */
  readonly values: Float64Array;
  /** How many entries were masked (including NaNs already stored). */
  readonly missing: number;
}

function numbers(value: AttributeValue | undefined): number[] {
  if (value === undefined || typeof value === 'string') return [];
  return typeof value === 'number' ? [value] : [...value];
}

/** An attribute value as the stored type holds it (float attributes compare to float32 data). */
function asStored(type: StorageType, v: number): number {
  return type === 'float' ? Math.fround(v) : v;
}

/** Masks and unpacks `raw` (stored values of variable `info`) in place. */
export function decodeCf(info: VariableInfo, raw: Float64Array): DecodedValues {
  const a = info.attributes;
  const fills = numbers(a._FillValue);
  if (fills.length === 0 && NETCDF_DEFAULT_FILL[info.type] !== undefined) fills.push(NETCDF_DEFAULT_FILL[info.type]!);
  const masked = [...fills.slice(0, 1), ...numbers(a.missing_value)].map((v) => asStored(info.type, v));
  const range = numbers(a.valid_range);
  const min = range.length === 2 ? range[0] : (numbers(a.valid_min)[0] ?? -Infinity);
  const max = range.length === 2 ? range[1] : (numbers(a.valid_max)[0] ?? Infinity);
  const scale = numbers(a.scale_factor)[0] ?? 1;
  const offset = numbers(a.add_offset)[0] ?? 0;
  const m0 = masked[0] ?? NaN;
  const m1 = masked[1] ?? NaN;
  const rest = masked.slice(2);
  let missing = 0;
  for (let i = 0; i < raw.length; i++) {
    const v = raw[i];
    if (v !== v || v === m0 || v === m1 || v < min || v > max || (rest.length > 0 && rest.includes(v))) {
      raw[i] = NaN;
      missing++;
    } else {
      raw[i] = v * scale + offset;
    }
  }
  return { values: raw, missing };
}
