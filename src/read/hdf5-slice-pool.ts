/**
 * NetCDF-4 decompression spread over worker_threads. h5wasm decompresses synchronously, so one thread
 * reads one chunk at a time; with a pool the main thread keeps reducing while workers inflate the next
 * member's chunks. One process-wide pool, started on first use: each worker loads its own h5wasm and
 * keeps the files it has read open until the dataset is closed (`forget`). Idle workers do not keep the
 * process alive. Size: FORELIGHT_READ_THREADS (0 = read in the main thread), default min(2, cores).
 */
import { availableParallelism } from 'node:os';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { ForelightError } from '../errors.ts';
import { packagePath } from '../package-root.ts';
import { packageExportPath } from './hdf5-package.ts';

export interface SliceRequest {
  readonly path: string;
  readonly name: string;
  readonly start: readonly number[];
  readonly count: readonly number[];
  /** Only these flat C-order indices of the slab, in this order. */
  readonly positions?: Int32Array;
}

type Reply = { id: number; values?: Float64Array; error?: string };
interface Pending {
  resolve(values: Float64Array): void;
  reject(err: Error): void;
}
interface PoolWorker {
  readonly worker: Worker;
  readonly pending: Map<number, Pending>;
}

/** Loaded by path, not bundled: the worker runs this file as it is (bin/build.mjs bundles the main thread only). */
const WORKER_URL = pathToFileURL(packagePath('src/read/hdf5-slice-worker.mjs'));

export class Hdf5SlicePool {
  private readonly workers: PoolWorker[] = [];
  private nextId = 0;

  constructor(readonly size: number) {}

  /** The raw values of one hyperslab (or of its `positions`), decompressed on the least busy worker. */
  read(request: SliceRequest): Promise<Float64Array> {
    const target = this.leastBusy();
    const id = this.nextId++;
    return new Promise<Float64Array>((resolve, reject) => {
      target.pending.set(id, { resolve, reject });
      target.worker.ref();
      target.worker.postMessage({ kind: 'read', id, ...request });
    });
  }

  /** Closes `path` in every worker (after their queued reads). */
  forget(path: string): void {
    for (const w of this.workers) w.worker.postMessage({ kind: 'forget', path });
  }

  private leastBusy(): PoolWorker {
    if (this.workers.length < this.size) return this.spawn();
    return this.workers.reduce((a, b) => (b.pending.size < a.pending.size ? b : a));
  }

  private spawn(): PoolWorker {
    // execArgv: [] — the worker needs no flags, and some of the parent's (e.g. --input-type) make a worker fail to start.
    const worker = new Worker(WORKER_URL, { workerData: { h5wasmPath: packageExportPath('h5wasm', './node') }, execArgv: [] });
    const entry: PoolWorker = { worker, pending: new Map() };
    worker.on('message', (reply: Reply) => {
      const p = entry.pending.get(reply.id);
      entry.pending.delete(reply.id);
      if (entry.pending.size === 0) worker.unref();
      if (!p) return;
      if (reply.values) p.resolve(reply.values);
      else p.reject(new Error(reply.error ?? 'no values'));
    });
    const fail = (err: Error): void => {
      this.workers.splice(this.workers.indexOf(entry), 1);
      for (const p of entry.pending.values()) p.reject(new Error(`the read worker stopped (${err.message})`));
      entry.pending.clear();
    };
    worker.once('error', fail);
    worker.once('exit', (code) => {
      if (this.workers.includes(entry)) fail(new Error(`exit code ${code}`));
    });
    worker.unref();
    this.workers.push(entry);
    return entry;
  }
}

let shared: Hdf5SlicePool | null | undefined;

/** Threads for NetCDF-4 reads: FORELIGHT_READ_THREADS when set (a whole number, 0 or more), else min(2, cores). */
export function readThreads(env: NodeJS.ProcessEnv = process.env): number {
  const text = env.FORELIGHT_READ_THREADS?.trim();
  if (text === undefined || text === '') return Math.min(2, availableParallelism());
  const n = Number(text);
  if (Number.isInteger(n) && n >= 0) return n;
  throw new ForelightError('read', 'read-threads', `FORELIGHT_READ_THREADS='${text}' is not a whole number of threads`, 'unset it, or set 0 (read in the main thread) or e.g. 2');
}

/** The process-wide pool, or null when reads stay in the main thread (FORELIGHT_READ_THREADS=0). */
export function sharedSlicePool(): Hdf5SlicePool | null {
  if (shared === undefined) {
    const n = readThreads();
    shared = n > 0 ? new Hdf5SlicePool(n) : null;
  }
  return shared;
}
