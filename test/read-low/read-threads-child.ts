/**
 * Child process of read-threads.test.ts: prints, as one JSON line, the pool size and the raw values of every numeric variable of
 * FILE read whole and at a few positions, then returns without closing anything (the read workers must
 * not keep the process alive).   node bin/run-ts.mjs test/read-low/read-threads-child.ts FILE
 */
import { sharedSlicePool } from '../../src/read/hdf5-slice-pool.ts';
import { openDataset } from '../../src/read/open-dataset.ts';

const ds = await openDataset(process.argv[2]);
const out: Record<string, { whole: number[]; picked: number[] }> = {};
for (const v of ds.variables) {
  if (v.type === 'char') continue;
  const zeros = v.shape.map(() => 0);
  const whole = await ds.readRaw(v.name, zeros, v.shape);
  const positions = Int32Array.from({ length: Math.min(5, whole.length) }, (_x, i) => whole.length - 1 - 2 * i).filter((p) => p >= 0);
  const picked = ds.readRawAt ? await ds.readRawAt(v.name, zeros, v.shape, positions) : new Float64Array(0);
  out[v.name] = { whole: Array.from(whole), picked: Array.from(picked) };
}
process.stdout.write(`${JSON.stringify({ threads: sharedSlicePool()?.size ?? 0, values: out })}\n`);
