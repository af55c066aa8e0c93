/**
 * The continental bench set (`npm run bench -- --set continental [--scale S] [--runs N] [--keep]`; opt-in, not run in
 * CI). Side by side in one run, on the inputs of inputs.ts (deleted afterwards unless `--keep`):
 *  - cold cache (the bench's files dropped from the page cache with GNU dd `iflag=nocache count=0`; the model-climate
 *    caches emptied): Forelight's first run of the 5 configurations (climate built from the 20 hindcast years),
 *    the one-pass Python box means over the same hindcasts, and `cat` of them;
 *  - warm: Forelight's run (climate from the cache) against Python and `cat` on the classic and NetCDF-4 forecasts;
 *  - growth: the shared read of 1×, 4× and 16× the cells × districts (classic), Forelight against Python;
 * then the targets, each "met" or "NOT met". Python computes, in one pass per file, the box mean of each district's
 * bounding box (bench/python-baseline.py); Forelight the exact area-overlap mean of each polygon.
 */
import { execFileSync } from 'node:child_process';
import { rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { RegionConfig } from '../../src/config/types.ts';
import { describeMachine, measure, median, type Measurement } from '../measure.ts';
import { continentalDistricts, makeContinentalInputs, makeGrowthInputs, type ContinentalInputs } from './inputs.ts';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const ENTRY = join(ROOT, 'bench', 'continental', 'forelight-continental.ts');
const BUNDLE = join(ROOT, 'bench', 'data', 'forelight-continental.mjs');
const PYTHON = join(ROOT, 'bench', 'python-baseline.py');
const RSS_LIMIT_MB = 1024;

interface Timed {
  readonly seconds: number;
  /** CPU seconds (user + system), median: the figure to compare when other work shares the cores. */
  readonly cpu: number;
  readonly rssMb: number;
}

/** Bounding boxes of the districts (Python's box means), degrees east −180…180. */
function writeBoxes(path: string, districts: readonly RegionConfig[]): void {
  const boxes = districts.map((r) => {
    if (r.shape.kind !== 'multipolygon') throw new Error(`${r.id}: not a polygon`);
    const pts = r.shape.polygons.flat(2) as unknown as readonly (readonly [number, number])[];
    const lons = pts.map((p) => p[0]);
    const lats = pts.map((p) => p[1]);
    return { id: r.id, south: Math.min(...lats), north: Math.max(...lats), west: Math.min(...lons), east: Math.max(...lons) };
  });
  writeFileSync(path, JSON.stringify({ regions: boxes }));
}

function dropFromPageCache(files: readonly string[]): void {
  for (const f of files) execFileSync('dd', [`if=${f}`, 'iflag=nocache', 'count=0', 'status=none']);
}

async function timed(argv: readonly string[], runs: number, log: (l: string) => void, label: string, before?: () => void): Promise<Timed> {
  const s: number[] = [];
  const cpu: number[] = [];
  const rss: number[] = [];
  for (let r = 0; r < runs; r++) {
    before?.();
    let m: Measurement;
    try {
      m = await measure(argv, ROOT);
    } catch (err) {
      log(`${label}: FAILED ${(err as Error).message}`);
      return { seconds: NaN, cpu: NaN, rssMb: NaN };
    }
    s.push(m.seconds);
    cpu.push(m.cpuSeconds);
    rss.push(m.maxRssKb / 1024);
    log(
      `${label} run ${r + 1}/${runs}: ${m.seconds.toFixed(2)} s (CPU ${m.cpuSeconds.toFixed(2)} s), peak RSS ${(m.maxRssKb / 1024).toFixed(0)} MB`,
    );
  }
  return { seconds: median(s), cpu: median(cpu), rssMb: Math.max(...rss) };
}

const gb = (files: readonly string[]): number => files.reduce((t, f) => t + statSync(f).size, 0) / 1e9;
const f2 = (x: number): string => (Number.isFinite(x) ? x.toFixed(2) : 'n/a');
const t = (x: Timed): string => `${f2(x.seconds)} (${f2(x.cpu)})`;
const verdict = (ok: boolean): string => (ok ? 'met' : 'NOT met');

export async function runContinental(scale: number, runs: number, keep: boolean): Promise<string[]> {
  const log = (l: string): void => void process.stderr.write(`${l}\n`);
  const inputs: ContinentalInputs = await makeContinentalInputs(scale, log);
  await measure([process.execPath, join(ROOT, 'bin', 'build.mjs'), ENTRY, BUNDLE], ROOT);
  const manifest = join(inputs.dir, 'inputs.json');
  const boxes = join(inputs.dir, 'boxes.json');
  writeBoxes(boxes, continentalDistricts(scale, scale).flat());
  const forelight = (file: string, cells: number, mode: string) => [process.execPath, BUNDLE, manifest, file, `${cells}`, `${cells}`, mode];
  const python = (files: readonly string[], regions = boxes) => ['/usr/bin/python3', PYTHON, regions, '-', ...files];
  const cat = (files: readonly string[]) => ['sh', '-c', 'cat "$@" > /dev/null', 'cat', ...files];
  const all = [inputs.classic, inputs.netcdf4, ...inputs.hindcasts];
  const caches = Array.from({ length: 5 }, (_, c) => join(inputs.dir, `cache-${c + 1}`));
  const cold = () => {
    for (const c of caches) rmSync(c, { recursive: true, force: true });
    dropFromPageCache(all);
  };

  const first = await timed(forelight(inputs.classic, scale, 'pipeline'), 1, log, 'Forelight first run (cold)', cold);
  const pyHind = await timed(python(inputs.hindcasts), 1, log, 'Python one pass over the hindcasts (cold)', () => dropFromPageCache(all));
  const catHind = await timed(cat(inputs.hindcasts), 1, log, 'cat of the hindcasts (cold)', () => dropFromPageCache(all));
  const warm = {
    classic: await timed(forelight(inputs.classic, scale, 'pipeline'), runs, log, 'Forelight warm, classic'),
    netcdf4: await timed(forelight(inputs.netcdf4, scale, 'pipeline'), runs, log, 'Forelight warm, NetCDF-4'),
  };
  const py = {
    classic: await timed(python([inputs.classic]), runs, log, 'Python, classic'),
    netcdf4: await timed(python([inputs.netcdf4]), runs, log, 'Python, NetCDF-4'),
  };
  const catClassic = await timed(cat([inputs.classic]), runs, log, 'cat, classic');
  const sizes = { classic: gb([inputs.classic]), netcdf4: gb([inputs.netcdf4]), hindcasts: gb(inputs.hindcasts) };
  for (const h of inputs.hindcasts) rmSync(h);
  const growth = [];
  for (const g of await makeGrowthInputs(inputs, log)) {
    const part = g.factor / 16;
    const ownBoxes = join(inputs.dir, `boxes-${g.factor}.json`);
    writeBoxes(ownBoxes, continentalDistricts(scale * part, scale * part).flat());
    const fl = await timed(forelight(g.classic, scale * part, 'read'), runs, log, `Forelight read, growth ${g.factor}×`);
    const pg = await timed(python([g.classic], ownBoxes), runs, log, `Python, growth ${g.factor}×`);
    growth.push({ ...g, fl, pg, cells: g.domain.nLat * g.domain.nLon, gigabytes: gb([g.classic]) });
  }
  if (!keep) rmSync(inputs.dir, { recursive: true, force: true });

  const d = inputs.domain;
  const peak = Math.max(first.rssMb, warm.classic.rssMb, warm.netcdf4.rssMb, ...growth.map((g) => g.fl.rssMb));
  const aPy = { classic: warm.classic.seconds / py.classic.seconds, netcdf4: warm.netcdf4.seconds / py.netcdf4.seconds };
  const aCat = warm.classic.seconds / catClassic.seconds;
  const firstRatio = first.seconds / pyHind.seconds;
  const g1 = growth[0].fl.seconds;
  return [
    `Forelight continental bench (scale ${scale}: ${d.nLat} × ${d.nLon} = ${d.nLat * d.nLon} cells at 0.25°, ${d.districts} districts in 5 configurations, ` +
      `51 members × 46 days × 3 variables; hindcasts 20 years × 25 members; packed shorts)`,
    ...describeMachine(),
    `load average at the end: ${execFileSync('cat', ['/proc/loadavg'], { encoding: 'utf8' }).trim()}`,
    '',
    '| run | GB | Forelight s (CPU s) | Python s (CPU s) | cat s (CPU s) | Forelight / Python | Forelight / cat | Forelight peak RSS MB | Python peak RSS MB |',
    '|---|---|---|---|---|---|---|---|---|',
    `| first run, cold cache (hindcast climate built; Python and cat: the hindcasts) | ${f2(sizes.hindcasts + sizes.classic)} | ${t(first)} | ${t(pyHind)} | ${t(catHind)} | ${f2(firstRatio)} | ${f2(first.seconds / catHind.seconds)} | ${first.rssMb.toFixed(0)} | ${pyHind.rssMb.toFixed(0)} |`,
    `| warm, classic | ${f2(sizes.classic)} | ${t(warm.classic)} | ${t(py.classic)} | ${t(catClassic)} | ${f2(aPy.classic)} | ${f2(aCat)} | ${warm.classic.rssMb.toFixed(0)} | ${py.classic.rssMb.toFixed(0)} |`,
    `| warm, NetCDF-4 | ${f2(sizes.netcdf4)} | ${t(warm.netcdf4)} | ${t(py.netcdf4)} | | ${f2(aPy.netcdf4)} | | ${warm.netcdf4.rssMb.toFixed(0)} | ${py.netcdf4.rssMb.toFixed(0)} |`,
    ...growth.map(
      (g) =>
        `| growth ${g.factor}× (read only: ${g.cells} cells, ${g.domain.districts} districts) | ${f2(g.gigabytes)} | ${t(g.fl)} (${f2(g.fl.seconds / g1)}× the 1× row) | ${t(g.pg)} | | ${f2(g.fl.seconds / g.pg.seconds)} | | ${g.fl.rssMb.toFixed(0)} | ${g.pg.rssMb.toFixed(0)} |`,
    ),
    '',
    `times: wall clock including process start-up (CPU seconds, user + system, in brackets), median of ${runs} warm run(s); the cold rows are one run each. Forelight: the 5`,
    'configurations issued together, each file read once for all; the first and warm rows are the whole pipeline (read, 4',
    'indicators, probabilities against the hindcast climate, stages); Python computes the box means only.',
    '',
    'Targets:',
    `- warm Forelight / Python ≤ 0.5, classic: ${f2(aPy.classic)} ${verdict(aPy.classic <= 0.5)}; NetCDF-4: ${f2(aPy.netcdf4)} ${verdict(aPy.netcdf4 <= 0.5)}` +
      ` (CPU time: ${f2(warm.classic.cpu / py.classic.cpu)} and ${f2(warm.netcdf4.cpu / py.netcdf4.cpu)})`,
    `- warm Forelight within 3× of cat (classic; the districts span nearly every row, so the bytes they need are the file): ${f2(aCat)} ${verdict(aCat <= 3)}`,
    `- first run ≤ 2× Python's one pass over the hindcasts: ${f2(firstRatio)} ${verdict(firstRatio <= 2)} (CPU time: ${f2(first.cpu / pyHind.cpu)})`,
    `- peak RSS ≤ ${RSS_LIMIT_MB} MB: ${peak.toFixed(0)} MB ${verdict(peak <= RSS_LIMIT_MB)}`,
    `- growth 1× → 4× → 16× cells × districts: ${growth.map((g) => f2(g.fl.seconds / g1)).join(' → ')} (linear would be 1 → 4 → 16 in the work, less in time where start-up dominates)`,
  ];
}
