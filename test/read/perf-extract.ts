/**
 * Timing of the read stage against CDO, run by hand (not part of `vitest run`):
 *   /usr/bin/python3 /tmp/flbench/gen.py tnyx   (see the report; 101 members × 46 days × 121×240 float32, 540 MB)
 *   node bin/run-ts.mjs test/read/perf-extract.ts /tmp/flbench/big-tnyx.nc
 * Compares extractRegionSeries for 20 boxes (one pass) with `cdo -s outputtab,value -fldmean -sellonlatbox`
 * run once per box, as a user of CDO would.
 */
import { execFileSync } from 'node:child_process';
import type { RegionConfig } from '../../src/config/types.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';

const file = process.argv[2];
if (!file) throw new Error('usage: perf-extract.ts <file.nc>');
const regions: RegionConfig[] = Array.from({ length: 20 }, (_x, i) => {
  const south = -15 + (i % 5) * 2;
  const west = -6 + Math.floor(i / 5) * 3;
  return { id: `r${i}`, name: `r${i}`, shape: { kind: 'box', south, north: south + 2.5, west, east: west + 4 }, utcOffsetHours: 1, teams: [] };
});

let t0 = performance.now();
const { series, problems } = await extractRegionSeries(file, { quantities: { tmean: 't2m' }, regions });
const ours = performance.now() - t0;
console.log(`forelight: ${series.length} series, ${problems.length} problems, ${ours.toFixed(0)} ms`);

t0 = performance.now();
for (const r of regions) {
  if (r.shape.kind !== 'box') continue;
  const { west, east, south, north } = r.shape;
  execFileSync('cdo', ['-s', 'outputtab,value', '-fldmean', `-sellonlatbox,${west},${east},${south},${north}`, file], { maxBuffer: 1 << 26 });
}
const cdo = performance.now() - t0;
console.log(`cdo fldmean -sellonlatbox ×20: ${cdo.toFixed(0)} ms (${(cdo / 20).toFixed(0)} ms per box); forelight/cdo-per-box = ${(ours / (cdo / 20)).toFixed(2)}`);
