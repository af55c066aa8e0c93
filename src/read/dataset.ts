/**
 * The one interface every NetCDF flavour is read through (classic CDF-1, 64-bit offset CDF-2, CDF-5,
 * NetCDF-4/HDF5). Implementations read only the requested hyperslab, never a whole large variable.
 */
import { InputError } from '../core/errors.ts';

export type AttributeValue = string | number | readonly number[];

export type StorageType = 'byte' | 'ubyte' | 'char' | 'short' | 'ushort' | 'int' | 'uint' | 'int64' | 'uint64' | 'float' | 'double';

export interface DimensionInfo {
  readonly name: string;
  readonly size: number;
  readonly unlimited: boolean;
}

export interface VariableInfo {
  readonly name: string;
  /** Dimension names, slowest-varying first (C order, as ncdump prints them). */
  readonly dimensions: readonly string[];
  readonly shape: readonly number[];
  readonly type: StorageType;
  readonly attributes: Readonly<Record<string, AttributeValue>>;
}

export type DatasetFormat = 'classic' | '64bit-offset' | 'cdf5' | 'netcdf4';

export interface Dataset {
  readonly path: string;
  readonly format: DatasetFormat;
  readonly dimensions: readonly DimensionInfo[];
  readonly attributes: Readonly<Record<string, AttributeValue>>;
  readonly variables: readonly VariableInfo[];
  /** The variable's metadata, or undefined when the file has no such variable. */
  variable(name: string): VariableInfo | undefined;
  /**
   * Stored (raw, not yet CF-decoded) values of the hyperslab `start`/`count` in C order.
   * Implementations coalesce contiguous runs into few positional reads.
   */
  readRaw(name: string, start: readonly number[], count: readonly number[]): Promise<Float64Array>;
  /**
   * Optional: only the values at `positions` (flat C-order indices into the hyperslab, any order; the result
   * follows `positions`), for readers that can skip decoding the rest (the classic reader).
   */
  readRawAt?(name: string, start: readonly number[], count: readonly number[], positions: Int32Array): Promise<Float64Array>;
  /** Optional: how many reads a caller may keep in flight to keep the reader's threads busy (default 1). */
  readonly readAhead?: number;
  close(): Promise<void>;
}

/** The error every reader gives for a variable the file does not have, listing the ones it has. */
export function variableNotFound(path: string, name: string, variables: readonly { readonly name: string }[]): InputError {
  return new InputError('input-variable', path, `variable '${name}' not found`, `use one of: ${variables.map((x) => x.name).join(', ')}`);
}
