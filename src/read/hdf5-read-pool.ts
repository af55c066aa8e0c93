/**
 * Concurrent raw reads over worker_threads: h5wasm decompression is synchronous, so reading several
 * NetCDF-4 variables or files at once needs threads. A small pool (default 2 workers) takes requests
 * from one queue; each worker keeps its files open until the batch ends, then every worker is closed.
 * One failed request does not drop the others: each result is either values or an InputError.
 */
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { InputError } from '../errors.ts';
import { packageExportPath } from './hdf5-package.ts';

export interface RawReadRequest {
  readonly path: string;
  readonly variable: string;
  readonly start: readonly number[];
  readonly count: readonly number[];
}

export type RawReadResult = { readonly ok: true; readonly values: Float64Array } | { readonly ok: false; readonly error: InputError };

/** Messages between pool and worker (internal). */
export type PoolMessage = { kind: 'read'; id: number; request: RawReadRequest } | { kind: 'close' };
export type PoolReply = { id: number; values?: Float64Array; error?: { message: string; code: string; hint: string } };

const WORKER_URL = new URL('./hdf5-read-worker.ts', import.meta.url).href;
/**
 * Workers start from this bootstrap, which registers tsx's TypeScript loader inside the thread:
 * `execArgv: ['--import', 'tsx']` does not apply loaders to worker threads on Node 20.
 */
const BOOTSTRAP = [
  `const tsx = await import(${JSON.stringify(pathToFileURL(packageExportPath('tsx', './esm/api')).href)});`,
  '(tsx.register ?? tsx.default.register)();',
  `await import(${JSON.stringify(WORKER_URL)});`,
].join('\n');
const CLOSE_GRACE_MS = 5000;

function failure(request: RawReadRequest, message: string, code = 'input-worker', hint = ''): RawReadResult {
  // The worker's message already starts with "file: "; strip it, since InputError adds it again.
  const prefix = `${request.path}: `;
  const body = message.startsWith(prefix) ? message.slice(prefix.length) : message;
  const text = hint && body.endsWith(` — ${hint}`) ? body.slice(0, -hint.length - 3) : body;
  return { ok: false, error: new InputError(code, request.path, text, hint || 'check the file with `ncdump -h`') };
}

async function stopWorker(worker: Worker): Promise<void> {
  const exited = new Promise<void>((resolve) => worker.once('exit', () => resolve()));
  worker.postMessage({ kind: 'close' } satisfies PoolMessage);
  const timer = setTimeout(() => void worker.terminate(), CLOSE_GRACE_MS);
  await exited;
  clearTimeout(timer);
}

/** Reads every request's raw hyperslab on up to `workers` threads; results are in request order. */
export async function readManyRaw(requests: readonly RawReadRequest[], workers = 2): Promise<RawReadResult[]> {
  const results: RawReadResult[] = new Array(requests.length);
  let next = 0;
  const runWorker = async (): Promise<void> => {
    const worker = new Worker(`(async () => {\n${BOOTSTRAP}\n})();`, { eval: true });
    const state: { crashed?: Error } = {};
    const crash = new Promise<void>((resolve) => {
      worker.once('error', (err) => { state.crashed = err; resolve(); });
      worker.once('exit', (code) => { state.crashed ??= new Error(`worker exited with code ${code}`); resolve(); });
    });
    try {
      while (next < requests.length && !state.crashed) {
        const id = next++;
        const request = requests[id];
        const reply = new Promise<PoolReply | undefined>((resolve) => {
          const onMessage = (msg: PoolReply): void => { if (msg.id === id) { worker.off('message', onMessage); resolve(msg); } };
          worker.on('message', onMessage);
          void crash.then(() => { worker.off('message', onMessage); resolve(undefined); });
        });
        worker.postMessage({ kind: 'read', id, request } satisfies PoolMessage);
        const msg = await reply;
        if (msg?.values) results[id] = { ok: true, values: msg.values };
        else if (msg?.error) results[id] = failure(request, msg.error.message, msg.error.code, msg.error.hint);
        else results[id] = failure(request, `read worker failed (${(state.crashed as Error | undefined)?.message ?? 'no reply'})`);
      }
    } finally {
      if (!state.crashed) await stopWorker(worker);
    }
  };
  const poolSize = Math.max(1, Math.min(workers, requests.length));
  await Promise.all(Array.from({ length: requests.length === 0 ? 0 : poolSize }, runWorker));
  for (let i = 0; i < requests.length; i++) results[i] ??= failure(requests[i], 'no read worker was left to read this request');
  return results;
}
