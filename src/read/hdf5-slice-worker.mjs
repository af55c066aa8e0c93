// Worker thread of hdf5-slice-pool.ts: decompresses NetCDF-4 hyperslabs with h5wasm. Plain JavaScript on
// purpose: a worker thread on Node 20 would need tsx's loader registered inside it, and h5wasm's 4 MB module
// through those hooks cost ~630 MB RSS (measured); this file needs no loader.
//
// Messages in:  { kind: 'read', id, path, identity, name, start, count, positions? }  |  { kind: 'forget', path }
// Messages out: { id, values: Float64Array }  |  { id, error: { kind, message } }
// `identity` (hdf5-slab.mjs fileIdentity) is what the main thread saw when it opened the file; the worker opens
// the file itself, so it checks that it opens the same one.
import { createRequire } from 'node:module';
import { parentPort, workerData } from 'node:worker_threads';
import { checkIdentity, readSlab } from './hdf5-slab.mjs';

const h5wasm = createRequire(import.meta.url)(workerData.h5wasmPath).default;
const ready = h5wasm.ready.then((module) => module.activate_throwing_error_handler());
const files = new Map();

function fileOf(path, identity) {
  let file = files.get(path);
  if (!file) {
    checkIdentity(path, identity);
    file = new h5wasm.File(path, 'r');
    files.set(path, file);
  }
  return file;
}

parentPort.on('message', async (msg) => {
  await ready;
  if (msg.kind === 'forget') {
    files.get(msg.path)?.close();
    files.delete(msg.path);
    return;
  }
  try {
    const values = readSlab(fileOf(msg.path, msg.identity), msg.name, msg.start, msg.count, msg.positions);
    parentPort.postMessage({ id: msg.id, values }, [values.buffer]);
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    parentPort.postMessage({ id: msg.id, error: { kind: err?.kind ?? 'hdf5', message } });
  }
});
