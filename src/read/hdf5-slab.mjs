// One NetCDF-4 hyperslab read with h5wasm, as float64 numbers, and the check that a file is still the one opened.
// Plain JavaScript so that both the main thread (hdf5-dataset.ts) and the loader-free worker
// (hdf5-slice-worker.mjs) use the same code; types in hdf5-slab.d.mts.
import { statSync } from 'node:fs';

/** An Error with a `kind` the dataset turns into an actionable InputError: 'not-numeric' | 'changed'. */
function slabError(kind, message) {
  return Object.assign(new Error(message), { kind });
}

/** What identifies the file's contents on disk: device, inode, size and modification time. */
export function fileIdentity(path) {
  const s = statSync(path);
  return `${s.dev}:${s.ino}:${s.size}:${s.mtimeMs}`;
}

/** Throws a 'changed' error unless `path` is still the file whose identity was `expected`. */
export function checkIdentity(path, expected) {
  if (fileIdentity(path) !== expected) throw slabError('changed', 'the file was replaced or modified on disk after it was opened');
}

/**
 * The stored values of `name` in the open h5wasm `file` over `start`/`count` (C order; a scalar when
 * `count` is empty), or only those at `positions` (flat indices into the slab), in that order.
 */
export function readSlab(file, name, start, count, positions) {
  const ds = file.get(name);
  const data = count.length === 0 ? ds.value : ds.slice(start.map((s, d) => [s, s + count[d]]));
  if (typeof data === 'number' || typeof data === 'bigint') return Float64Array.from(positions ?? [0], () => Number(data));
  if (!ArrayBuffer.isView(data) || data instanceof DataView) throw slabError('not-numeric', `variable '${name}' did not read as numbers`);
  const big = typeof data[0] === 'bigint';
  const n = positions ? positions.length : data.length;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = data[positions ? positions[i] : i];
    out[i] = big ? Number(v) : v;
  }
  return out;
}
