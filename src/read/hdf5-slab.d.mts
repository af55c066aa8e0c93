import type { File as H5File } from 'h5wasm/node';

/** Kinds of the errors hdf5-slab.mjs throws (other errors come from h5wasm). */
export type SlabErrorKind = 'not-numeric' | 'changed';

/** See hdf5-slab.mjs. */
export function fileIdentity(path: string): string;
export function checkIdentity(path: string, expected: string): void;
export function readSlab(
  file: H5File,
  name: string,
  start: readonly number[],
  count: readonly number[],
  positions?: Int32Array,
): Float64Array;
