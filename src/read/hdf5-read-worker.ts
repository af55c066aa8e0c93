/**
 * Worker-thread side of hdf5-read-pool.ts: reads raw hyperslabs with openDataset (any NetCDF flavour),
 * keeping each file open until the pool says close.
 */
import { parentPort } from 'node:worker_threads';
import { ForelightError } from '../errors.ts';
import type { Dataset } from './dataset.ts';
import { openDataset } from './open-dataset.ts';
import type { PoolReply, PoolMessage } from './hdf5-read-pool.ts';

const port = parentPort;
if (!port) throw new Error('hdf5-read-worker.ts must run in a worker thread');
const open = new Map<string, Promise<Dataset>>();

port.on('message', async (msg: PoolMessage) => {
  if (msg.kind === 'close') {
    for (const ds of open.values()) await ds.then((d) => d.close(), () => undefined);
    port.close();
    return;
  }
  const { id, request } = msg;
  try {
    let ds = open.get(request.path);
    if (!ds) {
      ds = openDataset(request.path);
      open.set(request.path, ds);
    }
    const values = await (await ds).readRaw(request.variable, request.start, request.count);
    port.postMessage({ id, values } satisfies PoolReply, [values.buffer as ArrayBuffer]);
  } catch (err) {
    const e = err instanceof ForelightError ? err : undefined;
    const reply: PoolReply = {
      id,
      error: { message: err instanceof Error ? err.message : String(err), code: e?.code ?? 'input-worker', hint: e?.hint ?? '' },
    };
    port.postMessage(reply);
  }
});
