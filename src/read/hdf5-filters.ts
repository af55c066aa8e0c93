/**
 * HDF5 filter check for NetCDF-4 variables. Filter ids are the HDF Group's registered filter ids
 * ("Registered Filter Plugins", HDF Group); the supported set is what the h5wasm 0.10.3 build decodes
 * without plugins (zlib and szip/libaec are compiled in; shuffle, fletcher32, nbit, scaleoffset are
 * HDF5 built-ins).
 */
import { InputError } from '../core/errors.ts';

export interface Hdf5Filter {
  readonly id: number;
  readonly name?: string;
}

export const SUPPORTED_HDF5_FILTERS: Readonly<Record<number, string>> = {
  1: 'deflate (zlib)',
  2: 'shuffle',
  3: 'fletcher32',
  4: 'szip',
  5: 'nbit',
  6: 'scaleoffset',
};

const KNOWN_UNSUPPORTED: Readonly<Record<number, string>> = {
  307: 'bzip2',
  32000: 'lzf',
  32001: 'blosc',
  32004: 'lz4',
  32008: 'bitshuffle',
  32013: 'zfp',
  32015: 'zstd',
  32017: 'sz',
  32026: 'blosc2',
};

/** Throws InputError naming the first filter of `variable` that this reader cannot decode. */
export function checkHdf5Filters(file: string, variable: string, filters: readonly Hdf5Filter[]): void {
  for (const f of filters) {
    if (SUPPORTED_HDF5_FILTERS[f.id]) continue;
    const label = KNOWN_UNSUPPORTED[f.id] ?? f.name ?? 'unknown';
    throw new InputError(
      'input-filter',
      file,
      `variable '${variable}' is compressed with HDF5 filter ${f.id} (${label}), which this reader cannot decode`,
      `re-compress the file with \`nccopy -d1 ${file} fixed.nc\` (deflate), or install decoding support for filter ${f.id}`,
    );
  }
}
