/**
 * NetCDF-4 decompression spread over worker_threads. h5wasm decompresses synchronously, so one thread
 * reads one chunk at a time; with a pool the main thread keeps reducing while workers inflate the next
 * member's chunks. One process-wide pool, started on first use: each worker loads its own h5wasm and
 * keeps the files it has read open until the dataset is closed (`forget`). Idle workers do not keep the
 * process alive, and a worker idle for 30 s stops (a service does not hold its memory between runs). Size:
 * FORELIGHT_READ_THREADS (0 = read in the main thread), default min(2, cores).
 */
import { availableParallelism } from 'node:os';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { ForelightError, errorMessage } from '../core/errors.ts';
import { packagePath } from '../core/package-root.ts';
import { packageExportPath } from './hdf5-package.ts';
import type { SlabErrorKind } from './hdf5-slab.mjs';

export interface SliceRequest {
  readonly path: string;
  /** hdf5-slab.mjs `fileIdentity` of the file when the dataset opened it. */
  readonly identity: string;
  readonly name: string;
  readonly start: readonly number[];
  readonly count: readonly number[];
  /** Only these flat C-order indices of the slab, in this order. */
  readonly positions?: Int32Array;
}

/** Why a pooled read failed: 'not-numeric' and 'changed' (hdf5-slab.mjs), 'hdf5' (h5wasm), 'worker' (the thread died). */
export type SliceErrorKind = SlabErrorKind | 'hdf5' | 'worker';

export class SliceError extends Error {
  constructor(
    readonly kind: SliceErrorKind,
    message: string,
  ) {
    super(message);
  }
}

type Reply = { id: number; values?: Float64Array; error?: { kind: SliceErrorKind; message: string } };
interface Pending {
  resolve(values: Float64Array): void;
  reject(err: Error): void;
}
interface PoolWorker {
  readonly worker: Worker;
  readonly pending: Map<number, Pending>;
  idleTimer?: NodeJS.Timeout;
}

/** Loaded by path, not bundled: the worker runs this file as it is (bin/build.mjs bundles the main thread only). */
const WORKER_URL = pathToFileURL(packagePath('src/read/hdf5-slice-worker.mjs'));
/** A worker idle this long is stopped, so a long-running service does not hold its HDF5 heap between runs. */
const IDLE_STOP_MS = 30_000;

export class Hdf5SlicePool {
  private readonly workers: PoolWorker[] = [];
  private nextId = 0;

  /** @param workerUrl the worker script (tests pass one that fails on purpose) */
  constructor(
    readonly size: number,
    private readonly workerUrl: URL = WORKER_URL,
  ) {}

  /** The raw values of one hyperslab (or of its `positions`), decompressed on the least busy worker. */
  read(request: SliceRequest): Promise<Float64Array> {
    const target = this.leastBusy();
    const id = this.nextId++;
    return new Promise<Float64Array>((resolve, reject) => {
      clearTimeout(target.idleTimer);
      target.pending.set(id, { resolve, reject });
      target.worker.ref();
      try {
        target.worker.postMessage({ kind: 'read', id, ...request });
      } catch (err) {
        this.settled(target, id);
        reject(new SliceError('worker', `the read could not be sent to its worker (${errorMessage(err)})`));
      }
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

  /** Forgets read `id`; an idle worker no longer keeps the process alive and stops after IDLE_STOP_MS. */
  private settled(entry: PoolWorker, id: number): void {
    entry.pending.delete(id);
    if (entry.pending.size > 0) return;
    entry.worker.unref();
    clearTimeout(entry.idleTimer);
    entry.idleTimer = setTimeout(() => {
      if (entry.pending.size > 0) return;
      this.drop(entry);
      void entry.worker.terminate();
    }, IDLE_STOP_MS);
    entry.idleTimer.unref();
  }

  private drop(entry: PoolWorker): void {
    const at = this.workers.indexOf(entry);
    if (at >= 0) this.workers.splice(at, 1);
  }

  private spawn(): PoolWorker {
    // execArgv: [] — the worker needs no flags, and some of the parent's (e.g. --input-type) make a worker fail to start.
    const worker = new Worker(this.workerUrl, { workerData: { h5wasmPath: packageExportPath('h5wasm', './node') }, execArgv: [] });
    const entry: PoolWorker = { worker, pending: new Map() };
    worker.on('message', (reply: Reply) => {
      const p = entry.pending.get(reply.id);
      this.settled(entry, reply.id);
      if (!p) return;
      if (reply.values) p.resolve(reply.values);
      else p.reject(new SliceError(reply.error?.kind ?? 'hdf5', reply.error?.message ?? 'no values'));
    });
    const fail = (err: Error): void => {
      if (!this.workers.includes(entry)) return;
      this.drop(entry);
      clearTimeout(entry.idleTimer);
      for (const p of entry.pending.values()) p.reject(new SliceError('worker', `the read worker stopped (${err.message})`));
      entry.pending.clear();
      void worker.terminate();
    };
    worker.once('error', fail);
    worker.on('messageerror', fail);
    worker.once('exit', (code) => fail(new Error(`exit code ${code}`)));
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
  throw new ForelightError(
    'read',
    'read-threads',
    `FORELIGHT_READ_THREADS='${text}' is not a whole number of threads`,
    'unset it, or set 0 (read in the main thread) or e.g. 2',
  );
}

/** The process-wide pool, or null when reads stay in the main thread (FORELIGHT_READ_THREADS=0). */
export function sharedSlicePool(): Hdf5SlicePool | null {
  if (shared === undefined) {
    const n = readThreads();
    shared = n > 0 ? new Hdf5SlicePool(n) : null;
  }
  return shared;
}
