// Worker thread behind src/ledger/pg-sync.ts: owns one PostgreSQL connection (node-postgres) and answers one query
// at a time. Each answer is posted on the port, then the shared flag is set and notified, so the main thread, which
// waits on the flag with Atomics.wait, can take the answer synchronously with receiveMessageOnPort.
// Plain JavaScript so that it starts without a TypeScript loader (see src/read/hdf5-slice-worker.mjs).
import { workerData } from 'node:worker_threads';
import pg from 'pg';

const { port, flag, connectionString, password } = workerData;
const signal = new Int32Array(flag);
// int8 (count(*), sums) as JavaScript numbers, as SQLite gives them; ledger counts stay far below 2^53.
pg.types.setTypeParser(20, (v) => Number(v));
const client = new pg.Client({ connectionString, application_name: 'forelight-ledger' });
// Given after parsing: a password field of the parsed URL (none, since the URL never holds one) would override it.
if (typeof password === 'string') client.password = password;
let connected = null;

const asPgValue = (v) => (v instanceof Uint8Array && !Buffer.isBuffer(v) ? Buffer.from(v.buffer, v.byteOffset, v.byteLength) : v);

async function answer(msg) {
  if (!connected) connected = client.connect();
  await connected;
  if (msg.op === 'close') {
    await client.end();
    return { rows: [], changes: 0 };
  }
  const res = await client.query({ text: msg.sql, values: (msg.params ?? []).map(asPgValue) });
  const last = Array.isArray(res) ? res[res.length - 1] : res;
  return { rows: last.rows ?? [], changes: last.rowCount ?? 0 };
}

port.on('message', async (msg) => {
  let reply;
  try {
    reply = { ok: await answer(msg) };
  } catch (err) {
    reply = { error: { message: err instanceof Error ? err.message : String(err), code: err?.code ?? null } };
  }
  port.postMessage(reply);
  Atomics.store(signal, 0, 1);
  Atomics.notify(signal, 0);
  if (msg.op === 'close') port.close();
});
