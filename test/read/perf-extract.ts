/**
 * Timing of the read stage against CDO, run by hand (not part of `vitest run`). Inputs from the lead's
 * benchmark generator (`node bin/run-ts.mjs bench/make-large-inputs.ts [--small]`, variables tasmax/tasmin/tdps):
 *   node bin/run-ts.mjs test/read/perf-extract.ts bench/data/small/forecast_classic.nc [bench/regions.json]
 * Times extractRegionSeries for the 20 boxes and 3 variables in one pass, then `cdo -s outputtab,value
 * -fldmean -sellonlatbox` for the first box and variable (one box, as a CDO user would run it per box),
 * and checks the two agree (CDO prints 6 significant digits here, so to 1e-3 K).
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import type { RegionConfig } from '../../src/config/types.ts';
import { extractRegionSeries } from '../../src/read/extract.ts';

const [file, regionsFile = 'bench/regions.json'] = process.argv.slice(2);
if (!file) throw new Error('usage: perf-extract.ts <file.nc> [regions.json]');
const boxes = (
  JSON.parse(readFileSync(regionsFile, 'utf8')) as { regions: { id: string; south: number; north: number; west: number; east: number }[] }
).regions;
const regions: RegionConfig[] = boxes.map((b) => ({
  id: b.id,
  name: b.id,
  shape: { kind: 'box', ...b },
  utcOffsetHours: 0,
  teams: [],
  cellRule: 'centre',
}));

let t0 = performance.now();
const { series, problems } = await extractRegionSeries(file, { quantities: { tmax: 'tasmax', tmin: 'tasmin', dewpoint: 'tdps' }, regions });
const ours = (performance.now() - t0) / 1000;
console.log(
  `forelight: ${series.length} series (${regions.length} boxes × 3 variables), ${problems.length} problems, ${ours.toFixed(2)} s`,
);

const b = boxes[0];
t0 = performance.now();
const text = execFileSync(
  'cdo',
  ['-s', 'outputtab,value', '-fldmean', `-sellonlatbox,${b.west},${b.east},${b.south},${b.north}`, '-selname,tasmax', file],
  { encoding: 'utf8', maxBuffer: 1 << 26 },
);
const cdo = (performance.now() - t0) / 1000;
const cdoFirst = Number(text.split('\n').filter((l) => l.trim() && !l.startsWith('#'))[0]);
const oursFirst = series.find((s) => s.region === b.id && s.quantity === 'tmax')?.data[0] ?? NaN;
console.log(
  `cdo, one box one variable: ${cdo.toFixed(2)} s; first value cdo ${cdoFirst} K, forelight ${(oursFirst + 273.15).toFixed(4)} K`,
);
console.log(`forelight (all boxes, all variables) / cdo (one box, one variable) = ${(ours / cdo).toFixed(2)}`);
