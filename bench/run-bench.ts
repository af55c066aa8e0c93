/**
 * Side-by-side benchmark (`npm run bench -- [--small] [--runs N] [--huge]`; the continental set with
 * `npm run bench -- --set continental [--scale S] [--runs N] [--keep]`, see bench/continental/): for each input set,
 *   (a) Forelight (bench/forelight-entry.ts, bundled by bin/build.mjs as the `forelight` command is, in a child
 *       process, peak RSS measured),
 *   (b) the CDO script a user would write (bench/cdo-baseline.sh, one cdo call per box),
 *   (c) the Python script a user would write (bench/python-baseline.py, one pass, python3-netcdf4 + numpy),
 *   (d) `cat files > /dev/null` (the cost of reading the bytes once),
 * each the median of N runs (default 3), warm page cache (every tool reads the same files in turn).
 * Before timing, Forelight's and Python's box means are cross-checked (first member, every box and
 * variable). Inputs come from bench/make-large-inputs.ts and are generated when missing.
 */
import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { makeBenchInputs, type BenchMode } from './make-large-inputs.ts';
import { regionWeightsBench } from './region-weights-bench.ts';
import { describeMachine, measure, median } from './measure.ts';
import { runContinental } from './continental/run-continental.ts';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const REGIONS = join(ROOT, 'bench', 'regions.json');
/** forelight-entry.ts bundled by bin/build.mjs, as the `forelight` command runs after `npm ci`. */
const ENTRY_BUNDLE = join(ROOT, 'bench', 'data', 'forelight-entry.mjs');
const TOOLS = ['forelight', 'cdo', 'python', 'cat'] as const;
type Tool = (typeof TOOLS)[number];

interface InputSet {
  readonly label: string;
  readonly files: readonly string[];
  /** Forecast sets: Forelight runs its full pipeline with hindcasts by this pattern (`{year}{mmdd}`). */
  readonly hindcastPattern?: string;
}

interface SetResult {
  readonly set: InputSet;
  readonly gigabytes: number;
  readonly seconds: Readonly<Record<Tool, number>>;
  readonly maxRssMb: Readonly<Record<Tool, number>>;
  /** Forelight's own time without process start-up (median). */
  readonly forelightInProcess: number;
  readonly maxAbsDiffK: number;
  /** Failures (tool: message); a failed tool's time is NaN, the other tools still run. */
  readonly failures: readonly string[];
}

function argValue(name: string): string | undefined {
  const i = process.argv.indexOf(name);
  return i > 0 ? process.argv[i + 1] : undefined;
}

function commandOf(tool: Tool, set: InputSet, scratch: string): string[] {
  const files = set.files;
  switch (tool) {
    case 'forelight': {
      const pipeline = set.hindcastPattern ? ['--pipeline', set.hindcastPattern] : [];
      return [process.execPath, ENTRY_BUNDLE, REGIONS, ...pipeline, ...files];
    }
    case 'cdo':
      return ['sh', join(ROOT, 'bench', 'cdo-baseline.sh'), REGIONS, join(scratch, 'cdo'), ...files];
    case 'python':
      return ['/usr/bin/python3', join(ROOT, 'bench', 'python-baseline.py'), REGIONS, join(scratch, 'python.json'), ...files];
    case 'cat':
      return ['sh', '-c', 'cat "$@" > /dev/null', 'cat', ...files];
  }
}

/** Largest |Forelight − Python| (K) over the first member of every box, variable and day of every file. */
async function crossCheck(files: readonly string[], scratch: string): Promise<number> {
  const flJson = join(scratch, 'forelight-check.json');
  const pyJson = join(scratch, 'python-check.json');
  await measure([process.execPath, ENTRY_BUNDLE, REGIONS, '--check', flJson, ...files], ROOT);
  await measure(['/usr/bin/python3', join(ROOT, 'bench', 'python-baseline.py'), REGIONS, pyJson, ...files], ROOT);
  const fl = JSON.parse(readFileSync(flJson, 'utf8')) as {
    file: string;
    region: string;
    variable: string;
    units: string;
    values: number[];
  }[];
  const py = JSON.parse(readFileSync(pyJson, 'utf8')) as Record<string, Record<string, Record<string, number[][]>>>;
  let worst = 0;
  for (const s of fl) {
    if (s.units !== 'degC') throw new Error(`cross-check: Forelight gave ${s.units} for ${s.variable}, expected degC`);
    const ref = py[s.file]?.[s.region]?.[s.variable]?.[0];
    if (!ref || ref.length !== s.values.length)
      throw new Error(`cross-check: no matching Python series for ${s.file} ${s.region} ${s.variable}`);
    s.values.forEach((v, t) => (worst = Math.max(worst, Math.abs(v + 273.15 - ref[t]))));
  }
  const boxes = (JSON.parse(readFileSync(REGIONS, 'utf8')) as { regions: unknown[] }).regions.length;
  const expected = files.length * boxes * 3;
  if (fl.length !== expected) throw new Error(`cross-check: Forelight returned ${fl.length} series, expected ${expected}`);
  return worst;
}

async function runSet(set: InputSet, runs: number, log: (l: string) => void): Promise<SetResult> {
  const scratch = mkdtempSync(join(tmpdir(), 'forelight-bench-'));
  try {
    const failures: string[] = [];
    let maxAbsDiffK = NaN;
    try {
      maxAbsDiffK = await crossCheck(set.files, scratch);
      log(`${set.label}: cross-check max |Forelight − Python| = ${maxAbsDiffK.toExponential(2)} K`);
    } catch (err) {
      failures.push(`cross-check: ${(err as Error).message}`);
    }
    if (set.hindcastPattern) {
      // Untimed warm-up: fills the model-climate cache from the hindcasts, as the first operational run would.
      const warm = await measure(commandOf('forelight', set, scratch), ROOT).catch((err: Error) =>
        failures.push(`forelight warm-up: ${err.message}`),
      );
      if (typeof warm === 'object') log(`${set.label}: Forelight warm-up (hindcast climate into the cache) ${warm.seconds.toFixed(2)} s`);
    }
    const times: Record<Tool, number[]> = { forelight: [], cdo: [], python: [], cat: [] };
    const rss: Record<Tool, number[]> = { forelight: [], cdo: [], python: [], cat: [] };
    const inProcess: number[] = [];
    for (let r = 0; r < runs; r++) {
      for (const tool of TOOLS) {
        let m;
        try {
          m = await measure(commandOf(tool, set, scratch), ROOT);
        } catch (err) {
          failures.push(`${tool} run ${r + 1}: ${(err as Error).message}`);
          times[tool].push(NaN);
          rss[tool].push(NaN);
          continue;
        }
        times[tool].push(m.seconds);
        rss[tool].push(m.maxRssKb / 1024);
        if (tool === 'forelight') inProcess.push((JSON.parse(m.stdout.trim().split('\n').at(-1)!) as { seconds: number }).seconds);
        log(`${set.label} run ${r + 1}/${runs} ${tool}: ${m.seconds.toFixed(2)} s, peak RSS ${(m.maxRssKb / 1024).toFixed(0)} MB`);
      }
    }
    const med = (xs: Record<Tool, number[]>): Record<Tool, number> =>
      Object.fromEntries(TOOLS.map((t) => [t, median(xs[t])])) as Record<Tool, number>;
    const gigabytes = set.files.reduce((s, f) => s + statSync(f).size, 0) / 1e9;
    return { set, gigabytes, seconds: med(times), maxRssMb: med(rss), forelightInProcess: median(inProcess), maxAbsDiffK, failures };
  } finally {
    rmSync(scratch, { recursive: true, force: true });
  }
}

function formatTable(results: readonly SetResult[], runs: number): string[] {
  const f = (x: number, d = 2): string => (Number.isFinite(x) ? x.toFixed(d) : 'n/a');
  const lines = [
    `| input | GB | (a) Forelight s (in-process s) | (b) CDO s | (c) Python s | (d) cat s | a/b | a/c | a/d | Forelight peak RSS MB | Python peak RSS MB | max abs diff K |`,
    `|---|---|---|---|---|---|---|---|---|---|---|---|`,
  ];
  for (const r of results) {
    const s = r.seconds;
    lines.push(
      `| ${r.set.label} | ${f(r.gigabytes)} | ${f(s.forelight)} (${f(r.forelightInProcess)}) | ${f(s.cdo)} | ${f(s.python)} | ${f(s.cat)} | ${f(s.forelight / s.cdo)} | ${f(s.forelight / s.python)} | ${f(s.forelight / s.cat)} | ${f(r.maxRssMb.forelight, 0)} | ${f(r.maxRssMb.python, 0)} | ${Number.isFinite(r.maxAbsDiffK) ? r.maxAbsDiffK.toExponential(1) : 'n/a'} |`,
    );
  }
  for (const r of results) for (const fail of r.failures) lines.push(`FAILED (${r.set.label}) ${fail}`);
  lines.push(
    `medians of ${runs} runs; warm page cache; times are wall clock including process start-up. Forecast rows: (a) is the full`,
    'pipeline (read → 4 indicators → probabilities against the hindcast climate from the cache → stages) for 20 boxes;',
    '(b) and (c) only compute the 20 box means of the 3 variables. Hindcast row: every tool computes the box means only.',
  );
  return lines;
}

if (process.argv[1] === fileURLToPath(import.meta.url) && argValue('--set') === 'continental') {
  const scale = Number(argValue('--scale') ?? 1);
  if (!(scale > 0 && scale <= 1)) throw new Error(`--scale must be a number in (0, 1], got ${argValue('--scale')}`);
  const runs = Number(argValue('--runs') ?? 1);
  if (!Number.isInteger(runs) || runs < 1) throw new Error(`--runs must be a positive integer, got ${argValue('--runs')}`);
  process.stdout.write(`${(await runContinental(scale, runs, process.argv.includes('--keep'))).join('\n')}\n`);
} else if (process.argv[1] === fileURLToPath(import.meta.url)) {
  if (argValue('--set') !== undefined) throw new Error(`--set: the only extra set is 'continental', got ${argValue('--set')}`);
  process.stdout.write(`${regionWeightsBench().join('\n')}\n\n`);
  if (process.argv.includes('--weights-only')) process.exit(0);
  const mode: BenchMode = process.argv.includes('--small') ? 'small' : 'full';
  const runs = Number(argValue('--runs') ?? 3);
  if (!Number.isInteger(runs) || runs < 1) throw new Error(`--runs must be a positive integer, got ${argValue('--runs')}`);
  const log = (l: string): void => void process.stderr.write(`${l}\n`);
  const inputs = await makeBenchInputs(mode, { huge: process.argv.includes('--huge'), log });
  await measure([process.execPath, join(ROOT, 'bin', 'build.mjs'), join(ROOT, 'bench', 'forelight-entry.ts'), ENTRY_BUNDLE], ROOT);
  const hindcastPattern = join(dirname(inputs.hindcasts[0]), 'hindcast_{year}{mmdd}.nc');
  const sets: InputSet[] = [
    { label: 'forecast, classic 64-bit offset', files: [inputs.classic], hindcastPattern },
    { label: 'forecast, NetCDF-4 deflate 1 + shuffle', files: [inputs.netcdf4], hindcastPattern },
    { label: `hindcasts, classic, ${inputs.hindcasts.length} files`, files: inputs.hindcasts },
    ...(inputs.huge ? [{ label: 'forecast > 4 GiB, CDF-5', files: [inputs.huge] }] : []),
  ];
  const results: SetResult[] = [];
  for (const set of sets) results.push(await runSet(set, runs, log));
  const out = [`Forelight benchmark (${mode})`, ...describeMachine(), '', ...formatTable(results, runs)];
  process.stdout.write(`${out.join('\n')}\n`);
}
