import type { File as H5File } from 'h5wasm/node';

/** See hdf5-slab.mjs. Throws TypeError when the variable is not numeric. */
export function readSlab(file: H5File, name: string, start: readonly number[], count: readonly number[], positions?: Int32Array): Float64Array;
